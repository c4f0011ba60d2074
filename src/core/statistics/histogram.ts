import { AppError } from '../errors';
export interface Histogram {
  bins: { loValue: number; hiValue: number; count: number }[];
  /** Values below the first edge / at or above the last edge (explicit edges only; 0 otherwise). */
  below: number;
  above: number;
  /** Non-finite values left out. */
  excluded: number;
}

/**
 * Counts values into ranges. With explicit `edges` (strictly increasing) every range is
 * half-open [lo, hi), as in the bin plans. With a bin count the edges span min..max of the data
 * evenly and the last range is closed [lo, max] so the maximum is counted; when all values are
 * equal there is a single range [v, v].
 */
export function histogram(values: readonly number[], binCountOrEdges: number | readonly number[]): Histogram {
  const finite = values.filter(Number.isFinite);
  const excluded = values.length - finite.length;
  if (typeof binCountOrEdges === 'number') {
    const k = binCountOrEdges;
    if (!Number.isInteger(k) || k < 1) throw new AppError('histogram_bin_count', { k });
    if (finite.length === 0) return { bins: [], below: 0, above: 0, excluded };
    let lo = finite[0];
    let hi = finite[0];
    for (const v of finite) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (lo === hi) return { bins: [{ loValue: lo, hiValue: hi, count: finite.length }], below: 0, above: 0, excluded };
    const width = (hi - lo) / k;
    const bins = Array.from({ length: k }, (_, i) => ({
      loValue: lo + i * width,
      hiValue: i === k - 1 ? hi : lo + (i + 1) * width,
      count: 0,
    }));
    for (const v of finite) {
      let i = Math.floor((v - lo) / width);
      if (i >= k) i = k - 1;
      // Guard against rounding in (v − lo)/width putting an edge value one range low or high.
      while (i > 0 && v < bins[i].loValue) i--;
      while (i < k - 1 && v >= bins[i].hiValue) i++;
      bins[i].count++;
    }
    return { bins, below: 0, above: 0, excluded };
  }
  const edges = binCountOrEdges;
  if (edges.length < 2) throw new AppError('histogram_too_few_edges');
  for (let i = 1; i < edges.length; i++) {
    if (!(edges[i] > edges[i - 1])) {
      throw new AppError('histogram_edges_not_increasing', { index: i, edge: edges[i], previous: edges[i - 1] });
    }
  }
  const bins = edges.slice(0, -1).map((e, i) => ({ loValue: e, hiValue: edges[i + 1], count: 0 }));
  let below = 0;
  let above = 0;
  for (const v of finite) {
    if (v < edges[0]) below++;
    else if (v >= edges[edges.length - 1]) above++;
    else {
      let lo = 0;
      let hi = edges.length - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (v >= edges[mid]) lo = mid;
        else hi = mid;
      }
      bins[lo].count++;
    }
  }
  return { bins, below, above, excluded };
}
