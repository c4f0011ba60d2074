import { getDb } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { partChangeMails, sendPartChangeMails } from '../reservations/mail-part-change';
import { lockPartsBySerial, stockActionResult } from './batch';
import { ScrapInput, type StockActionResult } from '~/contracts/stock';

/**
 * Scraps parts with a reason, in one transaction; the status service refuses parts that may
 * not be scrapped (issued, already scrapped). A reserved part may be scrapped (a defect found
 * on the shelf): the designer holding it gets a mail with the set's figures. Bins that drop
 * below their threshold alert once.
 */
export async function scrapParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockActionResult> {
  requirePermission(actor, 'stock:scrap');
  const data = ScrapInput.parse(input);
  const { result, alerts, mails } = await getDb().transaction(async (tx) => {
    const parts = await lockPartsBySerial(tx, data.serials);
    const changed = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'scrapped' as const, set: { locationId: null } })),
      { action: 'stock.scrap', reason: data.reason },
    );
    const alerts = await checkLowStock(tx, parts.map((p) => p.binId));
    const result = await stockActionResult(tx, 'scrap', parts, changed, alerts);
    const mails = await partChangeMails(tx, parts.map((p) => p.id), { what: 'scrapped', by: actor.label, reason: data.reason });
    return { result, alerts, mails };
  });
  await mailLowStockAlerts(alerts);
  await sendPartChangeMails(mails);
  return result;
}
