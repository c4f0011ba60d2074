import { drainCurrentA } from '~/core/fit/series-resistance';
import type { JfetParams } from '~/core/jfet-model';
import type { StoredCurveJson } from '~/contracts/parts';

/** A curve as the API sends it (N-equivalent SI): what the charts read of a stored curve. */
export type ApiCurve = Pick<StoredCurveJson, 'vgs_v' | 'vds_v' | 'id_a'>;

export interface MeasuredPoint {
  curve: number;
  point: number;
  vdsV: number;
  idMa: number;
  excluded: boolean;
}

/** Nine gate steps in distinguishable colours, darkest for the most negative VGS. */
export const CURVE_COLOURS = ['#0e2e2d', '#14524f', '#217e7a', '#3d9a95', '#6b7c85', '#a4650a', '#b3352b', '#5b5a8f', '#2f7d46', '#8a4f7d', '#c27c0e', '#3d4f59'];

export function curveColour(i: number): string {
  return CURVE_COLOURS[i % CURVE_COLOURS.length];
}

export function pointKey(curve: number, point: number): string {
  return `${curve}:${point}`;
}

export function measuredPoints(curves: readonly ApiCurve[], excluded: ReadonlySet<string>): MeasuredPoint[][] {
  return curves.map((c, ci) =>
    c.vds_v.map((v, pi) => ({ curve: ci, point: pi, vdsV: v, idMa: c.id_a[pi] * 1e3, excluded: excluded.has(pointKey(ci, pi)) })),
  );
}

/** The fitted model over each curve's VDS range, in mA, on a fine grid. */
export function modelLines(curves: readonly ApiCurve[], params: JfetParams, steps = 90): { vdsV: number; idMa: number }[][] {
  return curves.map((c) => {
    const hi = Math.max(...c.vds_v, 0);
    const lo = Math.min(...c.vds_v, 0);
    return Array.from({ length: steps + 1 }, (_, k) => {
      const v = lo + ((hi - lo) * k) / steps;
      const i = drainCurrentA(params, c.vgs_v, v);
      return { vdsV: v, idMa: Number.isFinite(i) ? i * 1e3 : 0 };
    });
  });
}

/** Measured minus model, in % of IDSS, per point. */
export function residualPoints(curves: readonly ApiCurve[], params: JfetParams, idssA: number, excluded: ReadonlySet<string>) {
  return curves.map((c, ci) =>
    c.vds_v.map((v, pi) => ({
      curve: ci,
      point: pi,
      vdsV: v,
      residualPct: ((c.id_a[pi] - drainCurrentA(params, c.vgs_v, v)) / idssA) * 100,
      excluded: excluded.has(pointKey(ci, pi)),
    })),
  );
}

/** VGS of a curve in datasheet sign, for labels. */
export function vgsLabel(vgsNV: number, channel: 'n' | 'p'): string {
  const v = channel === 'n' ? vgsNV : -vgsNV;
  const text = Math.abs(v) < 5e-5 ? '0' : v.toFixed(Math.abs(v) < 1 ? 2 : 2).replace(/\.?0+$/, '');
  return `${text.replace('-', '\u2212')} V`;
}
