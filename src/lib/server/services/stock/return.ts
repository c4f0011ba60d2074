import { getDb } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { changePartStatuses, type ChangedPart } from '../parts/change-status';
import { lockPartsBySerial, refuseBatch, resolveLocation, statusWords, stockActionResult, type Refusal } from './batch';
import { ReturnInput, type StockActionResult } from '~/contracts/stock';

/**
 * Takes issued parts back: they become returned (to be looked at), or, with `restock`, go
 * straight back on the shelf at their bin's home location (or the one given). One transaction.
 */
export async function returnParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockActionResult> {
  requirePermission(actor, 'stock:return');
  const data = ReturnInput.parse(input);
  if (data.restock) requirePermission(actor, 'stock:receive');
  const { result, alerts } = await getDb().transaction(async (tx) => {
    const target = data.restock ? await resolveLocation(tx, data) : null;
    const parts = await lockPartsBySerial(tx, data.serials);
    const refused: Refusal[] = [];
    for (const p of parts) {
      if (p.status !== 'issued') refused.push({ serial: p.serial, reason: `it is ${statusWords(p.status)}; only issued parts are returned` });
      else if (data.restock && !target && (p.homeLocationId === null || !p.binActive)) {
        refused.push({ serial: p.serial, reason: `its bin ${p.binCode ?? '(none)'} has no home location in the active plan; return it without restocking, or scan a location` });
      }
    }
    if (refused.length) refuseBatch(refused);
    let changed: ChangedPart[] = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'returned' as const, set: { reservationId: null } })),
      { action: 'stock.return', reason: data.reason ?? null },
    );
    if (data.restock) {
      const restocked = await changePartStatuses(
        tx,
        actor,
        parts.map((p) => ({ partId: p.id, to: 'in_stock' as const, set: { locationId: target?.id ?? p.homeLocationId } })),
        { action: 'stock.receive', reason: data.reason ? `returned: ${data.reason}` : 'returned and put back' },
      );
      changed = changed.map((c, i) => ({ ...restocked[i], from: c.from }));
    }
    const alerts = await checkLowStock(tx, parts.map((p) => p.binId), { mayDrop: false });
    const result = await stockActionResult(tx, 'return', parts, changed, alerts);
    return { result, alerts };
  });
  await mailLowStockAlerts(alerts);
  return result;
}
