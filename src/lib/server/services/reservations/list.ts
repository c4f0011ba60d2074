import { desc, eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { ReservationSummary } from '~/contracts/reservations';
import type { StoredProposalResult } from '../match/create-proposal';
import { expireDueReservations } from './expire';
import { pickLineCounts, pickListCode, reservationCode } from './reservation-view';

/** The actor's own reservations, newest first (expired ones are settled first). */
export async function listReservations({ actor }: { actor: Actor | null }): Promise<ReservationSummary[]> {
  requirePermission(actor, 'match:request');
  await expireDueReservations();
  const db = getDb();
  const rows = await db
    .select({ r: schema.reservation, result: schema.matchProposal.result, list: schema.pickList })
    .from(schema.reservation)
    .leftJoin(schema.matchProposal, eq(schema.matchProposal.id, schema.reservation.proposalId))
    .leftJoin(schema.pickList, eq(schema.pickList.reservationId, schema.reservation.id))
    .where(eq(schema.reservation.designerUserId, actor.userId ?? ''))
    .orderBy(desc(schema.reservation.createdAt))
    .limit(200);
  const counts = await pickLineCounts(db, rows.flatMap((r) => (r.list ? [r.list.id] : [])));
  const partRows = rows.length
    ? await db
        .select({ reservationId: schema.reservationPart.reservationId })
        .from(schema.reservationPart)
        .where(inArray(schema.reservationPart.reservationId, rows.map((r) => r.r.id)))
    : [];
  const partCount = new Map<string, number>();
  for (const p of partRows) partCount.set(p.reservationId, (partCount.get(p.reservationId) ?? 0) + 1);
  return rows.map(({ r, result, list }) => {
    const res = result as StoredProposalResult | null;
    const c = list ? counts.get(list.id) : undefined;
    return {
      id: r.id,
      code: reservationCode(r.id),
      status: r.status,
      purpose: r.purpose,
      created_at: r.createdAt.toISOString(),
      expires_at: r.expiresAt.toISOString(),
      closed_at: r.closedAt?.toISOString() ?? null,
      device_type: res?.device_type.name ?? null,
      shape: res?.shape ?? null,
      sets: res?.sets.length ?? 0,
      parts: partCount.get(r.id) ?? 0,
      pick_list: list ? { id: list.id, code: pickListCode(list.id), status: list.status, lines_total: c?.total ?? 0, lines_picked: c?.picked ?? 0 } : null,
    };
  });
}
