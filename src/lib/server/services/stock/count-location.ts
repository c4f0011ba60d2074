import { and, eq, inArray, isNull } from 'drizzle-orm';
import { compareStockCount, type CountedPart, type StockCountResult } from '~/core/stock/compare-stock-count';
import { describePartStatus } from '~/core/stock/part-transitions';
import { StockCountInput, type StockCountJson, type StockCountPart } from '~/contracts/stock';
import { getDb, schema, type DbOrTx } from '~/db/client';
import { writeAudit } from '~/lib/server/audit';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { checkLowStock, mailLowStockAlerts, type LowStockAlert } from '../alerts/low-stock';
import { changePartStatuses } from '../parts/change-status';
import { alertsJson, lockPartsById, resolveLocation } from './batch';

const ON_SHELF = ['in_stock', 'reserved'] as const;

async function loadCount(tx: DbOrTx, locationId: number, serials: readonly string[]) {
  const cols = {
    id: schema.part.id,
    serial: schema.part.serial,
    status: schema.part.status,
    locationId: schema.part.locationId,
    locationName: schema.location.name,
    binId: schema.part.binId,
  };
  const here = await tx
    .select(cols)
    .from(schema.part)
    .leftJoin(schema.location, eq(schema.location.id, schema.part.locationId))
    .where(and(eq(schema.part.locationId, locationId), inArray(schema.part.status, [...ON_SHELF])));
  const scanned = serials.length
    ? await tx.select(cols).from(schema.part).leftJoin(schema.location, eq(schema.location.id, schema.part.locationId)).where(inArray(schema.part.serial, [...serials]))
    : [];
  return { here, scanned };
}

function countedPartJson(p: CountedPart): StockCountPart {
  return { serial: p.serial, status: p.status, status_words: describePartStatus(p.status), recorded_at: p.locationName };
}

/**
 * A stock count of one location: the parts scanned there against the parts the records put
 * there. Without `apply` it only compares. With `apply`, in ONE transaction, it moves the
 * misplaced parts here (they were found here), puts missing in-stock parts on hold so nobody
 * reserves a part that is not there, and writes the count itself to the audit log. Reserved
 * parts that are missing are left as they are and named, for the person handling the
 * reservation. Running the same apply twice changes nothing the second time.
 */
export async function countLocationStock({ actor, input }: { actor: Actor | null; input: unknown }): Promise<StockCountJson> {
  requirePermission(actor, 'stock:move');
  const data = StockCountInput.parse(input);
  const { json, alerts } = await getDb().transaction(async (tx) => {
    const location = (await resolveLocation(tx, { location_barcode: data.location_barcode }))!;
    let loaded = await loadCount(tx, location.id, data.serials);
    if (data.apply) {
      // Lock every part involved (id order, as every batch does), then read them again under the lock.
      await lockPartsById(tx, [...new Set([...loaded.here, ...loaded.scanned].map((p) => p.id))]);
      loaded = await loadCount(tx, location.id, data.serials);
    }
    const hereSerials = new Set(loaded.here.map((p) => p.serial));
    const result: StockCountResult = compareStockCount({
      locationId: location.id,
      recordedHere: loaded.here,
      scanned: data.serials,
      scannedElsewhere: loaded.scanned.filter((p) => !hereSerials.has(p.serial)),
    });
    let applied: StockCountJson['applied'] = null;
    let alerts: LowStockAlert[] = [];
    if (data.apply) {
      const bySerial = new Map([...loaded.here, ...loaded.scanned].map((p) => [p.serial, p]));
      const reason = `stock count of ${location.name}`;
      const moveInStock = result.misplaced.filter((p) => p.status === 'in_stock').map((p) => bySerial.get(p.serial)!);
      const moveReserved = result.misplaced.filter((p) => p.status === 'reserved').map((p) => bySerial.get(p.serial)!);
      await changePartStatuses(
        tx,
        actor,
        moveInStock.map((p) => ({ partId: p.id, to: 'in_stock' as const, set: { locationId: location.id } })),
        { action: 'stock.count_move', reason: `found in ${location.name} during a stock count` },
      );
      if (moveReserved.length) {
        // A reserved part keeps its status; its place (and the unpicked pick line's) follows it.
        const ids = moveReserved.map((p) => p.id);
        await tx.update(schema.part).set({ locationId: location.id, updatedAt: new Date() }).where(inArray(schema.part.id, ids));
        await tx.update(schema.pickLine).set({ locationId: location.id }).where(and(inArray(schema.pickLine.partId, ids), isNull(schema.pickLine.pickedAt)));
        await writeAudit(
          tx,
          actor,
          moveReserved.map((p) => ({
            action: 'stock.count_move',
            subjectType: 'part',
            subjectId: p.serial,
            before: { status: p.status, location_id: p.locationId },
            after: { status: p.status, location_id: location.id },
            reason: `found in ${location.name} during a stock count`,
          })),
        );
      }
      const hold = data.hold_missing ? result.missing.filter((p) => p.status === 'in_stock').map((p) => bySerial.get(p.serial)!) : [];
      await changePartStatuses(
        tx,
        actor,
        hold.map((p) => ({ partId: p.id, to: 'quarantined' as const, set: { locationId: null } })),
        { action: 'stock.count_missing', reason: `not found in ${location.name} during a stock count` },
      );
      alerts = await checkLowStock(tx, hold.map((p) => p.binId));
      applied = {
        moved_here: [...moveInStock, ...moveReserved].map((p) => p.serial),
        held: hold.map((p) => p.serial),
        left_reserved: result.missing.filter((p) => p.status === 'reserved').map((p) => p.serial),
      };
      await writeAudit(tx, actor, {
        action: 'stock.count',
        subjectType: 'location',
        subjectId: location.id,
        after: {
          location: location.name,
          recorded: loaded.here.length,
          found: result.found.length,
          missing: result.missing.map((p) => p.serial),
          misplaced: result.misplaced.map((p) => p.serial),
          unexpected: result.unexpected.map((p) => p.serial),
          unknown: result.unknown,
          ...applied,
        },
        reason,
      });
    }
    const json: StockCountJson = {
      location,
      recorded: loaded.here.length,
      found: result.found,
      missing: result.missing.map(countedPartJson),
      misplaced: result.misplaced.map(countedPartJson),
      unexpected: result.unexpected.map(countedPartJson),
      unknown: result.unknown,
      applied,
      low_stock_alerts: alertsJson(alerts),
    };
    return { json, alerts };
  });
  await mailLowStockAlerts(alerts);
  return json;
}
