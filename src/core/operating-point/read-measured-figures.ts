import { vgsAtCurrentV, type JfetParams } from '../jfet-model';
import { HEADER_FLOATS, STEP_FLOATS, type OperatingTable } from './operating-table';

// The table layout (see `OperatingTable`), as local constants: this file is the hot path of
// matching, and local constants fold where imported bindings may not.
const HEADER = HEADER_FLOATS;
const STEP = STEP_FLOATS;
const F_VGS = 0, F_LO = 1, F_HI = 2, F_C0 = 3, F_C1 = 4, F_C2 = 5, F_COV = 6, F_EXP = 12;

/**
 * Where a part is asked to run, N-equivalent and SI:
 * - `current`: it carries `idA` at `vdsV`; VGS is what that takes;
 * - `idss`: VGS = 0 at `vdsV`;
 * - `self_bias`: gate grounded, `rsOhm` from source to ground, at `vdsV`.
 */
export type OperatingRequest =
  | { kind: 'current'; idA: number; vdsV: number }
  | { kind: 'idss'; vdsV: number }
  | { kind: 'self_bias'; rsOhm: number; vdsV: number };

/** Figures read from the measurements (N-equivalent, SI). */
export interface MeasuredFigures {
  idA: number;
  vgsV: number;
  gmS: number;
  gosS: number;
  /** One standard deviation of `vgsV`: measurement noise and interpolation (V). */
  vgsSigmaV: number;
  /** The VGS = 0 current at this VDS when the data reach it, else NaN. */
  idssA: number;
}

/**
 * Why a point could not be read from the measurements: `vds_outside` (fewer than two gate
 * steps were measured in saturation at this VDS), `current_outside` (the point lies above the
 * highest or below the lowest conducting gate step there), `no_table` (nothing stored).
 */
export type MeasuredMiss = 'vds_outside' | 'current_outside' | 'no_table';

/** Below this share of the step above it, a step is too near cut-off to anchor a power law. */
const NEAR_CUTOFF_SHARE = 0.03;
/** Exponents used when the table has none (fewer than three conducting steps): square law and cube. */
const FALLBACK_M0 = 2;
const FALLBACK_M1 = 3;
/** Floor on the interpolation uncertainty: this share of the gate-step width. */
const INTERPOLATION_FLOOR_SHARE = 0.001;
const VDS_TOLERANCE_V = 1e-6;

// One read's state, reused across calls: matching reads 100 000 parts per request, so the hot
// path allocates nothing. sv/si: the steps measured at the VDS (VGS, smoothed ID); sb: each
// one's position in the table; the rest is filled on demand.
let cap = 0;
let sv = new Float64Array(0);
let si = new Float64Array(0);
let sb = new Int32Array(0);
let st: OperatingTable = { data: new Float64Array(0), offset: 0 };
let sParams: JfetParams = { vtoV: -1, betaAPerV2: 1, lambdaPerV: 0, rsOhm: 0, rdOhm: 0 };
let sN = 0;
// Scalars of the read in progress, in a typed array: a double kept in a module variable is
// boxed afresh on every write, which at 100 000 parts a request keeps the collector busy.
const reg = new Float64Array(10);
const R_SVDS = 0;
const R_SX = 1;
const R_RT = 2;
const R_PLV = 3;
const R_PLGM = 4;
const R_PLNOISE = 5;
const R_PLSPREAD = 6;
const R_BBV = 7;
const R_BBGM = 8;
const R_BBNOISE = 9;

function ensureScratch(n: number) {
  if (n <= cap) return;
  cap = Math.max(n, 2 * cap, 16);
  sv = new Float64Array(cap);
  si = new Float64Array(cap);
  sb = new Int32Array(cap);
}

/** The result of the last successful read (overwritten by the next one). */
export const measuredOut: MeasuredFigures = { idA: 0, vgsV: 0, gmS: 0, gosS: 0, vgsSigmaV: 0, idssA: NaN };
// The last reading's bracket, for gos.
let rLower = 0;

