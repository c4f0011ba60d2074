import { eq, inArray, and } from 'drizzle-orm';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';

export interface MatchDeviceType {
  id: number;
  name: string;
  channel: 'n' | 'p';
  vdsTestV: number;
}

/** The device type named (or numbered) in a request, or a not_found naming the known ones. */
export async function findDeviceType(ref: string | number, db: DbOrTx = getDb()): Promise<MatchDeviceType> {
  const rows = await db
    .select({ id: schema.deviceType.id, name: schema.deviceType.name, channel: schema.deviceType.channel, vdsTestV: schema.deviceType.vdsTestV })
    .from(schema.deviceType)
    .where(typeof ref === 'number' ? eq(schema.deviceType.id, ref) : eq(schema.deviceType.name, ref))
    .limit(1);
  if (rows[0]) return rows[0];
  const known = await db.select({ name: schema.deviceType.name }).from(schema.deviceType);
  throw new AppError('device_type_not_found', { ref, known: known.map((k) => k.name) });
}

/**
 * Bin ids for the given codes under any plan version of the type. Unknown codes are refused,
 * naming them and the codes the type has.
 */
export async function resolveBinCodes(deviceTypeId: number, codes: string[], db: DbOrTx = getDb()): Promise<Set<number>> {
  const rows = await db
    .select({ id: schema.bin.id, code: schema.bin.code })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .where(and(eq(schema.binPlan.deviceTypeId, deviceTypeId), codes.length ? inArray(schema.bin.code, codes) : undefined));
  const found = new Set(rows.map((r) => r.code));
  const missing = codes.filter((c) => !found.has(c));
  if (missing.length) {
    const all = await db
      .selectDistinct({ code: schema.bin.code })
      .from(schema.bin)
      .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
      .where(eq(schema.binPlan.deviceTypeId, deviceTypeId));
    throw new AppError(
      'device_type_bins_unknown',
      { missing, bins: all.map((a) => a.code).sort() },
      { unknown_bins: missing },
    );
  }
  return new Set(rows.map((r) => r.id));
}
