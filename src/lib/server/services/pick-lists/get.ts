import { getDb } from '../../../../db/client';
import { AppError } from '../../errors';
import type { Actor } from '../../identity';
import { expireDueReservations } from '../reservations/expire';
import { pickListReader } from './access';
import { loadPickListView, type PickListView } from './pick-list-view';

export function parsePickListId(id: string): number {
  const n = Number(String(id).replace(/^PL-/i, ''));
  if (!Number.isInteger(n) || n <= 0) throw new AppError('not_found', `There is no pick list ${id}.`);
  return n;
}

export async function getPickList({ actor, id }: { actor: Actor | null; id: string }): Promise<PickListView> {
  const view = pickListReader(actor);
  await expireDueReservations();
  const list = await loadPickListView(getDb(), parsePickListId(id));
  if (!list || (view === 'designer' && list.reservation.designer_user_id !== actor!.userId)) {
    throw new AppError('not_found', `There is no pick list ${id}${view === 'designer' ? ' for your reservations' : ''}.`);
  }
  return list;
}
