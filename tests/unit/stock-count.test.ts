import { describe, expect, it } from 'vitest';
import { compareStockCount, type CountedPart } from '~/core/stock/compare-stock-count';

// Derived from the meaning of a stock count (issue 13, "Stores: stock-count mode"): every
// serial lands in exactly one class, and a part recorded here but not scanned is missing.
const at = (serial: string, status: CountedPart['status'], locationId: number | null, locationName: string | null = null): CountedPart => ({
  serial,
  status,
  locationId,
  locationName,
});

describe('compareStockCount', () => {
  const drawer = 7;
  const recordedHere = [at('A1', 'in_stock', drawer), at('A2', 'in_stock', drawer), at('A3', 'reserved', drawer)];

  it('sorts every scan into found, misplaced, unexpected or unknown, and lists what was not scanned as missing', () => {
    const r = compareStockCount({
      locationId: drawer,
      recordedHere,
      scanned: ['A1', 'B9', 'A3', 'Z0', 'C4'],
      scannedElsewhere: [at('B9', 'in_stock', 3, 'Drawer 3'), at('C4', 'issued', null)],
    });
    expect(r.found).toEqual(['A1', 'A3']);
    expect(r.missing.map((p) => p.serial)).toEqual(['A2']);
    expect(r.misplaced).toEqual([at('B9', 'in_stock', 3, 'Drawer 3')]);
    expect(r.unexpected.map((p) => p.serial)).toEqual(['C4']);
    expect(r.unknown).toEqual(['Z0']);
  });

  it('a count that matches the records has nothing to correct', () => {
    const r = compareStockCount({ locationId: drawer, recordedHere, scanned: ['A3', 'A2', 'A1'], scannedElsewhere: [] });
    expect(r).toEqual({ found: ['A3', 'A2', 'A1'], missing: [], misplaced: [], unexpected: [], unknown: [] });
  });

  it('an empty scan of a full drawer makes every shelf part missing; a part on the shelf with no location is misplaced', () => {
    expect(compareStockCount({ locationId: drawer, recordedHere, scanned: [], scannedElsewhere: [] }).missing).toHaveLength(3);
    const r = compareStockCount({ locationId: drawer, recordedHere: [], scanned: ['N1'], scannedElsewhere: [at('N1', 'in_stock', null)] });
    expect(r.misplaced.map((p) => p.serial)).toEqual(['N1']);
  });

  it('a scanned serial counts once, however often it was scanned', () => {
    const r = compareStockCount({ locationId: drawer, recordedHere, scanned: ['A1', 'A1', 'A2', 'A3'], scannedElsewhere: [] });
    expect(r.found).toEqual(['A1', 'A2', 'A3']);
  });
});
