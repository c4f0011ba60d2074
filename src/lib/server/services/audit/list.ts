import { and, count, desc, eq, gte, ilike, inArray, lt, or, type SQL } from 'drizzle-orm';
import { AUDIT_ACTION_WORDS } from '~/core/audit/describe-audit-entry';
import { getDb, schema } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { AuditLogQuery, type AuditLogPage } from '~/contracts/audit';
import { describeAuditRows } from './describe-rows';

const ACTIONS = Object.keys(AUDIT_ACTION_WORDS).sort();

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/** The whole audit log, newest first, filtered and paged on the server. */
export async function listAuditLog({ actor, input }: { actor: Actor | null; input: unknown }): Promise<AuditLogPage> {
  requirePermission(actor, 'audit:read');
  const f = AuditLogQuery.parse(input);
  const db = getDb();
  const where: SQL[] = [];
  if (f.serial) where.push(ilike(schema.auditLog.subjectId, `%${escapeLike(f.serial)}%`));
  if (f.action) where.push(f.action.includes('.') ? eq(schema.auditLog.action, f.action) : ilike(schema.auditLog.action, `${escapeLike(f.action)}.%`));
  if (f.from) where.push(gte(schema.auditLog.at, new Date(`${f.from}T00:00:00Z`)));
  if (f.to) where.push(lt(schema.auditLog.at, new Date(Date.parse(`${f.to}T00:00:00Z`) + 86_400_000)));
  if (f.person) {
    const like = `%${escapeLike(f.person)}%`;
    const [users, stations] = await Promise.all([
      db.select({ id: schema.user.id }).from(schema.user).where(or(ilike(schema.user.email, like), ilike(schema.user.name, like))),
      db.select({ id: schema.stationToken.id }).from(schema.stationToken).where(ilike(schema.stationToken.name, like)),
    ]);
    const matches: SQL[] = [];
    if (users.length) matches.push(inArray(schema.auditLog.actorUserId, users.map((u) => u.id)));
    if (stations.length) matches.push(inArray(schema.auditLog.actorStationId, stations.map((s) => s.id)));
    if (matches.length === 0) {
      return { entries: [], total: 0, page: f.page, page_size: f.page_size, actions: ACTIONS };
    }
    where.push(matches.length === 1 ? matches[0] : or(...matches)!);
  }
  const cond = where.length ? and(...where) : undefined;
  const [[{ total }], rows] = await Promise.all([
    db.select({ total: count() }).from(schema.auditLog).where(cond),
    db
      .select()
      .from(schema.auditLog)
      .where(cond)
      .orderBy(desc(schema.auditLog.at), desc(schema.auditLog.id))
      .limit(f.page_size)
      .offset((f.page - 1) * f.page_size),
  ]);
  return { entries: await describeAuditRows(db, rows), total, page: f.page, page_size: f.page_size, actions: ACTIONS };
}
