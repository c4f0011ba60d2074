import { getDb } from '../../../../db/client';
import { requirePermission, type Actor } from '../../identity';
import { changePartStatuses } from '../parts/change-status';
import { locationNames, lockPartsBySerial, refuseBatch, resolveLocation, statusWords, type Refusal, type StockActionResult } from './batch';
import { MoveInput } from './schemas';

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
    const names = await locationNames(tx, changed.map((c) => c.locationId));
    const byId = new Map(parts.map((p) => [p.id, p]));
    return {
      action: 'move' as const,
      count: changed.length,
      parts: changed.map((c) => ({ serial: c.serial, from: c.from, to: c.to, bin_code: byId.get(c.partId)!.binCode, location: c.locationId ? names.get(c.locationId) ?? null : null })),
      low_stock_alerts: [],
    };
  });
}
