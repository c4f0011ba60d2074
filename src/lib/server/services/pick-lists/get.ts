import { parseRowId } from '~/core/ids/row-id';
import { getDb } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { maySeeOwnedRecord, requireOwnedRecordScope, type Actor } from '~/lib/server/identity';
import { expireDueReservations } from '../reservations/expire';
import type { PickListView } from '~/contracts/pick-lists';
import { loadPickListView } from './pick-list-view';

export function parsePickListId(id: string): number {
  const n = parseRowId(String(id).replace(/^PL-/i, ''));
  if (n === null) throw new AppError('pick_list_not_found', { id });
  return n;
}

export async function getPickList({ actor, id }: { actor: Actor | null; id: string }): Promise<PickListView> {
  const { actor: who, scope } = requireOwnedRecordScope(actor, 'pickList');
  await expireDueReservations();
  const list = await loadPickListView(getDb(), parsePickListId(id));
  if (!list || !maySeeOwnedRecord('pickList', who, list.reservation.designer_user_id)) {
    throw new AppError('pick_list_not_found', { id, ownOnly: scope === 'own' });
  }
  return list;
}
