import { gmAtCurrentS, idssA as modelIdssA, vgsAtCurrentV, type JfetParams } from '../jfet-model';
import type { OperatingTable } from './operating-table';
import { measuredOut, readMeasuredInto, type MeasuredMiss, type OperatingRequest } from './read-measured-figures';

export type { OperatingRequest } from './read-measured-figures';

/**
 * Temperature coefficients in the forms ngspice documents for its JFET model:
 * VTO(T) = VTO + VTOTC·(T − Tm) and BETA(T) = BETA·1.01^(BETATCE·(T − Tm)).
 * `vtotcVPerC` is N-equivalent (negative when |VP| grows with temperature).
 */
export interface TemperatureCoefficients {
  vtotcVPerC: number;
  betatcePctPerC: number;
}

/**
 * Defaults for a new device type: |VP| grows about 2.2 mV/°C and BETA falls about 0.7 %/°C
 * (from memory: classic application-note figures for small-signal JFETs); an admin edits them
 * per device type.
 */
export const DEFAULT_TEMPERATURE_COEFFICIENTS: TemperatureCoefficients = { vtotcVPerC: -0.0022, betatcePctPerC: -0.7 };
/** Parts are compared at this temperature unless the designer names another (°C). */
export const DEFAULT_COMPARE_TEMPERATURE_C = 25;

/** Everything stored about a part that its operating-point figures depend on. */
export interface PartBasis {
  /** Fitted level-1 model, N-equivalent, SI. */
  params: JfetParams;
  /** The measurements in compact form (`buildOperatingTable`); null or absent: model only. */
  table?: OperatingTable | null;
  /** Temperature the sweep was taken at (°C); null or absent: taken as the compare temperature. */
  measuredAtC?: number | null;
  tempco?: TemperatureCoefficients;
  /**
   * One standard deviation of a model-sourced VGS: the larger of the model's disagreement with
   * the measurements and VTO's standard error (V). NaN or absent when unknown.
   */
  modelSigmaV?: number;
}

/** Where a part's figures came from: its own measurements, or the fitted model (extrapolation). */
export type FigureSource = 'measured' | 'model';

/** A part's figures at an operating point, N-equivalent and SI. */
export interface PartFigures {
  idA: number;
  vdsV: number;
  vgsV: number;
  gmS: number;
  gosS: number;
  /** IDSS at `vdsV` (from the VGS = 0 measurements where they reach it). */
  idssA: number;
  /** VGS − VTO: the saturation voltage in the level-1 picture (V). */
  vdsSatV: number;
  /** One standard deviation of `vgsV` (V); NaN when not known. */
  vgsSigmaV: number;
  source: FigureSource;
  /** Why the model was used, when it was. */
  modelReason: MeasuredMiss | null;
  /** The temperature the figures are given at, and the VGS correction applied to get there. */
  temperatureC: number;
  temperatureShiftV: number;
}

export type UnusableCode = 'forward_gate' | 'not_saturated' | 'invalid_model';

export type PartOperatingResult =
  | { usable: true; figures: PartFigures }
  | { usable: false; code: UnusableCode; reason: string };

const fmtMa = (a: number) => `${(a * 1e3).toPrecision(3)} mA`;

/**
 * The one source of a part's figures at an operating point, for every view: matching (pairs,
 * quads, cascodes), stage estimates, the part page, set and reservation views, exports, mail.
 *
 * Inside what was measured the figures are read from the part's own sweep
 * (`readMeasuredFigures`); outside it, from the fitted level-1 model (with RS/RD when fitted),
 * marked `source: 'model'` with the reason. Then both are moved from the sweep's temperature to
 * `compareAtC` (`correctForTemperature`). Not usable when the point needs a forward-biased
 * gate (a current above what the part gives at VGS = 0) or leaves it out of saturation.
 */
export function partOperatingFigures(
  part: PartBasis,
  op: OperatingRequest,
  compareAtC: number = DEFAULT_COMPARE_TEMPERATURE_C,
): PartOperatingResult {
  const figures = emptyFigures();
  const bad = partOperatingFiguresInto(part, op, compareAtC, figures);
  return bad ?? { usable: true, figures };
}

/** A figures object to fill with `partOperatingFiguresInto`. */
export function emptyFigures(): PartFigures {
  return {
    idA: 0, vdsV: 0, vgsV: 0, gmS: 0, gosS: 0, idssA: 0, vdsSatV: 0, vgsSigmaV: NaN,
    source: 'model', modelReason: null, temperatureC: DEFAULT_COMPARE_TEMPERATURE_C, temperatureShiftV: 0,
  };
}

