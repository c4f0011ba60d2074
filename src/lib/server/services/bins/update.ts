import { eq } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { UpdateBinInput, type BinJson } from '~/contracts/bins';
import { loadBin } from './get';

/** Sets a bin's home location and/or low-stock threshold; a new threshold is checked at once. */
export async function updateBin({ actor, binId, input }: { actor: Actor | null; binId: number; input: unknown }): Promise<BinJson> {
  requirePermission(actor, 'locations:manage');
  const data = UpdateBinInput.parse(input);
  const { bin, alerts } = await getDb().transaction(async (tx) => {
    const [row] = await tx.select().from(schema.bin).where(eq(schema.bin.id, binId)).for('update');
    if (!row) throw new AppError('bin_not_found', { id: binId });
    if (data.home_location_id) {
      const [loc] = await tx.select({ id: schema.location.id }).from(schema.location).where(eq(schema.location.id, data.home_location_id));
      if (!loc) throw new AppError('home_location_not_found', { id: data.home_location_id });
    }
    const next = {
      ...(data.home_location_id !== undefined ? { homeLocationId: data.home_location_id } : {}),
      ...(data.low_stock_threshold !== undefined ? { lowStockThreshold: data.low_stock_threshold } : {}),
    };
    await tx.update(schema.bin).set(next).where(eq(schema.bin.id, binId));
    await writeAudit(tx, actor, {
      action: 'bin.update',
      subjectType: 'bin',
      subjectId: binId,
      before: { code: row.code, home_location_id: row.homeLocationId, low_stock_threshold: row.lowStockThreshold },
      after: { home_location_id: next.homeLocationId, low_stock_threshold: next.lowStockThreshold },
    });
    const alerts = await checkLowStock(tx, [binId]);
    return { bin: await loadBin(tx, binId), alerts };
  });
  await mailLowStockAlerts(alerts);
  return bin;
}
