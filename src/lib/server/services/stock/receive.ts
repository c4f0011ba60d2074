import { and, eq } from 'drizzle-orm';
import { getDb, schema } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { lockPartsById, lockPartsBySerial, refuseBatch, resolveLocation, statusWords, stockActionResult, type Refusal } from './batch';
import { ReceiveInput, type StockActionResult } from '~/contracts/stock';

/** States a part may be received from: freshly accepted, or back from an issue. */
const RECEIVABLE = ['accepted', 'returned'] as const;

/**
 * Puts accepted parts on the shelf: each at its bin's home location (or the one given), all
 * in one transaction through the status service. One part that cannot be received refuses
 * the batch, naming each such part and why.
 */
export async function receiveParts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockActionResult> {
  requirePermission(actor, 'stock:receive');
  const data = ReceiveInput.parse(input);
  const { result, alerts } = await getDb().transaction(async (tx) => {
    const target = await resolveLocation(tx, data);
    let parts;
    if (data.serials?.length) {
      parts = await lockPartsBySerial(tx, data.serials);
    } else {
      const lotRef = String(data.lot);
      const [lot] = await tx
        .select({ id: schema.lot.id, code: schema.lot.code })
        .from(schema.lot)
        .where(/^\d+$/.test(lotRef) ? eq(schema.lot.id, Number(lotRef)) : eq(schema.lot.code, lotRef));
      if (!lot) throw new AppError('lot_not_found', { ref: lotRef });
      const ids = await tx
        .select({ id: schema.part.id })
        .from(schema.part)
        .where(and(eq(schema.part.lotId, lot.id), eq(schema.part.status, 'accepted')));
      parts = await lockPartsById(tx, ids.map((r) => r.id));
      // Another batch may have taken some between the look-up and the lock.
      parts = parts.filter((p) => p.status === 'accepted');
      if (parts.length === 0) throw new AppError('lot_nothing_to_receive', { code: lot.code });
    }
    const refused: Refusal[] = [];
    for (const p of parts) {
      if (!(RECEIVABLE as readonly string[]).includes(p.status)) {
        refused.push({ serial: p.serial, reason: `it is ${statusWords(p.status)}; only accepted or returned parts are received` });
      } else if (p.binId === null || !p.binActive) {
        refused.push({ serial: p.serial, reason: 'it has no bin in its type’s active plan yet (is there an active bin plan?)' });
      } else if (!target && p.homeLocationId === null) {
        refused.push({ serial: p.serial, reason: `its bin ${p.binCode} has no home location; set one on the Stock page or scan a location` });
      }
    }
    if (refused.length) refuseBatch(refused);
    const changed = await changePartStatuses(
      tx,
      actor,
      parts.map((p) => ({ partId: p.id, to: 'in_stock' as const, set: { locationId: target?.id ?? p.homeLocationId } })),
      { action: 'stock.receive', reason: data.reason ?? null },
    );
    const alerts = await checkLowStock(tx, parts.map((p) => p.binId), { mayDrop: false });
    const result = await stockActionResult(tx, 'receive', parts, changed, alerts);
    return { result, alerts };
  });
  await mailLowStockAlerts(alerts);
  return result;
}
