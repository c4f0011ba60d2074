import { eq } from 'drizzle-orm';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import type { BinJson } from '~/contracts/bins';
import { binJson } from './bin-json';
import { binColumns } from './list';
import { countSql } from './counts';

/** One bin of any plan version, with its counts. */
export async function loadBin(tx: DbOrTx, binId: number): Promise<BinJson> {
  const rows = await tx
    .select({ ...binColumns, onHand: countSql.onHand, reserved: countSql.reserved, issued: countSql.issued })
    .from(schema.bin)
    .innerJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .innerJoin(schema.deviceType, eq(schema.deviceType.id, schema.binPlan.deviceTypeId))
    .leftJoin(schema.location, eq(schema.location.id, schema.bin.homeLocationId))
    .where(eq(schema.bin.id, binId));
  const r = rows[0];
  if (!r) throw new AppError('bin_not_found', { id: binId });
  return binJson(r, { onHand: r.onHand, reserved: r.reserved, issued: r.issued });
}

export async function getBin({ actor, binId }: { actor: Actor | null; binId: number }): Promise<BinJson> {
  requirePermission(actor, 'stock:read');
  return loadBin(getDb(), binId);
}
