import { and, eq, isNotNull, sql } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { loadOwnReservation } from './get';
import type { ReservationCancelled } from '~/contracts/reservations';
import { loadReservationView, reservationCode } from './reservation-view';

/**
 * A designer cancels their active reservation: its reserved parts go back to stock and its
 * pick list is cancelled. Lines stores had already picked are named in `put_back`, so the
 * page can say which parts stores must return to their places.
 */
export async function cancelReservation({
  actor,
  id,
}: {
  actor: Actor | null;
  id: string;
}): Promise<ReservationCancelled> {
  requirePermission(actor, 'match:reserve');
  const db = getDb();
  await loadOwnReservation(db, actor, id);
  const putBack = await db.transaction(async (tx) => {
    const [r] = await tx.select().from(schema.reservation).where(eq(schema.reservation.id, id)).for('update');
    if (r!.status !== 'active') {
      throw new AppError('reservation_not_active', { code: reservationCode(id), status: r!.status });
    }
    const [list] = await tx.select().from(schema.pickList).where(eq(schema.pickList.reservationId, id)).for('update');
    const picked = list
      ? await tx
          .select({ serial: schema.part.serial })
          .from(schema.pickLine)
          .innerJoin(schema.part, eq(schema.part.id, schema.pickLine.partId))
          .where(and(eq(schema.pickLine.pickListId, list.id), isNotNull(schema.pickLine.pickedAt)))
      : [];
    const parts = await tx
      .select({ id: schema.part.id })
      .from(schema.part)
      .where(and(eq(schema.part.reservationId, id), eq(schema.part.status, 'reserved')));
    const changed = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'in_stock', set: { reservationId: null } })),
      { action: 'part.unreserve', reason: `reservation ${reservationCode(id)} cancelled by the designer` },
    );
    await checkLowStock(tx, changed.map((c) => c.binId), { mayDrop: false });
    await tx.update(schema.reservation).set({ status: 'cancelled', closedAt: sql`now()` }).where(eq(schema.reservation.id, id));
    if (list && list.status === 'open') await tx.update(schema.pickList).set({ status: 'cancelled' }).where(eq(schema.pickList.id, list.id));
    await writeAudit(tx, actor, {
      action: 'reservation.cancel',
      subjectType: 'reservation',
      subjectId: id,
      before: { status: 'active' },
      after: { status: 'cancelled', returned_to_stock: parts.length, picked_before_cancel: picked.map((p) => p.serial) },
    });
    return picked.map((p) => p.serial);
  });
  return { reservation: (await loadReservationView(db, id))!, put_back: putBack };
}
