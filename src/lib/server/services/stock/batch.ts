import { and, eq, inArray } from 'drizzle-orm';
import type { PartStatus } from '~/core/stock/part-transitions';
import { describePartStatus } from '~/core/stock/part-transitions';
import type { StockActionResult } from '~/contracts/stock';
import { schema, type DbOrTx } from '~/db/client';
import { AppError } from '~/lib/server/errors';
import type { LowStockAlert } from '../alerts/low-stock';
import type { ChangedPart } from '../parts/change-status';

export interface LockedPart {
  id: number;
  serial: string;
  status: PartStatus;
  deviceTypeId: number;
  lotId: number | null;
  binId: number | null;
  locationId: number | null;
  binCode: string | null;
  binLabel: string | null;
  binActive: boolean | null;
  homeLocationId: number | null;
}

/**
 * Locks the parts with these serials (in id order, as the status service does, so batches
 * cannot deadlock) and returns them with their bin. Unknown serials refuse the whole batch.
 */
export async function lockPartsBySerial(tx: DbOrTx, serials: readonly string[]): Promise<LockedPart[]> {
  if (serials.length === 0) return [];
  const rows = await tx
    .select({ id: schema.part.id, serial: schema.part.serial })
    .from(schema.part)
    .where(inArray(schema.part.serial, [...serials]));
  const known = new Set(rows.map((r) => r.serial));
  const unknown = serials.filter((s) => !known.has(s));
  if (unknown.length) {
    throw new AppError('serials_unknown_in_batch', { serials: unknown }, { unknown });
  }
  return lockPartsById(tx, rows.map((r) => r.id));
}

export async function lockPartsById(tx: DbOrTx, ids: readonly number[]): Promise<LockedPart[]> {
  if (ids.length === 0) return [];
  const sorted = [...ids].sort((a, b) => a - b);
  await tx.select({ id: schema.part.id }).from(schema.part).where(inArray(schema.part.id, sorted)).orderBy(schema.part.id).for('update');
  const rows = await tx
    .select({
      id: schema.part.id,
      serial: schema.part.serial,
      status: schema.part.status,
      deviceTypeId: schema.part.deviceTypeId,
      lotId: schema.part.lotId,
      binId: schema.part.binId,
      locationId: schema.part.locationId,
      binCode: schema.bin.code,
      binLabel: schema.bin.label,
      binActive: schema.binPlan.isActive,
      homeLocationId: schema.bin.homeLocationId,
    })
    .from(schema.part)
    .leftJoin(schema.bin, eq(schema.bin.id, schema.part.binId))
    .leftJoin(schema.binPlan, eq(schema.binPlan.id, schema.bin.binPlanId))
    .where(inArray(schema.part.id, sorted))
    .orderBy(schema.part.id);
  return rows;
}

export interface Refusal {
  serial: string;
  reason: string;
}

/** Refuses the whole batch, naming each part and why, in the status service's format. */
export function refuseBatch(refused: Refusal[]): never {
  throw new AppError('status_change_refused', { refused }, { refused });
}

export function statusWords(s: PartStatus): string {
  return describePartStatus(s);
}

/** A location by id or barcode; not_found says which. */
export async function resolveLocation(
  tx: DbOrTx,
  ref: { location_id?: number; location_barcode?: string },
): Promise<{ id: number; name: string; barcode: string } | null> {
  if (ref.location_id === undefined && ref.location_barcode === undefined) return null;
  const where =
    ref.location_id !== undefined ? eq(schema.location.id, ref.location_id) : eq(schema.location.barcode, ref.location_barcode!);
  const [row] = await tx
    .select({ id: schema.location.id, name: schema.location.name, barcode: schema.location.barcode })
    .from(schema.location)
    .where(and(where));
  if (!row) {
    throw ref.location_id !== undefined
      ? new AppError('location_not_found', { id: ref.location_id })
      : new AppError('location_barcode_not_found', { barcode: ref.location_barcode! });
  }
  return row;
}

export async function locationNames(tx: DbOrTx, ids: readonly (number | null)[]): Promise<Map<number, string>> {
  const list = [...new Set(ids.filter((i): i is number => i !== null))];
  if (!list.length) return new Map();
  const rows = await tx.select({ id: schema.location.id, name: schema.location.name }).from(schema.location).where(inArray(schema.location.id, list));
  return new Map(rows.map((r) => [r.id, r.name]));
}

export function alertsJson(alerts: readonly LowStockAlert[]): StockActionResult['low_stock_alerts'] {
  return alerts.map((a) => ({ bin_code: a.code, device_type: a.deviceType, on_hand: a.onHand, threshold: a.threshold }));
}

/** The answer every stock batch gives: each changed part with its bin and where it now is. */
export async function stockActionResult(
  tx: DbOrTx,
  action: StockActionResult['action'],
  parts: readonly LockedPart[],
  changed: readonly ChangedPart[],
  alerts: readonly LowStockAlert[],
): Promise<StockActionResult> {
  const names = await locationNames(tx, changed.map((c) => c.locationId));
  const byId = new Map(parts.map((p) => [p.id, p]));
  return {
    action,
    count: changed.length,
    parts: changed.map((c) => ({ serial: c.serial, from: c.from, to: c.to, bin_code: byId.get(c.partId)!.binCode, location: c.locationId ? names.get(c.locationId) ?? null : null })),
    low_stock_alerts: alertsJson(alerts),
  };
}
