import { asc, eq, inArray, max } from 'drizzle-orm';
import { binCatalogue } from '~/core/binning';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { findDeviceType } from '../bins/device-type-ref';
import { computeRebin } from './compute-moves';
import { activePlanOf, assertPlanSize, parsePlanDefinition } from './load';
import { BinPlanDraft, type BinPlanActivated } from '~/contracts/bin-plans';
import { withStableCodesFor } from './stable-codes';

/**
 * Saves a plan as the type's next version and makes it active, in one transaction: creates its
 * bins (home location, threshold and alert state carried over from the latest earlier bin of
 * the same code, which has the same range), points every binned part at its bin in the new version, and records a
 * bin assignment and an audit entry for exactly the parts whose bin code changes (and those
 * binned for the first time). Earlier versions, their bins and all assignments stay.
 */
export async function activateBinPlan({ actor, input }: { actor: Actor | null; input: unknown }): Promise<BinPlanActivated> {
  requirePermission(actor, 'binPlans:manage');
  const draft = BinPlanDraft.parse(input);
  const draftPlan = parsePlanDefinition(draft.definition);
  assertPlanSize(draftPlan);
  const db = getDb();
  const { out, alerts } = await db.transaction(async (tx) => {
    const type = await findDeviceType(tx, draft.device_type);
    // One activation per type at a time; binning on accept share-locks the same row.
    await tx.select({ id: schema.deviceType.id }).from(schema.deviceType).where(eq(schema.deviceType.id, type.id)).for('update');
    const active = await activePlanOf(tx, type.id);
    if (draft.based_on_plan_id !== undefined && (draft.based_on_plan_id ?? null) !== (active?.id ?? null)) {
      throw new AppError('bin_plan_changed', { typeName: type.name, activeVersion: active ? active.version : null });
    }
    const [{ last }] = await tx.select({ last: max(schema.binPlan.version) }).from(schema.binPlan).where(eq(schema.binPlan.deviceTypeId, type.id));
    const version = (last ?? 0) + 1;
    const plan = await withStableCodesFor(tx, type.id, draftPlan, version);
    const rebin = await computeRebin(tx, type, active, plan, { lock: true });
    if (active) await tx.update(schema.binPlan).set({ isActive: false }).where(eq(schema.binPlan.id, active.id));
    const [created] = await tx
      .insert(schema.binPlan)
      .values({ deviceTypeId: type.id, version, name: draft.name, definition: plan, isActive: true, createdBy: actor.userId })
      .returning();

    // A code means one range in every version, so a bin's home, threshold and alert state carry
    // over from the latest earlier bin of the same code, whichever version that was.
    const previous = await tx
      .select({ bin: schema.bin })
      .from(schema.bin)
      .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
      .where(eq(schema.binPlan.deviceTypeId, type.id))
      .orderBy(asc(schema.binPlan.version));
    const prevByCode = new Map(previous.map(({ bin }) => [bin.code, bin]));
    const bins = await tx
      .insert(schema.bin)
      .values(
        binCatalogue(plan).map((e) => {
          const prev = prevByCode.get(e.code);
          return {
            binPlanId: created.id,
            code: e.code,
            label: e.label,
            ranges: e.ranges,
            isHold: e.isHold,
            homeLocationId: prev?.homeLocationId ?? null,
            lowStockThreshold: prev?.lowStockThreshold ?? 0,
            lowStockAlertedAt: prev?.lowStockAlertedAt ?? null,
          };
        }),
      )
      .returning({ id: schema.bin.id, code: schema.bin.code });
    const binIdOf = new Map(bins.map((b) => [b.code, b.id]));

    // Parts whose code stays: same bag, now the new version's bin row of that code.
    const stayByBin = new Map<number, number[]>();
    const rebinned = rebin.parts.filter((p) => p.currentCode !== p.newCode);
    for (const p of rebin.parts) {
      if (p.currentCode !== p.newCode) continue;
      const to = binIdOf.get(p.newCode)!;
      stayByBin.set(to, [...(stayByBin.get(to) ?? []), p.id]);
    }
    for (const [binId, ids] of stayByBin) {
      await tx.update(schema.part).set({ binId }).where(inArray(schema.part.id, ids));
    }
    // Parts whose code changes, or that get their first bin: re-binned with history.
    const byTarget = new Map<number, number[]>();
    for (const p of rebinned) {
      const to = binIdOf.get(p.newCode)!;
      byTarget.set(to, [...(byTarget.get(to) ?? []), p.id]);
    }
    const now = new Date();
    for (const [binId, ids] of byTarget) {
      await tx.update(schema.part).set({ binId, updatedAt: now }).where(inArray(schema.part.id, ids));
    }
    const by = actor.userId ?? actor.stationId ?? null;
    for (let i = 0; i < rebinned.length; i += 1000) {
      const chunk = rebinned.slice(i, i + 1000);
      await tx.insert(schema.binAssignment).values(chunk.map((p) => ({ partId: p.id, binId: binIdOf.get(p.newCode)!, fitId: p.fitId, assignedBy: by, assignedAt: now })));
      await writeAudit(
        tx,
        actor,
        chunk.map((p) => ({
          action: 'part.bin',
          subjectType: 'part',
          subjectId: p.serial,
          before: { bin_id: p.binId, bin_code: p.currentCode },
          after: { bin_id: binIdOf.get(p.newCode)!, bin_code: p.newCode, plan_version: version },
          reason: `bin plan version ${version} of ${type.name}`,
        })),
      );
    }
    await writeAudit(tx, actor, {
      action: 'bin_plan.activate',
      subjectType: 'bin_plan',
      subjectId: created.id,
      before: active ? { id: active.id, version: active.version, definition: active.definition } : null,
      after: { id: created.id, version, device_type: type.name, definition: plan, moved: rebin.moves.length, newly_binned: rebin.newlyBinned.length },
    });
    const alerts = await checkLowStock(tx, bins.map((b) => b.id));
    return {
      alerts,
      out: {
        plan: { id: created.id, version, device_type: type.name, name: created.name, is_active: true },
        bin_count: bins.length,
        moved_count: rebin.moves.length,
        newly_binned_count: rebin.newlyBinned.length,
        unchanged_count: rebin.unchangedCount,
        moves: rebin.moves,
        move_counts: rebin.counts,
        relabelled: rebin.relabelled,
      },
    };
  });
  await mailLowStockAlerts(alerts);
  return out;
}
