import { and, desc, eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { requireOwnedRecordScope, type Actor } from '~/lib/server/identity';
import { PickListQuery, type PickListSummary } from '~/contracts/pick-lists';
import type { StoredProposalResult } from '../match/create-proposal';
import { expireDueReservations } from '../reservations/expire';
import { pickLineCounts, pickListCode, reservationCode } from '../reservations/reservation-view';

/** Pick lists, oldest open first (stores), or the designer's own. */
export async function listPickLists({ actor, input }: { actor: Actor | null; input?: unknown }): Promise<PickListSummary[]> {
  const { scope } = requireOwnedRecordScope(actor, 'pickList');
  const { status } = PickListQuery.parse(input ?? {});
  await expireDueReservations();
  const db = getDb();
  const rows = await db
    .select({ list: schema.pickList, r: schema.reservation, designerName: schema.user.name, result: schema.matchProposal.result })
    .from(schema.pickList)
    .innerJoin(schema.reservation, eq(schema.reservation.id, schema.pickList.reservationId))
    .innerJoin(schema.user, eq(schema.user.id, schema.reservation.designerUserId))
    .leftJoin(schema.matchProposal, eq(schema.matchProposal.id, schema.reservation.proposalId))
    .where(
      and(
        status === 'all' ? undefined : eq(schema.pickList.status, status),
        scope === 'own' ? eq(schema.reservation.designerUserId, actor!.userId ?? '') : undefined,
      ),
    )
    .orderBy(status === 'open' ? schema.pickList.createdAt : desc(schema.pickList.createdAt))
    .limit(200);
  const ids = rows.map((r) => r.list.id);
  const counts = await pickLineCounts(db, ids);
  const firstLines = ids.length
    ? await db
        .select({ listId: schema.pickLine.pickListId, lineNo: schema.pickLine.lineNo, location: schema.location.name, pickedAt: schema.pickLine.pickedAt })
        .from(schema.pickLine)
        .leftJoin(schema.location, eq(schema.location.id, schema.pickLine.locationId))
        .where(inArray(schema.pickLine.pickListId, ids))
    : [];
  const first = new Map<number, { lineNo: number; location: string | null }>();
  for (const l of firstLines) {
    if (l.pickedAt) continue;
    const cur = first.get(l.listId);
    if (!cur || l.lineNo < cur.lineNo) first.set(l.listId, { lineNo: l.lineNo, location: l.location });
  }
  return rows.map(({ list, r, designerName, result }) => {
    const c = counts.get(list.id);
    return {
      id: list.id,
      code: pickListCode(list.id),
      status: list.status,
      created_at: list.createdAt.toISOString(),
      completed_at: list.completedAt?.toISOString() ?? null,
      reservation: { id: r.id, code: reservationCode(r.id), status: r.status, expires_at: r.expiresAt.toISOString(), designer_name: designerName, purpose: r.purpose },
      device_type: (result as StoredProposalResult | null)?.device_type.name ?? null,
      sets: (result as StoredProposalResult | null)?.sets.length ?? 0,
      lines_total: c?.total ?? 0,
      lines_picked: c?.picked ?? 0,
      first_location: first.get(list.id)?.location ?? null,
    };
  });
}