/**
 * Reads a part's figures at `op` from its operating table (see `OperatingTable`), for callers
 * that want a fresh object; `readMeasuredInto` is the same without allocating.
 *
 * At the requested VDS each gate step's smoothed saturation polynomial gives ID, its standard
 * error and dID/dVDS. VGS at a current between two steps is the mean of two readings:
 * 1. Local power law. Measured small-signal JFETs follow ID ∝ (VGS − V0)^m with m of about
 *    2.4–2.8 (published measured families), as ngspice's level-2 (Parker–Skellern, exponent Q)
 *    and level-1 doping-tail (B < 1) models do, so ID^(1/m) is interpolated linearly in VGS
 *    between the bracketing steps, with m from the table's two nearest local exponents; half
 *    the difference of the two readings is kept as an interpolation spread.
 * 2. Model backbone. The fitted level-1 model's VGS(ID) carries the shape and the measured
 *    steps its position: at each step δ = VGS(step) − VGS_model(ID(step)), and δ is
 *    interpolated quadratically in sqrt(ID) through the three steps nearest the point.
 * The two make different assumptions, so half their difference is a second interpolation
 * spread. The standard deviation combines both spreads, the steps' current noise carried
 * through (power-law and Lagrange weights, over gm) and a floor of 0.1 % of the step width.
 * On the ngspice checks (tests/unit/operating-point-ngspice.test.ts) the truth lay within two
 * stated standard deviations for at least 94 % of parts. Near cut-off (the lower step carries
 * under 3 % of the upper one's current) the power law is anchored on the two steps above.
 * IDSS at VGS = 0 and the self-bias point are found on the same reading by root-finding in ID.
 * gos is the bracketing steps' dID/dVDS per ampere, interpolated and scaled to the current.
 * Outside what was measured it returns why, and the caller uses the model.
 */
export function readMeasuredFigures(t: OperatingTable | null, params: JfetParams, op: OperatingRequest): MeasuredFigures | MeasuredMiss {
  const miss = readMeasuredInto(t, params, op);
  return miss ?? { ...measuredOut };
}

/** `readMeasuredFigures` into `measuredOut`; returns why it missed, or null. */
export function readMeasuredInto(t: OperatingTable | null, params: JfetParams, op: OperatingRequest): MeasuredMiss | null {
  if (!t) return 'no_table';
  const n = collectStepsAt(t, params, Math.abs(op.vdsV));
  if (n < 2) return 'vds_outside';
  let idssA = NaN;
  for (let k = 0; k < n; k++) if (Math.abs(sv[k]!) < 1e-9) idssA = si[k]!;
  measuredOut.idssA = idssA;

  if (op.kind === 'current') {
    if (!atCurrent(op.idA)) return 'current_outside';
    return finish();
  }
  if (!(sv[0]! <= 1e-9 && sv[n - 1]! >= -1e-9)) return 'current_outside';
  const rs = op.kind === 'self_bias' ? op.rsOhm : 0;
  if (rs === 0 && !Number.isNaN(idssA)) {
    // Exactly on the measured VGS = 0 step: its own reading; gm from just below it.
    if (!atCurrent(idssA * (1 - 1e-9))) return 'current_outside';
    measuredOut.idA = idssA;
    measuredOut.vgsV = 0;
    measuredOut.vgsSigmaV = 0;
    return finish();
  }
  // VGS(ID) + ID·RS rises with ID; it is ≥ 0 at the highest step's current when that step is at
  // VGS ≥ 0. Regula falsi (Illinois) between the lowest conducting current and the top.
  const g = (id: number) => (atCurrent(id) ? measuredOut.vgsV + id * rs : NaN);
  let lo = 0;
  while (lo < n - 1 && !(si[lo]! > 0 && si[lo]! >= NEAR_CUTOFF_SHARE * si[n - 1]!)) lo++;
  let a = si[lo]!;
  let b = si[n - 1]!;
  let fa = g(a);
  let fb = g(b * (1 - 1e-12));
  if (!(fa <= 0 && fb >= 0)) return 'current_outside';
  let side = 0;
  let x = b;
  for (let it = 0; it < 60; it++) {
    x = (a * fb - b * fa) / (fb - fa);
    const fx = g(x);
    if (!Number.isFinite(fx)) return 'current_outside';
    if (Math.abs(fx) < 1e-12 || Math.abs(b - a) < 1e-12 * b) break;
    if (fx > 0) {
      b = x;
      fb = fx;
      if (side === 1) fa /= 2;
      side = 1;
    } else {
      a = x;
      fa = fx;
      if (side === -1) fb /= 2;
      side = -1;
    }
  }
  if (!atCurrent(x)) return 'current_outside';
  // On the load line VGS = −ID·RS, an error δ in the family moves VGS by δ·gm·RS/(1 + gm·RS).
  const gm = measuredOut.gmS;
  measuredOut.vgsSigmaV *= rs > 0 ? (gm * rs) / (1 + gm * rs) : 0;
  measuredOut.vgsV = -x * rs;
  return finish();
}

