import { inArray } from 'drizzle-orm';
import type { AuditEntryJson } from '~/contracts/audit';
import { auditReferencedIds, describeAuditEntry } from '~/core/audit/describe-audit-entry';
import { schema, type DbOrTx } from '~/db/client';
import { reservationCode } from '../reservations/reservation-view';

type AuditRow = typeof schema.auditLog.$inferSelect;

/** Describes audit rows in words: looks up the people, stations, bins, locations and reservations they name. */
export async function describeAuditRows(db: DbOrTx, rows: readonly AuditRow[]): Promise<AuditEntryJson[]> {
  if (rows.length === 0) return [];
  const userIds = [...new Set(rows.map((e) => e.actorUserId).filter((x): x is string => !!x))];
  const stationIds = [...new Set(rows.map((e) => e.actorStationId).filter((x): x is string => !!x))];
  const ids = auditReferencedIds(rows);
  const [users, stations, bins, locations, reservations] = await Promise.all([
    userIds.length ? db.select({ id: schema.user.id, email: schema.user.email }).from(schema.user).where(inArray(schema.user.id, userIds)) : [],
    stationIds.length ? db.select({ id: schema.stationToken.id, name: schema.stationToken.name }).from(schema.stationToken).where(inArray(schema.stationToken.id, stationIds)) : [],
    ids.binIds.length ? db.select({ id: schema.bin.id, code: schema.bin.code }).from(schema.bin).where(inArray(schema.bin.id, ids.binIds)) : [],
    ids.locationIds.length ? db.select({ id: schema.location.id, name: schema.location.name }).from(schema.location).where(inArray(schema.location.id, ids.locationIds)) : [],
    // Only well-formed uuids reach the query: a malformed one would make PostgreSQL refuse the whole list.
    ids.reservationIds.filter((id) => /^[0-9a-f-]{36}$/i.test(id)).length
      ? db.select({ id: schema.reservation.id }).from(schema.reservation).where(inArray(schema.reservation.id, ids.reservationIds.filter((id) => /^[0-9a-f-]{36}$/i.test(id))))
      : [],
  ]);
  const who = new Map<string, string>([...users.map((u) => [u.id, u.email] as const), ...stations.map((s) => [s.id, `station ${s.name}`] as const)]);
  const names = {
    bins: new Map(bins.map((b) => [b.id, b.code])),
    locations: new Map(locations.map((l) => [l.id, l.name])),
    reservations: new Map(reservations.map((r) => [r.id, reservationCode(r.id)])),
  };
  return rows.map((e) => {
    const d = describeAuditEntry({ action: e.action, subjectType: e.subjectType, subjectId: e.subjectId, before: e.before, after: e.after, reason: e.reason }, names);
    return {
      id: e.id,
      at: e.at.toISOString(),
      action: e.action,
      what: d.what,
      summary: d.summary,
      changes: d.changes,
      actor: (e.actorUserId && who.get(e.actorUserId)) || (e.actorStationId && who.get(e.actorStationId)) || 'system',
      subject_type: e.subjectType,
      subject_id: e.subjectId,
      reason: e.reason,
      before: e.before,
      after: e.after,
    };
  });
}
