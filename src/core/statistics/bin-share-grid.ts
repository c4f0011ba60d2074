/**
 * Bin shares laid out as the plan's grid over IDSS (columns) × VP (rows), so a 180-bin plan
 * reads as one picture instead of a 180-row list. Bins keep their half-open ranges [lo, hi).
 */
export interface GridBinInput {
  code: string;
  count: number;
  /** One range per plan axis; empty for the hold bin. Quantities 'idss' and 'vp' are placed on the grid. */
  ranges: readonly { quantity: string; loValue: number; hiValue: number }[];
}

export interface GridRange {
  lo: number;
  hi: number;
}

export interface BinShareCell {
  code: string;
  count: number;
  /** count / all binned parts (hold included); null when there are none. */
  share: number | null;
}

export interface BinShareGrid {
  /** IDSS ranges, low to high (left to right); a single open range when the plan has no IDSS axis. */
  idss: (GridRange | null)[];
  /** VP ranges in the order rows are drawn: from the end nearest 0 V down to the largest |VP|. */
  vp: (GridRange | null)[];
  /** cells[row][column]; null where the plan has no bin. */
  cells: (BinShareCell | null)[][];
  /** Bins off the grid (hold, and any bin of a third quantity), with their counts. */
  offGrid: BinShareCell[];
  /** Largest cell count, for shading. */
  maxCount: number;
}

const key = (r: GridRange) => `${r.lo}\u0000${r.hi}`;

/**
 * The grid, or null when the plan bins on neither IDSS nor VP (e.g. VGS at a current only).
 * A plan with one of the two axes gives a single row or column.
 */
export function binShareGrid(bins: readonly GridBinInput[]): BinShareGrid | null {
  const total = bins.reduce((n, b) => n + b.count, 0);
  const share = (count: number) => (total > 0 ? count / total : null);
  const rangeOf = (b: GridBinInput, q: 'idss' | 'vp') => {
    const r = b.ranges.find((x) => x.quantity === q);
    return r ? { lo: r.loValue, hi: r.hiValue } : null;
  };
  const onGrid = bins.filter((b) => b.ranges.length > 0 && b.ranges.every((r) => r.quantity === 'idss' || r.quantity === 'vp'));
  if (onGrid.length === 0) return null;
  const unique = (list: (GridRange | null)[]) => {
    const m = new Map<string, GridRange>();
    for (const r of list) if (r) m.set(key(r), r);
    return [...m.values()];
  };
  const idssRanges = unique(onGrid.map((b) => rangeOf(b, 'idss'))).sort((a, b) => a.lo - b.lo);
  // Rows run from the pinch-off nearest zero to the largest magnitude, for either channel.
  const vpRanges = unique(onGrid.map((b) => rangeOf(b, 'vp'))).sort((a, b) => Math.abs(a.lo + a.hi) - Math.abs(b.lo + b.hi));
  const cols: (GridRange | null)[] = idssRanges.length ? idssRanges : [null];
  const rows: (GridRange | null)[] = vpRanges.length ? vpRanges : [null];
  const colIndex = new Map(idssRanges.map((r, i) => [key(r), i]));
  const rowIndex = new Map(vpRanges.map((r, i) => [key(r), i]));
  const cells: (BinShareCell | null)[][] = rows.map(() => cols.map(() => null));
  let maxCount = 0;
  for (const b of onGrid) {
    const ir = rangeOf(b, 'idss');
    const vr = rangeOf(b, 'vp');
    const c = ir ? colIndex.get(key(ir))! : 0;
    const r = vr ? rowIndex.get(key(vr))! : 0;
    cells[r][c] = { code: b.code, count: b.count, share: share(b.count) };
    maxCount = Math.max(maxCount, b.count);
  }
  const offGrid = bins.filter((b) => !onGrid.includes(b)).map((b) => ({ code: b.code, count: b.count, share: share(b.count) }));
  return { idss: cols, vp: rows, cells, offGrid, maxCount };
}
