import type { DbOrTx } from '~/db/client';
import { schema } from '~/db/client';
import { insertRowsAsJson } from '~/db/insert-rows-as-json';
import type { Actor } from './identity';

export interface AuditEntry {
  action: string;
  subjectType: string;
  subjectId: string | number;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

/** Writes audit rows inside the caller's transaction, so the record and the change land together. */
export async function writeAudit(tx: DbOrTx, actor: Actor | null, entries: AuditEntry | AuditEntry[]): Promise<void> {
  const list = Array.isArray(entries) ? entries : [entries];
  if (list.length === 0) return;
  await insertRowsAsJson(
    tx,
    schema.auditLog,
    list.map((e) => ({
      actorUserId: actor?.userId ?? null,
      actorStationId: actor?.stationId ?? null,
      action: e.action,
      subjectType: e.subjectType,
      subjectId: String(e.subjectId),
      before: e.before ?? null,
      after: e.after ?? null,
      reason: e.reason ?? null,
    })),
  );
}
