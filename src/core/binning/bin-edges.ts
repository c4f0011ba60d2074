import { binAxisIssues, BinPlanError, type BinAxis } from './bin-plan';

/**
 * The axis's edges in ascending order (count + 1 values for a uniform axis). Uniform edges are
 * computed as start + i·width and rounded to 12 significant digits, so decimal plans such as
 * start 6.0 mA, width 0.5 mA give edges equal to the decimal values typed, and a value typed
 * exactly on an edge lands in the upper bin as promised. Throws BinPlanError on a bad axis.
 */
export function binEdges(axis: BinAxis): number[] {
  const issues = binAxisIssues(axis);
  if (issues.length > 0) throw new BinPlanError(issues);
  const e = axis.edges;
  if (e.kind === 'explicit') return [...e.edges];
  const edges: number[] = [];
  for (let i = 0; i <= e.count; i++) {
    edges.push(Number((e.startValue + i * e.width).toPrecision(12)));
  }
  return edges;
}

/** Index of the half-open range [edges[i], edges[i+1]) holding `value`, or −1 outside the grid. */
export function rangeIndex(edges: readonly number[], value: number): number {
  if (!Number.isFinite(value) || value < edges[0] || value >= edges[edges.length - 1]) return -1;
  let lo = 0;
  let hi = edges.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (value >= edges[mid]) lo = mid;
    else hi = mid;
  }
  return lo;
}
