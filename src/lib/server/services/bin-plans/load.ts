import { and, desc, eq } from 'drizzle-orm';
import { binCatalogue, BinPlanError, parseBinPlan, type BinPlan } from '~/core/binning';
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

/** Parses an admin's plan, turning the core's BinPlanError into invalid_input that names each field. */
export function parsePlanDefinition(input: unknown): BinPlan {
  try {
    const plan = parseBinPlan(input);
    binCatalogue(plan);
    return plan;
  } catch (err) {
    if (err instanceof BinPlanError) {
      throw new AppError('invalid_input', err.message, {
        fields: err.issues.map((i) => ({ field: ['definition', ...i.path].join('.'), message: i.message })),
      });
    }
    throw err;
  }
}

/** Most bins one plan may have (grid cells plus hold); keeps a typo from making 10⁶ rows. */
export const MAX_BINS_PER_PLAN = 2500;

export function assertPlanSize(plan: BinPlan): number {
  const n = binCatalogue(plan).length;
  if (n > MAX_BINS_PER_PLAN) {
    throw new AppError('invalid_input', `The plan makes ${n} bins; at most ${MAX_BINS_PER_PLAN} are allowed. Use wider ranges or fewer of them.`);
  }
  return n;
}