type Unusable = Extract<PartOperatingResult, { usable: false }>;

/**
 * `partOperatingFigures` into `out` (every field written); returns why the part cannot run
 * there, or null. Allocates nothing when the point lies inside the measurements, for matching
 * over a whole stock.
 */
export function partOperatingFiguresInto(
  part: PartBasis,
  op: OperatingRequest,
  compareAtC: number = DEFAULT_COMPARE_TEMPERATURE_C,
  out: PartFigures,
): Unusable | null {
  const p = part.params;
  if (!(p.vtoV < 0) || !(p.betaAPerV2 > 0) || !(p.lambdaPerV >= 0) || !(p.rsOhm >= 0) || !(p.rdOhm >= 0)) {
    return { usable: false, code: 'invalid_model', reason: 'model needs VTO < 0, BETA > 0 and LAMBDA, RS, RD ≥ 0' };
  }
  const vdsV = Math.abs(op.vdsV);
  const miss = readMeasuredInto(part.table ?? null, p, op);
  if (miss !== null) {
    const model = modelFigures(p, op);
    if (!model.usable) return model;
    const f = model.figures;
    out.idA = f.idA;
    out.vdsV = f.vdsV;
    out.vgsV = f.vgsV;
    out.gmS = f.gmS;
    out.gosS = f.gosS;
    out.idssA = f.idssA;
    out.vdsSatV = f.vdsSatV;
    out.vgsSigmaV = part.modelSigmaV ?? NaN;
    out.source = 'model';
    out.modelReason = miss;
  } else {
    const m = measuredOut;
    out.idA = m.idA;
    out.vdsV = vdsV;
    out.vgsV = m.vgsV;
    out.gmS = m.gmS;
    out.gosS = m.gosS;
    out.idssA = Number.isNaN(m.idssA) ? modelIdssA(p, vdsV) : m.idssA;
    out.vdsSatV = m.vgsV - p.vtoV;
    out.vgsSigmaV = m.vgsSigmaV;
    out.source = 'measured';
    out.modelReason = null;
  }
  out.temperatureC = compareAtC;
  out.temperatureShiftV = 0;
  correctForTemperature(out, part, op, compareAtC);
  return null;
}

/**
 * Moves figures from the sweep's temperature Tm to `compareAtC` with the level-1 temperature
 * forms (see `TemperatureCoefficients`), ΔT = T − Tm, f = 1.01^(BETATCE·ΔT):
 * - at a forced current, VGS' = VGS + VTOTC·ΔT + (VGS − VTO)·(f^−½ − 1), gm' = gm·f^½ (derived
 *   from VGS = VTO + sqrt(ID/BETA) and gm = 2·sqrt(BETA·ID));
 * - IDSS' = IDSS·f·((VTO + VTOTC·ΔT)/VTO)²; at VGS = 0 the current and gm follow IDSS;
 * - self-bias: one Newton step along the load line, ID' = ID − ΔVGS(ID)·gm/(1 + gm·RS).
 * With the default coefficients VGS at a forced current stops moving at VGS − VTO ≈ 0.63 V, the
 * zero-temperature-coefficient bias (derived).
 */
export function correctForTemperature(f: PartFigures, part: PartBasis, op: OperatingRequest, compareAtC: number): void {
  const tm = part.measuredAtC;
  const tc = part.tempco;
  if (tm === null || tm === undefined || !tc || !Number.isFinite(tm) || tm === compareAtC) return;
  const dT = compareAtC - tm;
  const vto = part.params.vtoV;
  const shift = tc.vtotcVPerC * dT;
  const beta = Math.pow(1.01, tc.betatcePctPerC * dT);
  const idssScale = beta * ((vto + shift) / vto) ** 2;
  f.idssA *= idssScale;
  if (op.kind === 'current') {
    const dv = shift + (f.vgsV - vto) * (1 / Math.sqrt(beta) - 1);
    f.vgsV += dv;
    f.gmS *= Math.sqrt(beta);
    f.vdsSatV += dv - shift;
    f.temperatureShiftV = dv;
    return;
  }
  if (op.kind === 'idss' || op.rsOhm === 0) {
    f.idA *= idssScale;
    f.gmS *= beta * ((vto + shift) / vto);
    f.gosS *= idssScale;
    f.vdsSatV -= shift;
    return;
  }
  const dvAtI = shift + (f.vgsV - vto) * (1 / Math.sqrt(beta) - 1);
  const idA = f.idA - (dvAtI * f.gmS) / (1 + f.gmS * op.rsOhm);
  const vgsV = -idA * op.rsOhm;
  f.gosS = (f.gosS * idA) / f.idA;
  f.temperatureShiftV = vgsV - f.vgsV;
  f.idA = idA;
  f.vgsV = vgsV;
  f.gmS *= Math.sqrt(beta);
  f.vdsSatV = vgsV - (vto + shift);
}

