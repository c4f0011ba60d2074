import type { JfetParams } from '../jfet-model.ts';
import type {
  CurveFamily,
  Estimate,
  ExtendedModelTest,
  FitFlag,
  FitModel,
  FitOptions,
  FitResult,
  FittedResult,
} from './definitions.ts';
import { deriveFigures, measuredIdssA } from './derived-figures.ts';
import { screenExtendedModel } from './extended-model-screen.ts';
import { fTestTwoExtraParameters } from './f-test.ts';
import {
  MIN_CONDUCTING_CURVES,
  MIN_SATURATION_POINTS,
  POOR_FIT_RELATIVE_RMS,
  applyExclusion,
  breakdownFlag,
  detectBreakdown,
  detectSelfHeating,
  modelDisagreesFlag,
  noConvergenceFlag,
  notFittableFlag,
  parameterAtBoundFlag,
  poorFitFlag,
  selfHeatingFlag,
  tooFewCurvesFlag,
  tooFewSaturationPointsFlag,
} from './flags.ts';
import { solveLeastSquares, type LeastSquaresSolution } from './least-squares.ts';
import {
  D_BETA,
  D_LAMBDA,
  D_VTO,
  PARTIALS_LENGTH,
  intrinsicCurrentWithPartials,
} from './level1-partials.ts';
import { prepareCurves, type PreparedCurve } from './prepared-curves.ts';
import { D_RD, D_RS, SERIES_PARTIALS_LENGTH, seriesCurrentWithPartials } from './series-resistance.ts';
import { countConductingCurves, estimateStartingValues, type StartingValues } from './starting-values.ts';
import { compareModelWithMeasurements } from '../operating-point/model-agreement.ts';
import { buildOperatingTable } from '../operating-point/operating-table.ts';

/** Changes whenever a change here could move a fitted number; stored with every fit. */
export const FIT_ENGINE_VERSION =
  'sluice-fit/1.2.0 (level1, measured operating table, rs_rd F-test p<0.01 after a one-step score screen skipping at predicted p>0.5, ml-levenberg-marquardt 5.1.0)';

const PARAM_NAMES = ['VTO', 'BETA', 'LAMBDA', 'RS', 'RD'];

/** Fitted points flattened for the hot loop. */
interface FitPoints {
  n: number;
  vgsV: Float64Array;
  vdsV: Float64Array;
  idA: Float64Array;
}

/**
 * Scaling that makes every fitted quantity O(1): u = [VTO/|VTO₀|, ln(BETA/BETA₀),
 * LAMBDA·VDSmax, RS/R₀, RD/R₀] with R₀ = |VTO₀|/I₀, and residuals in units of I₀ = BETA₀·VTO₀².
 */
interface Scaling {
  vtoScaleV: number;
  beta0: number;
  vdsMaxV: number;
  rScaleOhm: number;
  iScaleA: number;
}

interface ModelFit {
  model: FitModel;
  solution: LeastSquaresSolution;
  params: JfetParams;
  /** 5 × 5 covariance in COVARIANCE_ORDER (zeros for RS, RD in the level-1 model). */
  covariance: Float64Array;
  sseA2: number;
}

/**
 * Fits one sweep jointly to the SPICE level-1 JFET model and derives the data-sheet figures.
 * Steps: starting values from the saturation region; self-heating and breakdown points left
 * out (flagged); Levenberg–Marquardt on VTO, BETA, LAMBDA; with `extended` 'auto' (default)
 * also on RS and RD, kept when the extra-sum-of-squares F-test gives p < 0.01, unless the
 * one-step screen (`screenExtendedModel`) predicts p > 0.5, which leaves the RS/RD fit out;
 * 'always' fits and keeps it regardless, 'never' skips it. Any flag but an advisory one sets
 * `needsReview`. The result also carries the measurements in compact form for operating-point
 * figures (`operatingTable`) and the model's VGS against the measured one (`modelAgreement`).
 */