function finish(): null {
  measuredOut.gosS = gosAt(rLower, reg[R_RT]!, measuredOut.idA);
  return null;
}

/** Fills sv/si/sb with the steps measured in saturation at `vds`; returns how many. */
function collectStepsAt(t: OperatingTable, params: JfetParams, vds: number): number {
  const d = t.data;
  const steps = d[t.offset + 1]!;
  ensureScratch(steps);
  st = t;
  sParams = params;
  reg[R_SVDS] = vds;
  reg[R_SX] = vds - d[t.offset + 2]!;
  let n = 0;
  for (let k = 0, o = t.offset + HEADER; k < steps; k++, o += STEP) {
    if (!(vds >= d[o + F_LO]! - VDS_TOLERANCE_V && vds <= d[o + F_HI]! + VDS_TOLERANCE_V)) continue;
    sv[n] = d[o + F_VGS]!;
    si[n] = d[o + F_C0]! + reg[R_SX]! * (d[o + F_C1]! + reg[R_SX]! * d[o + F_C2]!);
    sb[n] = o;
    n++;
  }
  sN = n;
  return n;
}

/** Standard error of step j's current at the VDS. */
function sigmaOf(j: number): number {
  const d = st.data;
  const o = sb[j]! + F_COV;
  const x = reg[R_SX]!;
  const variance = d[o]! + x * (2 * d[o + 1]! + x * (2 * d[o + 2]! + d[o + 3]! + x * (2 * d[o + 4]! + x * d[o + 5]!)));
  return Math.sqrt(Math.max(variance, 0));
}

/** δ = VGS(step) − VGS_model(ID(step)) for step j. */
function deltaOf(j: number): number {
  return sv[j]! - vgsAtCurrentV(sParams, si[j]!, reg[R_SVDS]!);
}

/**
 * dVGS_model/dID at a current: 1/(2·sqrt(BETA·(1 + λ·VDS)·ID)) + RS, the series resistances'
 * small effect on the internal VDS left out (it only carries noise into the uncertainty).
 */
function modelSlopeAt(i: number): number {
  const p = sParams;
  return 0.5 / Math.sqrt(p.betaAPerV2 * (1 + p.lambdaPerV * reg[R_SVDS]!) * i) + p.rsOhm;
}

const modelSlopeOf = (j: number) => modelSlopeAt(si[j]!);

const exponentOf = (j: number) => st.data[sb[j]! + F_EXP]!;

/**
 * VGS where the family carries `idA` into `measuredOut` (idA, vgsV, gmS, vgsSigmaV) and the
 * bracket into rLower and reg[R_RT]: the mean of the two readings. False outside the steps.
 */
