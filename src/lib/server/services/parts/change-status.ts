import { inArray } from 'drizzle-orm';
import { checkPartTransition, type PartStatus } from '~/core/stock/part-transitions';
import { schema, type DbOrTx } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import type { Actor } from '~/lib/server/identity';

export interface StatusChange {
  partId: number;
  to: PartStatus;
  /** Other columns to set with the status (location, reservation, bin). */
  set?: Partial<{ locationId: number | null; reservationId: string | null; binId: number | null }>;
  /** This part's reason in the audit log, where it differs from the batch's. */
  reason?: string;
}

export interface ChangedPart {
  partId: number;
  serial: string;
  from: PartStatus;
  to: PartStatus;
  binId: number | null;
  locationId: number | null;
}

/**
 * The one way a part's status changes. Locks the parts (in id order, so concurrent batches
 * cannot deadlock), checks every transition, updates them and writes the audit log, all in
 * the caller's transaction. One refused transition refuses the whole batch, naming each part.
 */
export async function changePartStatuses(
  tx: DbOrTx,
  actor: Actor | null,
  changes: StatusChange[],
  { action, reason }: { action: string; reason?: string | null },
): Promise<ChangedPart[]> {
  if (changes.length === 0) return [];
  const ids = [...new Set(changes.map((c) => c.partId))].sort((a, b) => a - b);
  if (ids.length !== changes.length) throw new AppError('part_twice_in_batch');
  const rows = await tx
    .select()
    .from(schema.part)
    .where(inArray(schema.part.id, ids))
    .orderBy(schema.part.id)
    .for('update');
  const byId = new Map(rows.map((r) => [r.id, r]));
  const refused: { serial: string; reason: string }[] = [];
  for (const c of changes) {
    const row = byId.get(c.partId);
    if (!row) throw new AppError('part_id_not_found', { id: c.partId });
    const check = checkPartTransition(row.status, c.to);
    if (!check.ok) refused.push({ serial: row.serial, reason: check.reason! });
  }
  if (refused.length) {
    throw new AppError('status_change_refused', { refused }, { refused });
  }
  // One UPDATE per distinct (status, columns) rather than one per part: batches run to hundreds.
  const groups = new Map<string, { change: StatusChange; ids: number[] }>();
  for (const c of changes) {
    const key = JSON.stringify([c.to, c.set ?? {}]);
    const g = groups.get(key);
    if (g) g.ids.push(c.partId);
    else groups.set(key, { change: c, ids: [c.partId] });
  }
  const now = new Date();
  for (const { change, ids: groupIds } of groups.values()) {
    await tx
      .update(schema.part)
      .set({ status: change.to, ...change.set, updatedAt: now })
      .where(inArray(schema.part.id, groupIds));
  }
  const out: ChangedPart[] = changes.map((c) => {
    const row = byId.get(c.partId)!;
    return {
      partId: row.id,
      serial: row.serial,
      from: row.status,
      to: c.to,
      binId: c.set?.binId !== undefined ? c.set.binId : row.binId,
      locationId: c.set?.locationId !== undefined ? c.set.locationId : row.locationId,
    };
  });
  await writeAudit(
    tx,
    actor,
    out.map((o, i) => ({
      action,
      subjectType: 'part',
      subjectId: o.serial,
      before: { status: o.from, location_id: byId.get(o.partId)!.locationId, bin_id: byId.get(o.partId)!.binId, reservation_id: byId.get(o.partId)!.reservationId },
      after: { status: o.to, ...(changes[i].set ?? {}) },
      reason: changes[i].reason ?? reason ?? null,
    })),
  );
  return out;
}