export function fitCurveFamily(family: CurveFamily, options: FitOptions): FitResult {
  const curves = prepareCurves(family, options.excludedPoints);
  const temperatureC = options.temperatureC ?? null;
  const flags: FitFlag[] = [];

  let start = estimateStartingValues(curves);
  if (!start) {
    const conducting = countConductingCurves(curves);
    const why = conducting >= 2 ? tooFewSaturationPointsFlag(0, 0) : notFittableFlag(conducting);
    return { status: 'not_fitted', engineVersion: FIT_ENGINE_VERSION, flags: [why], needsReview: true, temperatureC };
  }
  const selfHeating = detectSelfHeating(curves, start.vtoV);
  if (selfHeating.flatIndices.length > 0) {
    applyExclusion(curves, selfHeating);
    flags.push(selfHeatingFlag(selfHeating));
  }
  const breakdown = detectBreakdown(curves, start.vtoV);
  if (breakdown.flatIndices.length > 0) {
    applyExclusion(curves, breakdown);
    flags.push(breakdownFlag(breakdown));
  }
  if (flags.length > 0) start = estimateStartingValues(curves) ?? start;

  if (start.conductingCurveCount < MIN_CONDUCTING_CURVES) flags.push(tooFewCurvesFlag(start.conductingCurveCount));
  if (start.saturatedCurveCount < 2 || start.saturationPointCount < MIN_SATURATION_POINTS) {
    flags.push(tooFewSaturationPointsFlag(start.saturationPointCount, start.saturatedCurveCount));
  }

  const points = flattenIncluded(curves);
  if (points.n < 6) {
    flags.push(notFittableFlag(start.conductingCurveCount));
    return { status: 'not_fitted', engineVersion: FIT_ENGINE_VERSION, flags, needsReview: true, temperatureC };
  }
  const scaling = scalingFor(start, points);
  const extended = options.extended ?? 'auto';

  const simple = fitModel('level1', points, scaling, start, null, options);
  let chosen = simple;
  let extendedTest: ExtendedModelTest | null = null;
  if (extended !== 'never' && points.n > 8) {
    const screen = extended === 'auto' ? screenExtendedModel(points, simple.params, simple.sseA2) : null;
    const predicted = screen
      ? { predictedFStatistic: screen.predicted.fStatistic, predictedPValue: screen.predicted.pValue }
      : {};
    if (screen?.skip) {
      extendedTest = { ...screen.predicted, kept: false, screened: true, ...predicted };
    } else {
      const full = fitModel('level1+rs_rd', points, scaling, start, simple.params, options);
      extendedTest = { ...fTestTwoExtraParameters(simple.sseA2, full.sseA2, points.n, 5), screened: false, ...predicted };
      if (extended === 'always' || extendedTest.kept) chosen = full;
    }
  }
  return assemble(chosen, curves, points, options, flags, extendedTest, temperatureC);
}

function flattenIncluded(curves: readonly PreparedCurve[]): FitPoints {
  let n = 0;
  for (const c of curves) for (let k = 0; k < c.included.length; k++) n += c.included[k];
  const pts: FitPoints = { n, vgsV: new Float64Array(n), vdsV: new Float64Array(n), idA: new Float64Array(n) };
  let i = 0;
  for (const c of curves) {
    for (let k = 0; k < c.included.length; k++) {
      if (!c.included[k]) continue;
      pts.vgsV[i] = c.vgsV;
      pts.vdsV[i] = c.vdsV[k];
      pts.idA[i] = c.idA[k];
      i++;
    }
  }
  return pts;
}

function scalingFor(start: StartingValues, points: FitPoints): Scaling {
  let vdsMaxV = 0;
  for (let i = 0; i < points.n; i++) vdsMaxV = Math.max(vdsMaxV, Math.abs(points.vdsV[i]));
  const vtoScaleV = Math.abs(start.vtoV);
  const iScaleA = start.betaAPerV2 * start.vtoV * start.vtoV;
  return { vtoScaleV, beta0: start.betaAPerV2, vdsMaxV, rScaleOhm: vtoScaleV / iScaleA, iScaleA };
}

function fitModel(
  model: FitModel,
  points: FitPoints,
  s: Scaling,
  start: StartingValues,
  from: JfetParams | null,
  options: FitOptions,
): ModelFit {
  const { n, vgsV, vdsV, idA } = points;
  const isExtended = model === 'level1+rs_rd';
  const p = isExtended ? 5 : 3;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = idA[i] / s.iScaleA;
  const partials = new Float64Array(SERIES_PARTIALS_LENGTH);
  const scratch = new Float64Array(PARTIALS_LENGTH);
  const warm = Float64Array.from(idA);
  const inv = 1 / s.iScaleA;
  const dVto = s.vtoScaleV * inv;
  const dLambda = inv / s.vdsMaxV;
  const dR = s.rScaleOhm * inv;

  const evaluate = (u: ArrayLike<number>, f: Float64Array, jac: Float64Array) => {
    const vto = u[0] * s.vtoScaleV;
    const beta = s.beta0 * Math.exp(u[1]);
    const lambda = u[2] / s.vdsMaxV;
    const dBeta = beta * inv;
    if (!isExtended) {
      for (let i = 0, b = 0; i < n; i++, b += 3) {
        f[i] = intrinsicCurrentWithPartials(vto, beta, lambda, vgsV[i], vdsV[i], partials) * inv;
        jac[b] = partials[D_VTO] * dVto;
        jac[b + 1] = partials[D_BETA] * dBeta;
        jac[b + 2] = partials[D_LAMBDA] * dLambda;
      }
      return;
    }
    const rs = u[3] * s.rScaleOhm;
    const rd = u[4] * s.rScaleOhm;
    for (let i = 0, b = 0; i < n; i++, b += 5) {
      const id = seriesCurrentWithPartials(vto, beta, lambda, rs, rd, vgsV[i], vdsV[i], warm[i], partials, scratch);
      warm[i] = id;
      f[i] = id * inv;
      jac[b] = partials[D_VTO] * dVto;
      jac[b + 1] = partials[D_BETA] * dBeta;
      jac[b + 2] = partials[D_LAMBDA] * dLambda;
      jac[b + 3] = partials[D_RS] * dR;
      jac[b + 4] = partials[D_RD] * dR;
    }
  };

  const seed = from ?? { vtoV: start.vtoV, betaAPerV2: start.betaAPerV2, lambdaPerV: start.lambdaPerV, rsOhm: 0, rdOhm: 0 };
  const initial = [seed.vtoV / s.vtoScaleV, Math.log(seed.betaAPerV2 / s.beta0), seed.lambdaPerV * s.vdsMaxV];
  const min = [-20, -Math.log(100), -0.01 * s.vdsMaxV];
  const max = [-0.01, Math.log(100), 0.5 * s.vdsMaxV];
  if (isExtended) {
    initial.push(0.02, 0.02);
    min.push(0, 0);
    max.push(5, 5);
  }
  for (let k = 0; k < p; k++) initial[k] = Math.min(Math.max(initial[k], min[k]), max[k]);

  const solution = solveLeastSquares({ pointCount: n, paramCount: p, y, evaluate, initial, min, max }, { rows: options.solverRows ?? 'compressed' });
  const u = solution.u;
  const params: JfetParams = {
    vtoV: u[0] * s.vtoScaleV,
    betaAPerV2: s.beta0 * Math.exp(u[1]),
    lambdaPerV: u[2] / s.vdsMaxV,
    rsOhm: isExtended ? u[3] * s.rScaleOhm : 0,
    rdOhm: isExtended ? u[4] * s.rScaleOhm : 0,
  };
  // ∂θ/∂u for the change of variables back to SI parameters.
  const chain = [s.vtoScaleV, params.betaAPerV2, 1 / s.vdsMaxV, s.rScaleOhm, s.rScaleOhm];
  const covariance = new Float64Array(25);
  const variance = n > p ? solution.sse / (n - p) : NaN;
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) {
      const c = solution.normalInverse ? solution.normalInverse[a * p + b] * variance : NaN;
      covariance[a * 5 + b] = c * chain[a] * chain[b];
    }
  }
  return { model, solution, params, covariance, sseA2: solution.sse * s.iScaleA * s.iScaleA };
}

