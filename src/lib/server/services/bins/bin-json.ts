import type { BinRange } from '~/core/binning';
import type { BinCounts } from '~/core/stock/stock-counts';
import type { BinJson } from '~/contracts/bins';

export interface BinRowForJson {
  id: number;
  code: string;
  label: string;
  isHold: boolean;
  ranges: unknown;
  lowStockThreshold: number;
  lowStockAlertedAt: Date | null;
  planId: number;
  planVersion: number;
  deviceTypeId: number;
  deviceTypeName: string;
  locationId: number | null;
  locationName: string | null;
  locationBarcode: string | null;
}

export function binJson(row: BinRowForJson, counts: BinCounts): BinJson {
  const ranges = (row.ranges as BinRange[]) ?? [];
  const find = (q: string) => ranges.find((r) => r.quantity === q);
  const idss = find('idss');
  const vp = find('vp');
  const vgs = find('vgs_at_current');
  return {
    id: row.id,
    code: row.code,
    label: row.label,
    is_hold: row.isHold,
    device_type: row.deviceTypeName,
    device_type_id: row.deviceTypeId,
    plan_id: row.planId,
    plan_version: row.planVersion,
    ranges: ranges.map((r) => ({ quantity: r.quantity, lo_value: r.loValue, hi_value: r.hiValue, unit: r.quantity === 'idss' ? 'A' : 'V' })),
    idss_lo_a: idss?.loValue ?? null,
    idss_hi_a: idss?.hiValue ?? null,
    vp_lo_v: vp?.loValue ?? null,
    vp_hi_v: vp?.hiValue ?? null,
    vgs_lo_v: vgs?.loValue ?? null,
    vgs_hi_v: vgs?.hiValue ?? null,
    location: row.locationId !== null ? { id: row.locationId, name: row.locationName!, barcode: row.locationBarcode! } : null,
    on_hand: counts.onHand,
    reserved: counts.reserved,
    issued: counts.issued,
    low_stock_threshold: row.lowStockThreshold,
    low: row.lowStockThreshold > 0 && counts.onHand < row.lowStockThreshold,
    low_stock_alerted_at: row.lowStockAlertedAt?.toISOString() ?? null,
  };
}
