import { getDb } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { changePartStatuses } from '../parts/change-status';
import { lockPartsBySerial, refuseBatch, resolveLocation, statusWords, stockActionResult, type Refusal } from './batch';
import { MoveInput, type StockActionResult } from '~/contracts/stock';

/**
 * Moves parts on the shelf to another location (or back to their bin's home), in one
 * transaction. Only parts in stock move; on-hand counts do not change, so no alert check.
 */
export async function moveParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockActionResult> {
  requirePermission(actor, 'stock:move');
  const data = MoveInput.parse(input);
  return getDb().transaction(async (tx) => {
    const target = await resolveLocation(tx, data);
    const parts = await lockPartsBySerial(tx, data.serials);
    const refused: Refusal[] = [];
    for (const p of parts) {
      if (p.status !== 'in_stock') refused.push({ serial: p.serial, reason: `it is ${statusWords(p.status)}; only parts in stock are moved` });
      else if (!target && p.homeLocationId === null) refused.push({ serial: p.serial, reason: `its bin ${p.binCode ?? '(none)'} has no home location; scan where it goes` });
    }
    if (refused.length) refuseBatch(refused);
    const changed = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'in_stock' as const, set: { locationId: target?.id ?? p.homeLocationId } })),
      { action: 'stock.move', reason: data.reason ?? null },
    );
    return stockActionResult(tx, 'move', parts, changed, []);
  });
}
