import { and, desc, eq } from 'drizzle-orm';
import { binCatalogue, parseBinPlan, type BinPlan } from '~/core/binning';
import { schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';

export async function activePlanOf(tx: DbOrTx, deviceTypeId: number) {
  const [row] = await tx
    .select()
    .from(schema.binPlan)
    .where(and(eq(schema.binPlan.deviceTypeId, deviceTypeId), eq(schema.binPlan.isActive, true)))
    .orderBy(desc(schema.binPlan.version))
    .limit(1);
  return row ?? null;
}

/** Parses the `definition` of an admin's request; a BinPlanError names its fields under `definition`. */
export function parsePlanDefinition(input: unknown): BinPlan {
  const plan = parseBinPlan(input, ['definition']);
  binCatalogue(plan);
  return plan;
}

/** Most bins one plan may have (grid cells plus hold); keeps a typo from making 10⁶ rows. */
export const MAX_BINS_PER_PLAN = 2500;

export function assertPlanSize(plan: BinPlan): number {
  const n = binCatalogue(plan).length;
  if (n > MAX_BINS_PER_PLAN) {
    throw new AppError('bin_plan_too_many_bins', { bins: n, max: MAX_BINS_PER_PLAN });
  }
  return n;
}
