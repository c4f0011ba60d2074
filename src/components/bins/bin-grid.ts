/**
 * Rectangles of a bin plan's grid on the (IDSS, VP) map, in SI. A plan without one of the two
 * axes spans the whole chart in that direction; a plan binned on neither draws no grid.
 */
import type { BinJson } from '~/contracts/bins';

/** What the grid reads of a bin. */
export type MapBin = Pick<
  BinJson,
  'id' | 'code' | 'label' | 'is_hold' | 'on_hand' | 'reserved' | 'issued' | 'low' | 'low_stock_threshold' | 'location' | 'idss_lo_a' | 'idss_hi_a' | 'vp_lo_v' | 'vp_hi_v'
>;

export interface GridCell {
  bin: MapBin;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

export interface Extent {
  x: [number, number];
  y: [number, number];
}

export function gridCells(bins: readonly MapBin[], extent: Extent): GridCell[] {
  return bins
    .filter((b) => !b.is_hold && (b.idss_lo_a !== null || b.vp_lo_v !== null))
    .map((b) => ({
      bin: b,
      x0: b.idss_lo_a ?? extent.x[0],
      x1: b.idss_hi_a ?? extent.x[1],
      y0: b.vp_lo_v ?? extent.y[0],
      y1: b.vp_hi_v ?? extent.y[1],
    }));
}

/** Chart extent covering the grid and the points, with a small margin on each side. */
export function mapExtent(bins: readonly MapBin[], points: readonly { idss_a: number; vp_v: number }[]): Extent {
  const xs = [...bins.flatMap((b) => [b.idss_lo_a, b.idss_hi_a]), ...points.map((p) => p.idss_a)].filter((v): v is number => v !== null && Number.isFinite(v));
  const ys = [...bins.flatMap((b) => [b.vp_lo_v, b.vp_hi_v]), ...points.map((p) => p.vp_v)].filter((v): v is number => v !== null && Number.isFinite(v));
  const pad = (vals: number[], fallback: [number, number]): [number, number] => {
    if (!vals.length) return fallback;
    const lo = Math.min(...vals);
    const hi = Math.max(...vals);
    const m = (hi - lo || Math.abs(hi) || 1) * 0.04;
    return [lo - m, hi + m];
  };
  return { x: pad(xs, [0, 0.02]), y: pad(ys, [-4, 0]) };
}
