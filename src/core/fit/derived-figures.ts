import { rdsOnOhm, type JfetParams } from '../jfet-model.ts';
import { D_VDS, D_VGS, PARTIALS_LENGTH } from './level1-partials.ts';
import { SERIES_PARTIALS_LENGTH, seriesCurrentWithPartials } from './series-resistance.ts';
import type { DerivedFigures, Estimate } from './definitions.ts';
import type { PreparedCurve } from './prepared-curves.ts';

/** Parameter order of the covariance matrices used here. */
export const COVARIANCE_ORDER = ['vtoV', 'betaAPerV2', 'lambdaPerV', 'rsOhm', 'rdOhm'] as const;

/**
 * Data-sheet figures at `vdsTestV`, N-equivalent signs. IDSS, gfs and gos are those of the
 * full model at VGS = 0 (with RS and RD when fitted, i.e. the figures a curve tracer sees):
 * the current and its partials over VGS and VDS from the series-resistance solution; with
 * RS = RD = 0 they equal the closed forms BETA·VTO²·(1+λ·VDS), 2·BETA·|VTO|·(1+λ·VDS) and
 * λ·BETA·VTO². Standard errors by first-order propagation g·C·gᵀ through the 5 × 5
 * covariance `covariance` (row-major, order `COVARIANCE_ORDER`, zero rows for parameters
 * not fitted), g by central differences (forward at RS or RD = 0).
 */
export function deriveFigures(
  p: JfetParams,
  covariance: Float64Array,
  vdsTestV: number,
): Omit<DerivedFigures, 'idssMeasuredA'> {
  const vds = Math.abs(vdsTestV);
  const theta = [p.vtoV, p.betaAPerV2, p.lambdaPerV, p.rsOhm, p.rdOhm];
  const figures = (t: number[]) => {
    const id = seriesCurrentWithPartials(t[0], t[1], t[2], t[3], t[4], 0, vds, 0, out, scratch);
    return [id, t[0], out[D_VGS], out[D_VDS], rdsOnOhm(toParams(t))];
  };
  const value = figures(theta);
  const gradients = value.map(() => new Array<number>(5).fill(0));
  const floors = [1e-3, 1e-9, 1e-6, 1e-3, 1e-3];
  for (let k = 0; k < 5; k++) {
    if (!(covariance[k * 5 + k] > 0)) continue;
    const h = 1e-6 * Math.max(Math.abs(theta[k]), floors[k]);
    const forwardOnly = k >= 3 && theta[k] - h < 0;
    const up = theta.slice();
    up[k] += h;
    const down = theta.slice();
    if (!forwardOnly) down[k] -= h;
    const fu = figures(up);
    const fdn = figures(down);
    const span = forwardOnly ? h : 2 * h;
    for (let j = 0; j < value.length; j++) gradients[j][k] = (fu[j] - fdn[j]) / span;
  }
  const est = (j: number) => estimate(value[j], gradients[j], covariance);
  return { vdsTestV: vds, idssA: est(0), vpV: est(1), gfsS: est(2), gosS: est(3), rdsOnOhm: est(4) };
}

const out = new Float64Array(SERIES_PARTIALS_LENGTH);
const scratch = new Float64Array(PARTIALS_LENGTH);

function toParams(t: number[]): JfetParams {
  return { vtoV: t[0], betaAPerV2: t[1], lambdaPerV: t[2], rsOhm: t[3], rdOhm: t[4] };
}

function estimate(value: number, gradient: number[], covariance: Float64Array): Estimate {
  let variance = 0;
  for (let a = 0; a < 5; a++) {
    for (let b = 0; b < 5; b++) {
      if (gradient[a] !== 0 && gradient[b] !== 0) variance += gradient[a] * covariance[a * 5 + b] * gradient[b];
    }
  }
  return { value, standardError: Math.sqrt(Math.max(variance, 0)) };
}

/**
 * IDSS read from the data: the VGS = 0 curve's current at `vdsTestV`, linearly interpolated
 * between the two nearest points. Null when there is no VGS = 0 curve or its VDS range does
 * not reach the test VDS.
 */
export function measuredIdssA(curves: readonly PreparedCurve[], vdsTestV: number): number | null {
  const target = Math.abs(vdsTestV);
  const zero = curves.find((c) => Math.abs(c.vgsV) < 1e-6);
  if (!zero || zero.vdsV.length === 0) return null;
  const v = zero.vdsV;
  const n = v.length;
  if (target < v[0] || target > v[n - 1]) return null;
  for (let k = 1; k < n; k++) {
    if (v[k] >= target) {
      const t = v[k] === v[k - 1] ? 0 : (target - v[k - 1]) / (v[k] - v[k - 1]);
      return zero.idA[k - 1] + t * (zero.idA[k] - zero.idA[k - 1]);
    }
  }
  return v[0] === target ? zero.idA[0] : null;
}
