import type { FitFlag } from './definitions.ts';
import type { ModelAgreement } from '../operating-point/model-agreement.ts';
import { fitLine } from './line-fit.ts';
import type { PreparedCurve } from './prepared-curves.ts';

/** Points a detector wants left out of the fit, and where it saw the effect begin. */
export interface Exclusion {
  curveCount: number;
  flatIndices: number[];
  fromVdsV: number;
}

/**
 * Relative RMS residual above which a fit is "poor": 2 % of IDSS. Clean level-1 data fits
 * to far below 0.1 %, and curve-tracer noise is typically a few tenths of a percent (from
 * memory); 2 % means the model, not the instrument, is failing.
 */
export const POOR_FIT_RELATIVE_RMS = 0.02;
/** Fewer conducting curves than this cannot test the square law (3 parameters). */
export const MIN_CONDUCTING_CURVES = 3;
/** At least this many saturation points in all, on at least 2 curves. */
export const MIN_SATURATION_POINTS = 10;

const SATURATION_MARGIN = 1.15;
/** Share of each curve's saturation VDS range used as the undisturbed reference line. */
const CORE_SHARE = 0.6;

function saturatedIndices(c: PreparedCurve, vtoV: number): number[] {
  const out: number[] = [];
  for (let k = 0; k < c.vdsV.length; k++) {
    if (c.included[k] && c.vdsV[k] > 0 && c.vdsV[k] >= SATURATION_MARGIN * (c.vgsV - vtoV)) out.push(k);
  }
  return out;
}

function splitCoreAndTop(c: PreparedCurve, sat: number[]) {
  const v0 = c.vdsV[sat[0]];
  const split = v0 + CORE_SHARE * (c.vdsV[sat[sat.length - 1]] - v0);
  let j = 0;
  while (j < sat.length && c.vdsV[sat[j]] <= split) j++;
  return { core: sat.slice(0, j), top: sat.slice(j) };
}

/**
 * Self-heating: on a curve whose top power VDS·ID is at least 30 % of the sweep's highest,
 * the line through the upper 40 % of the saturation range falls with a t-statistic below −4.
 * The points beyond that curve's current maximum are left out.
 */
export function detectSelfHeating(curves: readonly PreparedCurve[], vtoV: number): Exclusion {
  let powerMax = 0;
  for (const c of curves) for (let k = 0; k < c.vdsV.length; k++) powerMax = Math.max(powerMax, c.vdsV[k] * c.idA[k]);
  const found: Exclusion = { curveCount: 0, flatIndices: [], fromVdsV: Infinity };
  for (const c of curves) {
    const sat = saturatedIndices(c, vtoV);
    if (sat.length < 8) continue;
    const last = sat[sat.length - 1];
    let peak = sat[0];
    for (const k of sat) if (c.idA[k] > c.idA[peak]) peak = k;
    if (c.vdsV[last] * c.idA[peak] < 0.3 * powerMax) continue;
    const { top } = splitCoreAndTop(c, sat);
    const line = fitLine(c.vdsV, c.idA, top);
    if (!line || !(line.slope < 0) || !(line.slope < -4 * line.slopeStandardError)) continue;
    const dropped = sat.filter((k) => k > peak);
    if (dropped.length === 0) continue;
    found.curveCount++;
    found.fromVdsV = Math.min(found.fromVdsV, c.vdsV[peak]);
    for (const k of dropped) found.flatIndices.push(c.flatIndex[k]);
  }
  return found;
}

/**
 * Breakdown onset: counting down from the highest VDS, points whose current exceeds the
 * reference line (lower 60 % of the saturation range; flat at the median for cut-off
 * curves) by more than max(6 σ, 1 % of the curve's level, 0.2 % of the sweep's largest
 * current). Those points are left out.
 */
export function detectBreakdown(curves: readonly PreparedCurve[], vtoV: number): Exclusion {
  let idMax = 0;
  for (const c of curves) for (let k = 0; k < c.idA.length; k++) idMax = Math.max(idMax, c.idA[k]);
  const found: Exclusion = { curveCount: 0, flatIndices: [], fromVdsV: Infinity };
  for (const c of curves) {
    const sat = saturatedIndices(c, vtoV);
    let expected: (k: number) => number;
    let sigma = 0;
    let level = 0;
    if (sat.length >= 6) {
      const { core } = splitCoreAndTop(c, sat);
      const line = fitLine(c.vdsV, c.idA, core);
      if (!line) continue;
      expected = (k) => line.intercept + line.slope * c.vdsV[k];
      sigma = line.residualRms;
      level = line.intercept;
    } else if (c.vgsV <= vtoV) {
      const values = Array.from(c.idA).sort((a, b) => a - b);
      const median = values[Math.floor(values.length / 2)] ?? 0;
      expected = () => median;
    } else {
      continue;
    }
    const threshold = Math.max(6 * sigma, 0.01 * Math.abs(level), 0.002 * idMax);
    const marked: number[] = [];
    for (let k = c.vdsV.length - 1; k >= 0; k--) {
      if (!c.included[k]) continue;
      if (c.idA[k] - expected(k) > threshold) marked.push(k);
      else break;
    }
    if (marked.length === 0) continue;
    found.curveCount++;
    found.fromVdsV = Math.min(found.fromVdsV, c.vdsV[marked[marked.length - 1]]);
    for (const k of marked) found.flatIndices.push(c.flatIndex[k]);
  }
  return found;
}

