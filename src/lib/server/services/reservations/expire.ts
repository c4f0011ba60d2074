import { and, eq, isNotNull, lte, sql } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { serverEnv } from '~/lib/server/env';
import { sendMail } from '~/lib/server/mail';
import { checkLowStock } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { reservationCode } from './reservation-view';

/**
 * Returns the parts of every active reservation past its expiry to stock, unless stores have
 * begun picking it (a list with a picked line stays until it is completed or cancelled).
 * Each reservation in its own transaction, locked with SKIP LOCKED so the periodic job and a
 * check on read never wait on each other or on a scan in progress. Mails each designer after
 * the change is committed. Returns the ids expired.
 */
export async function expireDueReservations(now = new Date()): Promise<string[]> {
  const db = getDb();
  const due = await db
    .select({ id: schema.reservation.id })
    .from(schema.reservation)
    .where(and(eq(schema.reservation.status, 'active'), lte(schema.reservation.expiresAt, now)))
    .limit(200);
  const expired: { id: string; email: string; serials: string[] }[] = [];
  for (const { id } of due) {
    const done = await db.transaction(async (tx) => {
      const [r] = await tx
        .select({ r: schema.reservation, email: schema.user.email })
        .from(schema.reservation)
        .innerJoin(schema.user, eq(schema.user.id, schema.reservation.designerUserId))
        .where(and(eq(schema.reservation.id, id), eq(schema.reservation.status, 'active'), lte(schema.reservation.expiresAt, now)))
        .for('update', { of: schema.reservation, skipLocked: true });
      if (!r) return null;
      const [started] = await tx
        .select({ n: sql<number>`count(*)::int` })
        .from(schema.pickLine)
        .innerJoin(schema.pickList, eq(schema.pickList.id, schema.pickLine.pickListId))
        .where(and(eq(schema.pickList.reservationId, id), isNotNull(schema.pickLine.pickedAt)));
      if (started!.n > 0) return null;
      const parts = await tx
        .select({ id: schema.part.id, serial: schema.part.serial })
        .from(schema.part)
        .where(and(eq(schema.part.reservationId, id), eq(schema.part.status, 'reserved')));
      const changed = await changePartStatuses(
        tx,
        null,
        parts.map((p) => ({ partId: p.id, to: 'in_stock', set: { reservationId: null } })),
        { action: 'part.unreserve', reason: `reservation ${reservationCode(id)} expired` },
      );
      await checkLowStock(tx, changed.map((c) => c.binId), { mayDrop: false });
      await tx.update(schema.reservation).set({ status: 'expired', closedAt: now }).where(eq(schema.reservation.id, id));
      await tx.update(schema.pickList).set({ status: 'cancelled' }).where(and(eq(schema.pickList.reservationId, id), eq(schema.pickList.status, 'open')));
      await writeAudit(tx, null, {
        action: 'reservation.expire',
        subjectType: 'reservation',
        subjectId: id,
        before: { status: 'active', expires_at: r.r.expiresAt.toISOString() },
        after: { status: 'expired', returned_to_stock: parts.map((p) => p.serial) },
      });
      return { id, email: r.email, serials: parts.map((p) => p.serial) };
    });
    if (done) expired.push(done);
  }
  for (const e of expired) {
    const code = reservationCode(e.id);
    await sendMail({
      to: e.email,
      subject: `Reservation ${code} expired; its parts are back in stock`,
      text:
        `Your reservation ${code} reached its expiry before stores picked it, so its ${e.serials.length} parts ` +
        `went back to stock: ${e.serials.join(', ')}.\n\nIf you still need matched parts, ask for a fresh proposal: ` +
        `${serverEnv().publicUrl}/match\n`,
    }).catch((err) => console.error('[reservations] expiry mail failed', err));
  }
  return expired.map((e) => e.id);
}
