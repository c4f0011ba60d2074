import { getDb } from '../../../../db/client';
import { requirePermission, type Actor } from '../../identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { lockPartsBySerial, stockActionResult, type StockActionResult } from './batch';
import { ScrapInput } from './schemas';

/**
 * Scraps parts with a reason, in one transaction; the status service refuses parts that may
 * not be scrapped (reserved, issued, already scrapped). Bins that drop below their threshold
 * alert once.
 */
export async function scrapParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockActionResult> {
  requirePermission(actor, 'stock:scrap');
  const data = ScrapInput.parse(input);
  const { result, alerts } = await getDb().transaction(async (tx) => {
    const parts = await lockPartsBySerial(tx, data.serials);
    const changed = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'scrapped' as const, set: { locationId: null } })),
      { action: 'stock.scrap', reason: data.reason },
    );
    const alerts = await checkLowStock(tx, parts.map((p) => p.binId));
    const result = await stockActionResult(tx, 'scrap', parts, changed, alerts);
    return { result, alerts };
  });
  await mailLowStockAlerts(alerts);
  return result;
}