/** Marks the detector's points as left out of the fit. */
export function applyExclusion(curves: readonly PreparedCurve[], exclusion: Exclusion): void {
  const set = new Set(exclusion.flatIndices);
  for (const c of curves) for (let k = 0; k < c.flatIndex.length; k++) if (set.has(c.flatIndex[k])) c.included[k] = 0;
}

const volts = (v: number) => `${Number(v.toPrecision(3))} V`;

export function selfHeatingFlag(e: Exclusion): FitFlag {
  return {
    code: 'self_heating',
    message:
      `Saturation current falls as VDS rises at high power on ${e.curveCount} curve(s), the mark of self-heating; ` +
      `${e.flatIndices.length} point(s) from ${volts(e.fromVdsV)} up were left out of the fit. ` +
      'Re-measure with pulsed sweeps if IDSS or gos matter.',
    excludedPoints: e.flatIndices.slice().sort((a, b) => a - b),
  };
}

export function breakdownFlag(e: Exclusion): FitFlag {
  return {
    code: 'breakdown',
    message:
      `Current rises sharply at the top of VDS on ${e.curveCount} curve(s), the onset of breakdown; ` +
      `${e.flatIndices.length} point(s) from ${volts(e.fromVdsV)} up were left out of the fit. ` +
      'Keep later sweeps below that voltage.',
    excludedPoints: e.flatIndices.slice().sort((a, b) => a - b),
  };
}

export function tooFewCurvesFlag(conducting: number): FitFlag {
  return {
    code: 'too_few_curves',
    message:
      `Only ${conducting} curve(s) carry current; at least ${MIN_CONDUCTING_CURVES} VGS steps above pinch-off are ` +
      'needed to check the square law. Re-sweep with more VGS steps between 0 V and pinch-off.',
  };
}

export function tooFewSaturationPointsFlag(points: number, curves: number): FitFlag {
  return {
    code: 'too_few_saturation_points',
    message:
      `Only ${points} point(s) on ${curves} curve(s) lie in saturation; at least ${MIN_SATURATION_POINTS} on 2 or ` +
      'more curves are needed for VTO, BETA and LAMBDA. Extend the VDS range above the pinch-off voltage.',
  };
}

export function parameterAtBoundFlag(names: string[]): FitFlag {
  return {
    code: 'parameter_at_bound',
    message:
      `${names.join(', ')} ended at the limit of the allowed range, so the value is not a true best fit. ` +
      'Check the sweep for a wrong channel, range or unit.',
  };
}

export function noConvergenceFlag(iterations: number): FitFlag {
  return {
    code: 'no_convergence',
    message: `The fit stopped after ${iterations} iterations without converging; the parameters shown are the best found.`,
  };
}

export function poorFitFlag(relativeRms: number): FitFlag {
  return {
    code: 'poor_fit',
    message:
      `The RMS residual is ${(100 * relativeRms).toPrecision(2)} % of IDSS, above the ` +
      `${100 * POOR_FIT_RELATIVE_RMS} % limit: the level-1 model does not describe this part well.`,
  };
}

export function notFittableFlag(conducting: number): FitFlag {
  return {
    code: 'too_few_curves',
    message:
      `No fit was possible: only ${conducting} curve(s) show a saturation current, and at least 2 are needed. ` +
      'Check the channel type, the VGS steps and the current range of the sweep.',
  };
}

/**
 * Advisory: the level-1 model places VGS away from where the measurements put it (see
 * `compareModelWithMeasurements`). The part is accepted as usual; its operating-point figures
 * come from the measurements, and its `.model` card is marked as an approximation.
 */
export function modelDisagreesFlag(a: ModelAgreement): FitFlag {
  const worst = a.points.reduce((w, p) => (Math.abs(p.vgsModelV - p.vgsMeasuredV) > Math.abs(w.vgsModelV - w.vgsMeasuredV) ? p : w));
  const mv = (v: number) => `${(v * 1e3).toFixed(1)} mV`;
  return {
    code: 'model_disagrees',
    advisory: true,
    message:
      `The level-1 model puts VGS ${mv(Math.abs(worst.vgsModelV - worst.vgsMeasuredV))} away from the measured value ` +
      `at ${Math.round(worst.fraction * 100)} % of IDSS (${a.vdsTestV} V), more than the ${mv(a.thresholdV)} allowed: ` +
      `this part is not square law. Matching and estimates use its measurements; its .model card is an approximation.`,
  };
}
