import { z } from 'zod';
import { getDb, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { maySeeOwnedRecord, requirePermission, type Actor } from '~/lib/server/identity';
import { expireDueReservations } from './expire';
import type { ReservationView } from '~/contracts/reservations';
import { loadReservationView } from './reservation-view';

const ReservationId = z.uuid();

/** The actor's own reservation, or not_found (another designer's looks absent). */
export async function loadOwnReservation(db: DbOrTx, actor: Actor, id: string): Promise<ReservationView> {
  const parsed = ReservationId.safeParse(id);
  const view = parsed.success ? await loadReservationView(db, parsed.data) : null;
  if (!view || !maySeeOwnedRecord('reservation', actor, view.designer.id)) {
    throw new AppError('reservation_not_found', { id });
  }
  return view;
}

export async function getReservation({ actor, id }: { actor: Actor | null; id: string }): Promise<ReservationView> {
  requirePermission(actor, 'match:request');
  await expireDueReservations();
  return loadOwnReservation(getDb(), actor, id);
}
