import { and, eq, inArray } from 'drizzle-orm';
import { assignBin, type BinPlan } from '~/core/binning';
import { schema, type DbOrTx } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import type { Actor } from '~/lib/server/identity';
import { binFiguresOf } from './figures';

/** Fit reviews under which a part is binned. */
export const BINNABLE_REVIEWS = ['auto_accepted', 'accepted'] as const;

/**
 * Puts each part with an accepted fit into its bin under its type's active plan and records
 * the assignment (bin_assignment row and audit entry) when the bin changes. Parts whose type
 * has no active plan keep no bin until a plan is activated. Runs in the caller's transaction;
 * returns the number of parts whose bin changed.
 */
export async function assignBinsForParts(tx: DbOrTx, actor: Actor | null, partIds: number[]): Promise<number> {
  if (partIds.length === 0) return 0;
  const rows = await tx
    .select({ part: schema.part, fit: schema.fit, type: schema.deviceType })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.part.deviceTypeId))
    .where(and(inArray(schema.part.id, partIds), inArray(schema.fit.review, [...BINNABLE_REVIEWS])))
    .orderBy(schema.part.id);
  const typeIds = [...new Set(rows.map((r) => r.type.id))];
  if (typeIds.length === 0) return 0;
  // Share-lock the types: a plan activation (which locks its type for update) then waits for
  // this transaction, or this one waits for it and sees the new plan.
  await tx.select({ id: schema.deviceType.id }).from(schema.deviceType).where(inArray(schema.deviceType.id, typeIds)).orderBy(schema.deviceType.id).for('share');
  const plans = await tx
    .select()
    .from(schema.binPlan)
    .where(and(inArray(schema.binPlan.deviceTypeId, typeIds), eq(schema.binPlan.isActive, true)));
  const planByType = new Map(plans.map((p) => [p.deviceTypeId, p]));
  const bins = plans.length
    ? await tx.select().from(schema.bin).where(inArray(schema.bin.binPlanId, plans.map((p) => p.id)))
    : [];
  const binByPlanCode = new Map(bins.map((b) => [`${b.binPlanId}:${b.code}`, b]));

  const moves: { partId: number; serial: string; fromBinId: number | null; bin: typeof schema.bin.$inferSelect; fitId: number; planVersion: number }[] = [];
  for (const { part, fit, type } of rows) {
    const plan = planByType.get(type.id);
    if (!plan) continue;
    const definition = plan.definition as BinPlan;
    const assignment = assignBin(definition, binFiguresOf(fit, type, definition));
    const target = binByPlanCode.get(`${plan.id}:${assignment.code}`);
    if (!target || target.id === part.binId) continue;
    moves.push({ partId: part.id, serial: part.serial, fromBinId: part.binId, bin: target, fitId: fit.id, planVersion: plan.version });
  }
  if (moves.length === 0) return 0;

  const now = new Date();
  for (const binId of new Set(moves.map((m) => m.bin.id))) {
    const ids = moves.filter((m) => m.bin.id === binId).map((m) => m.partId);
    await tx.update(schema.part).set({ binId, updatedAt: now }).where(inArray(schema.part.id, ids));
  }
  await tx.insert(schema.binAssignment).values(
    moves.map((m) => ({ partId: m.partId, binId: m.bin.id, fitId: m.fitId, assignedBy: actor?.userId ?? actor?.stationId ?? null })),
  );
  await writeAudit(
    tx,
    actor,
    moves.map((m) => ({
      action: 'part.bin',
      subjectType: 'part',
      subjectId: m.serial,
      before: { bin_id: m.fromBinId },
      after: { bin_id: m.bin.id, bin_code: m.bin.code, plan_version: m.planVersion },
    })),
  );
  return moves.length;
}