function atCurrent(idA: number): boolean {
  const n = sN;
  if (!(idA > 0) || !(idA <= si[n - 1]!)) return false;
  let k = n - 2;
  while (k >= 0 && si[k]! > idA) k--;
  if (k < 0) return false;
  if (!powerLawReading(n, k, idA)) return false;
  const pV = reg[R_PLV]!, pGm = reg[R_PLGM]!, pNoise = reg[R_PLNOISE]!, pSpread = reg[R_PLSPREAD]!;
  if (!backboneReading(n, k, idA)) return false;
  const vgsV = (pV + reg[R_BBV]!) / 2;
  const methodSpreadV = Math.abs(pV - reg[R_BBV]!) / 2;
  const noiseV = Math.max(pNoise, reg[R_BBNOISE]!);
  const floorV = INTERPOLATION_FLOOR_SHARE * (sv[k + 1]! - sv[k]!);
  measuredOut.idA = idA;
  measuredOut.vgsV = vgsV;
  measuredOut.gmS = (pGm + reg[R_BBGM]!) / 2;
  measuredOut.vgsSigmaV = Math.sqrt(noiseV * noiseV + pSpread * pSpread + methodSpreadV * methodSpreadV + floorV * floorV);
  rLower = k;
  reg[R_RT] = Math.min(Math.max((vgsV - sv[k]!) / (sv[k + 1]! - sv[k]!), 0), 1);
  return true;
}


/** Reading 1 (see `readMeasuredFigures`) between steps k and k + 1, into pl*. */
function powerLawReading(n: number, k: number, idA: number): boolean {
  const a = si[k]! < NEAR_CUTOFF_SHARE * si[k + 1]! && k + 2 < n ? k + 1 : k;
  const ia = si[a]!;
  const ib = si[a + 1]!;
  if (!(ib > ia && ia > 0)) return false;
  const h = sv[a + 1]! - sv[a]!;
  // The two nearest finite exponents, outwards from the bracket.
  let m0 = NaN;
  let m1 = NaN;
  for (let dist = 0; dist < n && (Number.isNaN(m0) || Number.isNaN(m1)); dist++) {
    for (let side = 0; side < 2; side++) {
      const j = side === 0 ? a - dist : a + 1 + dist;
      if (j < 0 || j >= n) continue;
      const m = exponentOf(j);
      if (!(m > 0)) continue;
      if (Number.isNaN(m0)) m0 = m;
      else if (Number.isNaN(m1)) m1 = m;
    }
  }
  if (Number.isNaN(m0)) {
    m0 = FALLBACK_M0;
    m1 = FALLBACK_M1;
  } else if (Number.isNaN(m1)) m1 = m0;
  let v = 0;
  let gm = 0;
  let dvdA = 0;
  let dvdB = 0;
  let v0 = 0;
  // With y = I^(1/m): r = y/ya and R = yb/ya, so each exponent costs two expm1 and the pair
  // of logarithms is shared.
  const lr = Math.log(idA / ia);
  const lR = Math.log(ib / ia);
  for (let j = 0; j < 2; j++) {
    const m = j === 0 ? m0 : m1;
    if (j === 1 && m1 === m0) {
      reg[R_PLSPREAD] = 0;
      break;
    }
    const rm1 = Math.expm1(lr / m);
    const Rm1 = Math.expm1(lR / m);
    const r = 1 + rm1;
    const vj = sv[a]! + (h * rm1) / Rm1;
    if (j === 0) v0 = vj;
    else reg[R_PLSPREAD] = Math.abs(v0 - vj) / 2;
    v += vj;
    gm += (m * idA * Rm1) / (r * h);
    // ∂v/∂I at each anchor: ∂v/∂y · ∂y/∂I, with ∂y/∂I = y/(m·I).
    const w = h / (m * Rm1 * Rm1);
    dvdA += (w * (rm1 - Rm1)) / ia;
    dvdB -= (w * rm1 * (1 + Rm1)) / ib;
  }
  // Mean of the two readings (one when both exponents are the same).
  const readings = m1 === m0 ? 1 : 2;
  reg[R_PLV] = v / readings;
  reg[R_PLGM] = gm / readings;
  const na = (dvdA / readings) * sigmaOf(a);
  const nb = (dvdB / readings) * sigmaOf(a + 1);
  reg[R_PLNOISE] = Math.sqrt(na * na + nb * nb);
  return true;
}