type ModelResult =
  | { usable: true; figures: Omit<PartFigures, 'vgsSigmaV' | 'source' | 'modelReason' | 'temperatureC' | 'temperatureShiftV'> }
  | { usable: false; code: UnusableCode; reason: string };

/**
 * The fitted model's figures (N-equivalent, SI): VGS from the saturation model
 * (`vgsAtCurrentV`), gm = gm_int/(1 + gm_int·RS) with gm_int at the internal VDS (source
 * degeneration, derived), gos = λ·ID/(1 + λ·VDS), IDSS at the operating VDS, VDS(sat) = VGS − VTO.
 */
export function modelFigures(p: JfetParams, op: OperatingRequest): ModelResult {
  const vdsV = Math.abs(op.vdsV);
  let idA: number;
  let vgsV: number;
  if (op.kind === 'current') {
    idA = op.idA;
    vgsV = vgsAtCurrentV(p, idA, vdsV);
    if (vgsV > 0) {
      return {
        usable: false,
        code: 'forward_gate',
        reason:
          `${fmtMa(idA)} exceeds this part's IDSS (${fmtMa(modelIdssA(p, vdsV))} at ${vdsV} V): ` +
          `it would need VGS = +${vgsV.toFixed(3)} V, a forward-biased gate`,
      };
    }
  } else {
    idA = selfBiasDrainCurrentA(p, op.kind === 'self_bias' ? op.rsOhm : 0, vdsV);
    vgsV = op.kind === 'self_bias' ? -idA * op.rsOhm : 0;
  }
  const vdsInternalV = vdsV - idA * (p.rsOhm + p.rdOhm);
  const vovInternalV = vgsV - idA * p.rsOhm - p.vtoV;
  if (!Number.isFinite(vgsV) || !(vdsInternalV > 0)) {
    return { usable: false, code: 'invalid_model', reason: `no saturated solution at ${fmtMa(idA)}, ${vdsV} V` };
  }
  if (vdsInternalV < vovInternalV) {
    return {
      usable: false,
      code: 'not_saturated',
      reason:
        `VDS ${vdsV} V is below this part's saturation voltage ` +
        `${(vovInternalV + idA * (p.rsOhm + p.rdOhm)).toFixed(3)} V at ${fmtMa(idA)}`,
    };
  }
  const gmInternalS = gmAtCurrentS(p, idA, vdsInternalV);
  return {
    usable: true,
    figures: {
      idA,
      vdsV,
      vgsV,
      gmS: gmInternalS / (1 + gmInternalS * p.rsOhm),
      gosS: (p.lambdaPerV * idA) / (1 + p.lambdaPerV * vdsInternalV),
      idssA: modelIdssA(p, vdsV),
      vdsSatV: vgsV - p.vtoV,
    },
  };
}

/**
 * Drain current (A) of a part with its gate at 0 V and `rsOhm` from source to ground, at
 * external |VDS| `vdsV`, in the fitted model: the root of VGS(ID) + ID·RS = 0, VGS(ID) from
 * `vgsAtCurrentV`. `rsOhm = 0` gives the model's IDSS (including its own RS/RD when fitted).
 */
export function selfBiasDrainCurrentA(p: JfetParams, rsOhm: number, vdsV: number): number {
  const vds = Math.abs(vdsV);
  if (p.rsOhm === 0 && p.rdOhm === 0) {
    // Derived: with u = VGS − VTO, BETA·k·R·u² + u + VTO = 0, k = 1 + λ·VDS; the positive
    // root written as −2·VTO / (1 + sqrt(1 − 4·BETA·k·R·VTO)) stays exact at R = 0.
    const bk = p.betaAPerV2 * (1 + p.lambdaPerV * vds);
    const u = (-2 * p.vtoV) / (1 + Math.sqrt(1 - 4 * bk * rsOhm * p.vtoV));
    return bk * u * u;
  }
  // VGS(ID) + ID·RS rises monotonically from VTO < 0 at ID = 0; bracket and bisect.
  let lo = 0;
  let hi = modelIdssA(p, vds);
  while (vgsAtCurrentV(p, hi, vds) + hi * rsOhm < 0) hi *= 2;
  for (let i = 0; i < 80 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (vgsAtCurrentV(p, mid, vds) + mid * rsOhm < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