function assemble(
  fit: ModelFit,
  curves: readonly PreparedCurve[],
  points: FitPoints,
  options: FitOptions,
  flags: FitFlag[],
  extendedTest: ExtendedModelTest | null,
  temperatureC: number | null,
): FittedResult {
  const { params, covariance, solution } = fit;
  const se = (k: number) => Math.sqrt(covariance[k * 5 + k]);
  const est = (value: number, k: number): Estimate => ({ value, standardError: se(k) });
  const isExtended = fit.model === 'level1+rs_rd';
  const derived = { ...deriveFigures(params, covariance, options.vdsTestV), idssMeasuredA: measuredIdssA(curves, options.vdsTestV) };

  let mean = 0;
  for (let i = 0; i < points.n; i++) mean += points.idA[i];
  mean /= points.n;
  let sst = 0;
  for (let i = 0; i < points.n; i++) sst += (points.idA[i] - mean) ** 2;
  const rmsResidualA = Math.sqrt(fit.sseA2 / points.n);
  const rmsResidualRelative = rmsResidualA / derived.idssA.value;

  if (!(rmsResidualRelative <= POOR_FIT_RELATIVE_RMS)) flags.push(poorFitFlag(rmsResidualRelative));
  // RS or RD at 0 Ω is a legitimate answer (no series resistance), not a search limit.
  const bounded = solution.atBound
    .map((b, k) => (b && !(k >= 3 && solution.u[k] <= 0) ? PARAM_NAMES[k] : null))
    .filter((x): x is string => x !== null);
  if (bounded.length > 0) flags.push(parameterAtBoundFlag(bounded));
  if (!solution.converged) flags.push(noConvergenceFlag(solution.iterations));

  const operatingTable = buildOperatingTable(curves, params.vtoV, params.lambdaPerV);
  const modelAgreement = compareModelWithMeasurements(operatingTable, params, options.vdsTestV);
  if (modelAgreement?.flagged) flags.push(modelDisagreesFlag(modelAgreement));
  const modelVgsSigmaV = Math.max(modelAgreement?.maxDisagreementV ?? 0, se(0));

  return {
    status: 'fitted',
    model: fit.model,
    engineVersion: FIT_ENGINE_VERSION,
    parameters: {
      vtoV: est(params.vtoV, 0),
      betaAPerV2: est(params.betaAPerV2, 1),
      lambdaPerV: est(params.lambdaPerV, 2),
      rsOhm: isExtended ? est(params.rsOhm, 3) : { value: 0, standardError: 0 },
      rdOhm: isExtended ? est(params.rdOhm, 4) : { value: 0, standardError: 0 },
    },
    derived,
    quality: {
      rmsResidualA,
      rmsResidualRelative,
      rSquared: sst > 0 ? 1 - fit.sseA2 / sst : NaN,
      iterations: solution.iterations,
      pointsFitted: points.n,
    },
    extendedTest,
    flags,
    needsReview: flags.some((f) => !f.advisory),
    temperatureC,
    modelAgreement,
    modelVgsSigmaV,
    operatingTable,
  };
}