/** Reading 2 (see `readMeasuredFigures`): the model's VGS plus δ, quadratic in sqrt(ID), into bb*. */
function backboneReading(n: number, k: number, idA: number): boolean {
  // Three conducting steps around the point: k…k + 2, or k − 1…k + 1 at the top.
  let b = k + 2 < n ? k : k - 1;
  while (b >= 0 && b + 2 < n && !(si[b]! > 0)) b++;
  const model = vgsAtCurrentV(sParams, idA, reg[R_SVDS]!);
  const dModel = modelSlopeAt(idA);
  const u = Math.sqrt(idA);
  if (b < 0 || b + 2 >= n || !(si[b]! > 0)) {
    // Two conducting steps only: δ linear in sqrt(ID).
    if (!(si[k]! > 0)) return false;
    const u0 = Math.sqrt(si[k]!);
    const u1 = Math.sqrt(si[k + 1]!);
    const w1 = (u - u0) / (u1 - u0);
    const d0 = deltaOf(k);
    const d1 = deltaOf(k + 1);
    const dDelta = (d1 - d0) / (u1 - u0) / (2 * u);
    reg[R_BBV] = model + (1 - w1) * d0 + w1 * d1;
    reg[R_BBGM] = 1 / (dModel + dDelta);
    const n0 = (1 - w1) * modelSlopeOf(k) * sigmaOf(k);
    const n1 = w1 * modelSlopeOf(k + 1) * sigmaOf(k + 1);
    reg[R_BBNOISE] = Math.sqrt(n0 * n0 + n1 * n1);
    return true;
  }
  const x0 = Math.sqrt(si[b]!);
  const x1 = Math.sqrt(si[b + 1]!);
  const x2 = Math.sqrt(si[b + 2]!);
  const l0 = ((u - x1) * (u - x2)) / ((x0 - x1) * (x0 - x2));
  const l1 = ((u - x0) * (u - x2)) / ((x1 - x0) * (x1 - x2));
  const l2 = ((u - x0) * (u - x1)) / ((x2 - x0) * (x2 - x1));
  const d0 = deltaOf(b);
  const d1 = deltaOf(b + 1);
  const d2 = deltaOf(b + 2);
  const dl0 = (2 * u - x1 - x2) / ((x0 - x1) * (x0 - x2));
  const dl1 = (2 * u - x0 - x2) / ((x1 - x0) * (x1 - x2));
  const dl2 = (2 * u - x0 - x1) / ((x2 - x0) * (x2 - x1));
  const dDelta = (dl0 * d0 + dl1 * d1 + dl2 * d2) / (2 * u);
  reg[R_BBV] = model + l0 * d0 + l1 * d1 + l2 * d2;
  reg[R_BBGM] = 1 / (dModel + dDelta);
  const n0 = l0 * modelSlopeOf(b) * sigmaOf(b);
  const n1 = l1 * modelSlopeOf(b + 1) * sigmaOf(b + 1);
  const n2 = l2 * modelSlopeOf(b + 2) * sigmaOf(b + 2);
  reg[R_BBNOISE] = Math.sqrt(n0 * n0 + n1 * n1 + n2 * n2);
  return true;
}

/** dID/dVDS of step j at the VDS. */
function slopeOf(j: number): number {
  const d = st.data;
  const o = sb[j]!;
  return d[o + F_C1]! + 2 * reg[R_SX]! * d[o + F_C2]!;
}

/** gos at the reading: the bracketing steps' dID/dVDS per ampere, interpolated, times ID. */
function gosAt(k: number, t: number, idA: number): number {
  const r0 = si[k]! > 0 ? slopeOf(k) / si[k]! : NaN;
  const r1 = si[k + 1]! > 0 ? slopeOf(k + 1) / si[k + 1]! : NaN;
  // A step carrying under 5 % of its neighbour's current gives too noisy a ratio to use.
  const use0 = Number.isFinite(r0) && si[k]! >= 0.05 * si[k + 1]!;
  const use1 = Number.isFinite(r1);
  if (use0 && use1) return ((1 - t) * r0 + t * r1) * idA;
  if (use1) return r1 * idA;
  if (use0) return r0 * idA;
  return NaN;
}
