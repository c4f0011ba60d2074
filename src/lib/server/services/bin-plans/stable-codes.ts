import { eq } from 'drizzle-orm';
import { withStableBinCodes, type BinPlan, type BinRange } from '~/core/binning';
import { schema, type DbOrTx } from '~/db/client';

/** `plan` as version `version` of the type, with codes that no earlier version used for another range. */
export async function withStableCodesFor(tx: DbOrTx, deviceTypeId: number, plan: BinPlan, version: number): Promise<BinPlan> {
  const earlier = await tx
    .select({ code: schema.bin.code, ranges: schema.bin.ranges })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .where(eq(schema.binPlan.deviceTypeId, deviceTypeId));
  return withStableBinCodes(plan, earlier.map((b) => ({ code: b.code, ranges: (Array.isArray(b.ranges) ? b.ranges : []) as BinRange[] })), version);
}
