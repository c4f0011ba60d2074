import type { JfetParams } from '../jfet-model.ts';
import type { ExtendedModelTest } from './definitions.ts';
import { fTestTwoExtraParameters } from './f-test.ts';
import { D_BETA, D_LAMBDA, D_VTO, PARTIALS_LENGTH } from './level1-partials.ts';
import { D_RD, D_RS, SERIES_PARTIALS_LENGTH, seriesCurrentWithPartials } from './series-resistance.ts';
import { invertSymmetricPositiveDefinite } from './small-matrix.ts';

/**
 * The full RS/RD fit is skipped only when the screen's predicted p-value is above this.
 * p > 0.5 is F below ≈ 0.69 for the usual 500-odd residual degrees of freedom, about
 * F_crit/6.7 (F_crit ≈ 4.6 at p = 0.01): a wrong skip needs the true SSE reduction to be
 * ≥ 6.7 × the linearised one. Near the decision boundary RS and RD are 2–3 standard errors
 * from 0, where their effect on ID is a fraction of the noise and the model is linear in
 * them to well under 1 %; a reduction far larger than predicted needs ID·RS·gm of order 1,
 * which makes the predicted F itself large (see tests/unit/fit-extended-screen.test.ts).
 */
export const SCREEN_SKIP_P_VALUE = 0.5;

const EXTENDED_PARAM_COUNT = 5;
const RS = 3;
const RD = 4;

/** Fitted points, flattened (N-equivalent, SI). */
export interface ScreenPoints {
  n: number;
  vgsV: Float64Array;
  vdsV: Float64Array;
  idA: Float64Array;
}

export interface ExtendedModelScreen {
  /** SSE (A²) the extended model is predicted to reach by one Gauss–Newton step. */
  predictedSseA2: number;
  /** The F-test applied to that prediction. */
  predicted: ExtendedModelTest;
  /** True when the full extended fit can be left out: predicted p > SCREEN_SKIP_P_VALUE. */
  skip: boolean;
}

/**
 * Score-test style screen for the RS/RD model, run at the level-1 solution `level1`
 * (RS = RD = 0), where the extended model equals the level-1 one. With the extended
 * Jacobian J there (VTO, BETA, LAMBDA and the RS, RD columns, ∂ID/∂RS = −ID·(gm + gds),
 * ∂ID/∂RD = −ID·gds) and residuals r, one Gauss–Newton step for all 5 parameters with
 * RS, RD ≥ 0 lowers the SSE by max over feasible faces of gᵀ·H⁻¹·g (g = Jᵀr, H = JᵀJ,
 * restricted to the free parameters; a face is feasible when its step keeps RS, RD ≥ 0).
 * The level-1 parameters are left unbounded, which can only enlarge the prediction.
 * Columns are scaled to unit norm first; the decrease does not depend on that scaling.
 * A singular H gives `skip: false` (no evidence either way, so the full fit runs).
 */
export function screenExtendedModel(
  points: ScreenPoints,
  level1: JfetParams,
  sseSimpleA2: number,
): ExtendedModelScreen {
  const p = EXTENDED_PARAM_COUNT;
  const h = new Float64Array(p * p);
  const g = new Float64Array(p);
  const out = new Float64Array(SERIES_PARTIALS_LENGTH);
  const scratch = new Float64Array(PARTIALS_LENGTH);
  const row = new Float64Array(p);
  const { vtoV, betaAPerV2, lambdaPerV } = level1;
  for (let i = 0; i < points.n; i++) {
    const id = seriesCurrentWithPartials(
      vtoV, betaAPerV2, lambdaPerV, 0, 0, points.vgsV[i], points.vdsV[i], points.idA[i], out, scratch,
    );
    const r = points.idA[i] - id;
    row[0] = out[D_VTO];
    row[1] = out[D_BETA];
    row[2] = out[D_LAMBDA];
    row[RS] = out[D_RS];
    row[RD] = out[D_RD];
    for (let a = 0; a < p; a++) {
      g[a] += row[a] * r;
      for (let b = 0; b <= a; b++) h[a * p + b] += row[a] * row[b];
    }
  }
  const scale = new Float64Array(p);
  for (let a = 0; a < p; a++) scale[a] = h[a * p + a] > 0 ? 1 / Math.sqrt(h[a * p + a]) : 0;
  for (let a = 0; a < p; a++) {
    g[a] *= scale[a];
    for (let b = 0; b <= a; b++) {
      h[a * p + b] *= scale[a] * scale[b];
      h[b * p + a] = h[a * p + b];
    }
  }

  const notScreened = (): ExtendedModelScreen => ({
    predictedSseA2: NaN,
    predicted: { fStatistic: NaN, pValue: NaN, kept: false },
    skip: false,
  });
  if (!(scale[0] > 0 && scale[1] > 0 && scale[2] > 0)) return notScreened();

  let decrease = 0;
  // Faces: RS and RD each free or held at 0 (bit 0: RS free, bit 1: RD free).
  for (let face = 0; face < 4; face++) {
    const free = [0, 1, 2];
    if (face & 1) free.push(RS);
    if (face & 2) free.push(RD);
    if (free.some((k) => !(scale[k] > 0))) continue;
    const q = free.length;
    const hFree = new Float64Array(q * q);
    for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) hFree[a * q + b] = h[free[a] * p + free[b]];
    const inv = invertSymmetricPositiveDefinite(hFree, q);
    if (!inv) return notScreened();
    let faceDecrease = 0;
    let feasible = true;
    for (let a = 0; a < q; a++) {
      let step = 0;
      for (let b = 0; b < q; b++) step += inv[a * q + b] * g[free[b]];
      // `step` is the change of the (positively scaled) parameter: RS, RD may only grow.
      if (free[a] >= RS && step < 0) feasible = false;
      faceDecrease += g[free[a]] * step;
    }
    if (feasible) decrease = Math.max(decrease, faceDecrease);
  }
  const predictedSseA2 = Math.max(sseSimpleA2 - decrease, 0);
  const predicted = fTestTwoExtraParameters(sseSimpleA2, predictedSseA2, points.n, p);
  return { predictedSseA2, predicted, skip: predicted.pValue > SCREEN_SKIP_P_VALUE };
}
