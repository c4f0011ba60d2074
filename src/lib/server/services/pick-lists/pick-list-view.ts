import { alias } from 'drizzle-orm/pg-core';
import { asc, eq } from 'drizzle-orm';
import { schema, type DbOrTx } from '~/db/client';
import type { StoredProposalResult } from '../match/create-proposal';
import type { PickLineView, PickListView } from '~/contracts/pick-lists';
import { pickListCode, reservationCode } from '../reservations/reservation-view';

/** A pick list with its lines in picking order (by location, as numbered when confirmed). */
export async function loadPickListView(db: DbOrTx, id: number): Promise<PickListView | null> {
  const [row] = await db
    .select({ list: schema.pickList, r: schema.reservation, designerName: schema.user.name, result: schema.matchProposal.result })
    .from(schema.pickList)
    .innerJoin(schema.reservation, eq(schema.reservation.id, schema.pickList.reservationId))
    .innerJoin(schema.user, eq(schema.user.id, schema.reservation.designerUserId))
    .leftJoin(schema.matchProposal, eq(schema.matchProposal.id, schema.reservation.proposalId))
    .where(eq(schema.pickList.id, id));
  if (!row) return null;
  const picker = alias(schema.user, 'picker');
  const completer = row.list.completedBy
    ? (await db.select({ name: schema.user.name }).from(schema.user).where(eq(schema.user.id, row.list.completedBy)))[0]?.name ?? null
    : null;
  const lines = await db
    .select({
      line: schema.pickLine,
      serial: schema.part.serial,
      status: schema.part.status,
      location: schema.location.name,
      barcode: schema.location.barcode,
      pickedByName: picker.name,
    })
    .from(schema.pickLine)
    .innerJoin(schema.part, eq(schema.part.id, schema.pickLine.partId))
    .leftJoin(schema.location, eq(schema.location.id, schema.pickLine.locationId))
    .leftJoin(picker, eq(picker.id, schema.pickLine.pickedBy))
    .where(eq(schema.pickLine.pickListId, id))
    .orderBy(asc(schema.pickLine.lineNo));
  const result = row.result as StoredProposalResult | null;
  const cascodeIndexOf = new Map<number, 0 | 1>();
  for (const s of result?.sets ?? []) for (const p of s.parts) if (p.cascode_index !== undefined) cascodeIndexOf.set(p.part_id, p.cascode_index);
  const view: PickLineView[] = lines.map((l) => ({
    line_no: l.line.lineNo,
    part_id: l.line.partId,
    serial: l.serial,
    location: l.location,
    location_barcode: l.barcode,
    set_no: l.line.setIndex + 1,
    role: l.line.role,
    ...(cascodeIndexOf.has(l.line.partId) ? { cascode_index: cascodeIndexOf.get(l.line.partId)! } : {}),
    part_status: l.status,
    picked_at: l.line.pickedAt?.toISOString() ?? null,
    picked_by: l.pickedByName,
  }));
  return {
    id: row.list.id,
    code: pickListCode(row.list.id),
    status: row.list.status,
    created_at: row.list.createdAt.toISOString(),
    completed_at: row.list.completedAt?.toISOString() ?? null,
    completed_by: completer,
    device_type: result?.device_type.name ?? null,
    reservation: {
      id: row.r.id,
      code: reservationCode(row.r.id),
      status: row.r.status,
      expires_at: row.r.expiresAt.toISOString(),
      purpose: row.r.purpose,
      designer_name: row.designerName,
      designer_user_id: row.r.designerUserId,
    },
    lines: view,
    lines_total: view.length,
    lines_picked: view.filter((l) => l.picked_at).length,
  };
}
