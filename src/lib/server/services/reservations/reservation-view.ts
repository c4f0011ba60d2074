import { asc, eq, inArray, sql } from 'drizzle-orm';
import { schema, type DbOrTx } from '~/db/client';
import type { StoredProposalResult } from '../match/create-proposal';
import type { ReservationView } from '~/contracts/reservations';

/** A short code people can say and type: R- and the first 8 hex digits of the id. */
export function reservationCode(id: string): string {
  return `R-${id.slice(0, 8).toUpperCase()}`;
}

export function pickListCode(id: number): string {
  return `PL-${id}`;
}

/** Everything the reservation page shows, read in `db` (a transaction or the pool). */
export async function loadReservationView(db: DbOrTx, id: string): Promise<ReservationView | null> {
  const [row] = await db
    .select({ r: schema.reservation, name: schema.user.name, email: schema.user.email, result: schema.matchProposal.result })
    .from(schema.reservation)
    .innerJoin(schema.user, eq(schema.user.id, schema.reservation.designerUserId))
    .leftJoin(schema.matchProposal, eq(schema.matchProposal.id, schema.reservation.proposalId))
    .where(eq(schema.reservation.id, id));
  if (!row) return null;
  const result = row.result as StoredProposalResult | null;
  const parts = await db
    .select({
      rp: schema.reservationPart,
      serial: schema.part.serial,
      status: schema.part.status,
      binCode: schema.bin.code,
      location: schema.location.name,
    })
    .from(schema.reservationPart)
    .innerJoin(schema.part, eq(schema.part.id, schema.reservationPart.partId))
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .where(eq(schema.reservationPart.reservationId, id))
    .orderBy(asc(schema.reservationPart.setIndex), asc(schema.reservationPart.id));
  const [list] = await db.select().from(schema.pickList).where(eq(schema.pickList.reservationId, id));
  const lines = list
    ? await db
        .select({ partId: schema.pickLine.partId, pickedAt: schema.pickLine.pickedAt })
        .from(schema.pickLine)
        .where(eq(schema.pickLine.pickListId, list.id))
    : [];
  const picked = new Set(lines.filter((l) => l.pickedAt).map((l) => l.partId));
  const cascodeIndexOf = new Map<number, 0 | 1>();
  for (const s of result?.sets ?? []) for (const p of s.parts) if (p.cascode_index !== undefined) cascodeIndexOf.set(p.part_id, p.cascode_index);

  const setIndexes = [...new Set(parts.map((p) => p.rp.setIndex))].sort((a, b) => a - b);
  return {
    id: row.r.id,
    code: reservationCode(row.r.id),
    status: row.r.status,
    purpose: row.r.purpose,
    created_at: row.r.createdAt.toISOString(),
    expires_at: row.r.expiresAt.toISOString(),
    closed_at: row.r.closedAt?.toISOString() ?? null,
    designer: { id: row.r.designerUserId, name: row.name, email: row.email },
    proposal_id: row.r.proposalId,
    device_type: result?.device_type ?? null,
    shape: result?.shape ?? null,
    operating_point: result?.operating_point ?? null,
    tolerances: result?.tolerances ?? null,
    temperature_c: result?.temperature_c ?? 25,
    sets: setIndexes.map((index) => {
      const stored = result?.sets.find((s) => s.index === index);
      return {
        index,
        parts: parts
          .filter((p) => p.rp.setIndex === index)
          .map((p) => ({
            part_id: p.rp.partId,
            serial: p.serial,
            role: p.rp.role,
            ...(cascodeIndexOf.has(p.rp.partId) ? { cascode_index: cascodeIndexOf.get(p.rp.partId)! } : {}),
            vgs_v: p.rp.vgsV,
            vgs_sigma_v: stored?.parts.find((x) => x.part_id === p.rp.partId)?.vgs_sigma_v ?? null,
            gm_s: p.rp.gmS,
            idss_a: p.rp.idssA,
            source: stored?.parts.find((x) => x.part_id === p.rp.partId)?.source ?? null,
            bin_code: p.binCode,
            location: p.location,
            status: p.status,
            picked: picked.has(p.rp.partId),
          })),
        dvgs_v: stored?.dvgs_v ?? null,
        dvgs_sigma_v: stored?.dvgs_sigma_v ?? null,
        gm_mismatch: stored?.gm_mismatch ?? null,
        idss_mismatch: stored?.idss_mismatch ?? null,
        ...(stored?.cascode_headroom_v !== undefined ? { cascode_headroom_v: stored.cascode_headroom_v } : {}),
      };
    }),
    pick_list: list
      ? {
          id: list.id,
          code: pickListCode(list.id),
          status: list.status,
          lines_total: lines.length,
          lines_picked: picked.size,
          completed_at: list.completedAt?.toISOString() ?? null,
        }
      : null,
  };
}

/** Line counts per pick list, for list pages. */
export async function pickLineCounts(db: DbOrTx, pickListIds: number[]): Promise<Map<number, { total: number; picked: number }>> {
  if (pickListIds.length === 0) return new Map();
  const rows = await db
    .select({
      id: schema.pickLine.pickListId,
      total: sql<number>`count(*)::int`,
      picked: sql<number>`count(${schema.pickLine.pickedAt})::int`,
    })
    .from(schema.pickLine)
    .where(inArray(schema.pickLine.pickListId, pickListIds))
    .groupBy(schema.pickLine.pickListId);
  return new Map(rows.map((r) => [r.id, { total: r.total, picked: r.picked }]));
}
