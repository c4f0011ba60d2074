import type { PartStatus } from './part-transitions';

/**
 * A stock count of one location (a drawer, a box): what the records say is there against
 * what was scanned there. Pure; the service loads the records and applies the corrections.
 */
export interface CountedPart {
  serial: string;
  status: PartStatus;
  /** The location the records put the part at (null: none). */
  locationId: number | null;
  locationName: string | null;
}

export interface StockCountInput {
  locationId: number;
  /** Parts the records put at this location that should be on the shelf (in stock or reserved). */
  recordedHere: readonly CountedPart[];
  /** Serials scanned at the location, as cleaned by the scanner rule, in scan order. */
  scanned: readonly string[];
  /** What the records say about scanned serials that are not in `recordedHere`. */
  scannedElsewhere: readonly CountedPart[];
}

export interface StockCountResult {
  /** Recorded here and scanned here. */
  found: string[];
  /** Recorded here, not scanned: not where the records say. */
  missing: CountedPart[];
  /** Scanned here, on the shelf by the records but at another location (or at none). */
  misplaced: CountedPart[];
  /** Scanned here but not on the shelf by the records (issued, scrapped, not yet received…). */
  unexpected: CountedPart[];
  /** Scanned serials no part has. */
  unknown: string[];
}

const ON_SHELF: readonly PartStatus[] = ['in_stock', 'reserved'];

export function compareStockCount({ locationId, recordedHere, scanned, scannedElsewhere }: StockCountInput): StockCountResult {
  const seen = new Set(scanned);
  const here = new Map(recordedHere.map((p) => [p.serial, p]));
  const elsewhere = new Map(scannedElsewhere.map((p) => [p.serial, p]));
  const out: StockCountResult = { found: [], missing: [], misplaced: [], unexpected: [], unknown: [] };
  for (const serial of seen) {
    const recorded = here.get(serial);
    if (recorded && recorded.locationId === locationId && ON_SHELF.includes(recorded.status)) {
      out.found.push(serial);
      continue;
    }
    const other = recorded ?? elsewhere.get(serial);
    if (!other) out.unknown.push(serial);
    else if (ON_SHELF.includes(other.status)) out.misplaced.push(other);
    else out.unexpected.push(other);
  }
  for (const p of recordedHere) if (!seen.has(p.serial) && ON_SHELF.includes(p.status)) out.missing.push(p);
  return out;
}
