import { and, eq, inArray } from 'drizzle-orm';
import { assignBin, planMoves, type BinFigures, type BinPlan, type PlanMoves } from '~/core/binning';
import { schema, type DbOrTx } from '~/db/client';
import { BINNABLE_REVIEWS } from '../bins/assign-bins';
import { binFiguresOf } from '../bins/figures';
import type { DeviceTypeRow } from '../bins/device-type-ref';
import { REBIN_STATUSES } from './schemas';

export interface PartToRebin {
  id: number;
  serial: string;
  fitId: number;
  binId: number | null;
  /** Code of its bin when that bin belongs to the active plan; otherwise null. */
  currentCode: string | null;
  newCode: string;
  status: string;
  /** The figures the new plan bins on (SI, datasheet sign). */
  figures: BinFigures;
}

export interface RebinPlan {
  parts: PartToRebin[];
  /** Parts already binned under the active plan whose code changes. */
  moves: PlanMoves['moves'];
  counts: PlanMoves['counts'];
  /** Parts that had no bin of the active plan and get one now. */
  newlyBinned: { serial: string; to: string }[];
  unchangedCount: number;
  discrepancies: PlanMoves['discrepancies'];
  relabelled: PlanMoves['relabelled'];
}

/**
 * Loads the parts to re-bin (optionally locking them, in id order) and works out where each
 * goes under `newPlan`: the core's planMoves for parts binned under the active plan, a plain
 * assignment for the rest.
 */
export async function computeRebin(
  tx: DbOrTx,
  type: DeviceTypeRow,
  active: { id: number; definition: unknown } | null,
  newPlan: BinPlan,
  { lock }: { lock: boolean },
): Promise<RebinPlan> {
  let q = tx
    .select({ id: schema.part.id, serial: schema.part.serial, binId: schema.part.binId, status: schema.part.status, fit: schema.fit })
    .from(schema.part)
    .innerJoin(schema.fit, eq(schema.fit.id, schema.part.currentFitId))
    .where(
      and(
        eq(schema.part.deviceTypeId, type.id),
        inArray(schema.part.status, [...REBIN_STATUSES]),
        inArray(schema.fit.review, [...BINNABLE_REVIEWS]),
      ),
    )
    .orderBy(schema.part.id)
    .$dynamic();
  if (lock) q = q.for('update', { of: schema.part });
  const rows = await q;
  const codeOf = new Map<number, string>();
  if (active) {
    const bins = await tx.select({ id: schema.bin.id, code: schema.bin.code }).from(schema.bin).where(eq(schema.bin.binPlanId, active.id));
    for (const b of bins) codeOf.set(b.id, b.code);
  }
  const parts: PartToRebin[] = rows.map((r) => {
    const figures = binFiguresOf(r.fit, type, newPlan);
    return {
      id: r.id,
      serial: r.serial,
      fitId: r.fit.id,
      binId: r.binId,
      currentCode: r.binId !== null ? codeOf.get(r.binId) ?? null : null,
      newCode: assignBin(newPlan, figures).code,
      status: r.status,
      figures,
    };
  });
  const binned = parts.filter((p) => p.currentCode !== null);
  const newlyBinned = parts.filter((p) => p.currentCode === null).map((p) => ({ serial: p.serial, to: p.newCode }));
  if (!active) {
    return { parts, moves: [], counts: [], newlyBinned, unchangedCount: 0, discrepancies: [], relabelled: [] };
  }
  const oldPlan = active.definition as BinPlan;
  const byId = new Map(rows.map((r) => [r.id, r]));
  const result = planMoves(
    oldPlan,
    newPlan,
    binned.map((p) => {
      const fit = byId.get(p.id)!.fit;
      // The old plan's figures: a 'vgs_at_current' axis may have another reference current.
      const oldFigures = binFiguresOf(fit, type, oldPlan);
      const newFigures = binFiguresOf(fit, type, newPlan);
      return { serial: p.serial, figures: { ...newFigures, vgsAtCurrentV: newFigures.vgsAtCurrentV ?? oldFigures.vgsAtCurrentV }, currentCode: p.currentCode };
    }),
  );
  return {
    parts,
    moves: result.moves,
    counts: result.counts,
    newlyBinned,
    unchangedCount: result.unchangedCount,
    discrepancies: result.discrepancies,
    relabelled: result.relabelled,
  };
}
