import type { JfetParams } from '../jfet-model.ts';
import {
  D_BETA,
  D_LAMBDA,
  D_VDS,
  D_VGS,
  D_VTO,
  PARTIALS_LENGTH,
  intrinsicCurrentWithPartials,
} from './level1-partials.ts';

export const D_RS = 5;
export const D_RD = 6;
export const SERIES_PARTIALS_LENGTH = 7;

const MAX_NEWTON_STEPS = 60;

/**
 * Drain current (A) with source and drain series resistance: solves
 * ID = f(VGS − ID·RS, VDS − ID·(RS + RD)) by Newton's method, kept inside the bracket
 * [0, BETA·vov²·(1 + |λ|·VDS)] (bisection when a step leaves it). Writes the partials of the
 * solution (implicit differentiation) into `out`: slots 0–4 as in level1-partials.ts
 * (VTO, BETA, LAMBDA, VGS, VDS), then RS (5) and RD (6). `scratch` holds ≥ 5 numbers.
 * `startIdA` (e.g. the measured current or the last solution) only speeds convergence.
 */
export function seriesCurrentWithPartials(
  vtoV: number,
  beta: number,
  lambda: number,
  rsOhm: number,
  rdOhm: number,
  vgsV: number,
  vdsV: number,
  startIdA: number,
  out: Float64Array,
  scratch: Float64Array,
): number {
  if (vdsV < 0) {
    // Reverse mode: the same device seen from the other end, RS and RD swap roles.
    const id = seriesCurrentWithPartials(
      vtoV, beta, lambda, rdOhm, rsOhm, vgsV - vdsV, -vdsV, -startIdA, out, scratch,
    );
    const dg = out[D_VGS];
    const dd = out[D_VDS];
    const dRsSwapped = out[D_RS];
    out[D_VTO] = -out[D_VTO];
    out[D_BETA] = -out[D_BETA];
    out[D_LAMBDA] = -out[D_LAMBDA];
    out[D_VGS] = -dg;
    out[D_VDS] = dg + dd;
    out[D_RS] = -out[D_RD];
    out[D_RD] = -dRsSwapped;
    return -id;
  }
  const vov = vgsV - vtoV;
  const upper = vov > 0 ? beta * vov * vov * (1 + Math.abs(lambda) * vdsV) : 0;
  if (upper <= 0 || vdsV === 0) {
    out.fill(0);
    return 0;
  }
  const rTotal = rsOhm + rdOhm;
  let lo = 0;
  let hi = upper;
  let id = startIdA > 0 && startIdA < upper ? startIdA : 0.5 * upper;
  const tolerance = 1e-13 * upper;
  for (let k = 0; k < MAX_NEWTON_STEPS; k++) {
    const f = intrinsicCurrentWithPartials(
      vtoV, beta, lambda, vgsV - id * rsOhm, vdsV - id * rTotal, scratch,
    );
    const g = id - f;
    if (g > 0) hi = id;
    else lo = id;
    const slope = 1 + rsOhm * scratch[D_VGS] + rTotal * scratch[D_VDS];
    const step = g / slope;
    // A step within the tolerance ends the search: its partials (taken ≤ 1e-13·upper away)
    // serve the solution, which saves re-evaluating the model at the last Newton point.
    if (Math.abs(step) <= tolerance) {
      id -= step;
      return writeSolutionPartials(id, rsOhm, rTotal, out, scratch);
    }
    let next = id - step;
    // The root may sit on the upper end (saturation with RS = RD = 0 gives f = upper), so
    // that end is allowed; bisection otherwise crawls to it one bit per step.
    if (!(next > lo && next <= hi)) next = 0.5 * (lo + hi);
    const change = Math.abs(next - id);
    id = next;
    if (change <= tolerance) break;
  }
  intrinsicCurrentWithPartials(vtoV, beta, lambda, vgsV - id * rsOhm, vdsV - id * rTotal, scratch);
  return writeSolutionPartials(id, rsOhm, rTotal, out, scratch);
}

/** Implicit-differentiation partials of the series solution `id` from the intrinsic ones in `scratch`. */
function writeSolutionPartials(
  id: number,
  rsOhm: number,
  rTotal: number,
  out: Float64Array,
  scratch: Float64Array,
): number {
  const fg = scratch[D_VGS];
  const fd = scratch[D_VDS];
  const den = 1 + rsOhm * fg + rTotal * fd;
  out[D_VTO] = scratch[D_VTO] / den;
  out[D_BETA] = scratch[D_BETA] / den;
  out[D_LAMBDA] = scratch[D_LAMBDA] / den;
  out[D_VGS] = fg / den;
  out[D_VDS] = fd / den;
  out[D_RS] = (-id * (fg + fd)) / den;
  out[D_RD] = (-id * fd) / den;
  return id;
}

/** Drain current (A, N-equivalent) of the full level-1 model including RS and RD. */
export function drainCurrentA(p: JfetParams, vgsV: number, vdsV: number): number {
  const out = new Float64Array(SERIES_PARTIALS_LENGTH);
  const scratch = new Float64Array(PARTIALS_LENGTH);
  return seriesCurrentWithPartials(
    p.vtoV, p.betaAPerV2, p.lambdaPerV, p.rsOhm, p.rdOhm, vgsV, vdsV, 0, out, scratch,
  );
}
