import { fitLine, type LineFit } from './line-fit.ts';
import type { PreparedCurve } from './prepared-curves.ts';

export interface StartingValues {
  vtoV: number;
  betaAPerV2: number;
  lambdaPerV: number;
  /** Curves whose largest current is above 2 % of the family's largest. */
  conductingCurveCount: number;
  /** Conducting curves with at least 3 fitted saturation points. */
  saturatedCurveCount: number;
  saturationPointCount: number;
}

/** Below this share of the largest saturation current a curve is treated as cut off. */
const CONDUCTING_SHARE = 0.02;
/** A point counts as saturated when VDS ≥ this factor × (VGS − VTO); the margin avoids the knee. */
const SATURATION_MARGIN = 1.15;

/**
 * Starting values from the saturation region: per curve a line ID = c + m·VDS, then
 * sqrt(c) against VGS (slope sqrt(BETA), x-intercept VTO) and LAMBDA = Σm / Σc.
 * The saturation boundary starts as the top 40 % of each curve's VDS and is refined twice with the VTO
 * found. Returns null when fewer than 2 curves carry current.
 */
export function estimateStartingValues(curves: readonly PreparedCurve[]): StartingValues | null {
  let vdsMaxV = 0;
  for (const c of curves) for (let k = 0; k < c.vdsV.length; k++) vdsMaxV = Math.max(vdsMaxV, c.vdsV[k]);
  if (!(vdsMaxV > 0)) return null;

  const conductingCurveCount = countConductingCurves(curves);
  let vtoV = NaN;
  let result: StartingValues | null = null;
  for (let pass = 0; pass < 3; pass++) {
    const saturated: number[][] = [];
    const fitted = curves.map((c) => {
      // Pass 0: the top 40 % of the curve's own VDS range, so that curves a power limit cut
      // short still give a first saturation line.
      const threshold = pass === 0 ? 0.6 * curveMaxVdsV(c) : Math.max(SATURATION_MARGIN * (c.vgsV - vtoV), 0);
      const indices: number[] = [];
      for (let k = 0; k < c.vdsV.length; k++) if (c.included[k] === 1 && c.vdsV[k] > 0 && c.vdsV[k] >= threshold) indices.push(k);
      saturated.push(indices);
      return fitLine(c.vdsV, c.idA, indices);
    });
    // Fewer than two lines (a transfer sweep: one or two VDS per VGS): single points stand in.
    const lines = fitted.filter((l) => l && l.intercept > 0).length >= 2 ? fitted : fitted.map((l, i) => l ?? pointLine(curves[i], saturated[i]));
    let cMax = 0;
    for (const l of lines) if (l) cMax = Math.max(cMax, l.intercept);
    if (!(cMax > 0)) return result;

    const xs: number[] = [];
    const ys: number[] = [];
    let slopeSum = 0;
    let interceptSum = 0;
    let saturatedCurveCount = 0;
    let saturationPointCount = 0;
    lines.forEach((l, i) => {
      if (!l || l.intercept <= CONDUCTING_SHARE * cMax) return;
      xs.push(curves[i].vgsV);
      ys.push(Math.sqrt(l.intercept));
      slopeSum += l.slope;
      interceptSum += l.intercept;
      saturatedCurveCount++;
      saturationPointCount += l.count;
    });
    if (xs.length < 2) return result;
    const root = fitLine(xs, ys, Array.from(xs.keys())) ?? twoPointLine(xs, ys);
    vtoV = root.slope > 0 ? -root.intercept / root.slope : NaN;
    const vgsLowest = Math.min(...xs);
    if (!(vtoV < vgsLowest)) vtoV = vgsLowest - 0.1 * Math.max(1e-3, Math.abs(vgsLowest));
    const iAtLowest = ys[xs.indexOf(vgsLowest)] ** 2;
    const betaAPerV2 = root.slope > 0 ? root.slope ** 2 : iAtLowest / (vgsLowest - vtoV) ** 2;
    result = {
      vtoV,
      betaAPerV2,
      lambdaPerV: interceptSum > 0 ? slopeSum / interceptSum : 0,
      conductingCurveCount,
      saturatedCurveCount,
      saturationPointCount,
    };
  }
  return result;
}

export function countConductingCurves(curves: readonly PreparedCurve[]): number {
  const peaks = curves.map((c) => {
    let m = 0;
    for (let k = 0; k < c.idA.length; k++) if (c.included[k] && c.idA[k] > m) m = c.idA[k];
    return m;
  });
  const top = Math.max(...peaks);
  return peaks.filter((m) => m > CONDUCTING_SHARE * top).length;
}

/**
 * A curve of a transfer sweep has one or two points, too few for a line: its highest-VDS
 * saturated point then stands for the curve's saturation current (slope 0).
 */
function pointLine(c: PreparedCurve, indices: number[]): LineFit | null {
  if (indices.length === 0 || indices.length >= 3) return null;
  const k = indices[indices.length - 1];
  return { slope: 0, intercept: c.idA[k], slopeStandardError: NaN, residualRms: 0, count: indices.length };
}

function curveMaxVdsV(c: PreparedCurve): number {
  let m = 0;
  for (let k = 0; k < c.vdsV.length; k++) if (c.included[k] === 1 && c.vdsV[k] > m) m = c.vdsV[k];
  return m;
}

function twoPointLine(xs: number[], ys: number[]) {
  const slope = (ys[1] - ys[0]) / (xs[1] - xs[0]);
  return { slope, intercept: ys[0] - slope * xs[0] };
}
