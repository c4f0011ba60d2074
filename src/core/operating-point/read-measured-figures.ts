import { vgsAtCurrentV, type JfetParams } from '../jfet-model';
import type { OperatingTable } from './operating-table';

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
const FALLBACK_EXPONENTS: [number, number] = [2, 3];
/** Floor on the interpolation uncertainty: this share of the gate-step width. */
const INTERPOLATION_FLOOR_SHARE = 0.001;
const VDS_TOLERANCE_V = 1e-6;

// Scratch arrays reused across calls: matching reads 100 000 parts per request.
let cap = 0;
let sv = new Float64Array(0);
let si = new Float64Array(0);
let ss = new Float64Array(0);
let sg = new Float64Array(0);
let sm = new Float64Array(0);
let sd = new Float64Array(0);
let sf = new Float64Array(0);
function ensureScratch(n: number) {
  if (n <= cap) return;
  cap = Math.max(n, 2 * cap, 16);
  sv = new Float64Array(cap);
  si = new Float64Array(cap);
  ss = new Float64Array(cap);
  sg = new Float64Array(cap);
  sm = new Float64Array(cap);
  sd = new Float64Array(cap);
  sf = new Float64Array(cap);
}

/** The state of one read: the table's steps at the requested VDS and the model backbone. */
interface Steps {
  n: number;
  params: JfetParams;
  vdsV: number;
}

/**
 * Reads a part's figures at `op` from its operating table (see `OperatingTable`).
 *
 * At the requested VDS each gate step's smoothed saturation polynomial gives ID, its standard
 * error and dID/dVDS. VGS at a current between two steps is the mean of two readings:
 * 1. Local power law. Measured small-signal JFETs follow ID ∝ (VGS − V0)^m with m of about
 *    2.4–2.8 (published measured families), as ngspice's level-2 (Parker–Skellern, exponent Q)
 *    and level-1 doping-tail (B < 1) models do, so ID^(1/m) is interpolated linearly in VGS
 *    between the bracketing steps, with m from the table's two nearest local exponents; half
 *    the difference of the two readings is kept as an interpolation spread.
 * 2. Model backbone. The fitted level-1 model's VGS(ID) carries the shape, and the measured
 *    steps its position: at each step δ = VGS(step) − VGS_model(ID(step)), and δ is
 *    interpolated quadratically in sqrt(ID) through the three steps nearest the point.
 * The two make different assumptions, so half their difference is a second interpolation
 * spread. The standard deviation combines both spreads, the steps' current noise carried
 * through (Lagrange and power-law weights, over gm) and a floor of 0.1 % of the step width.
 * On the ngspice checks (tests/unit/operating-point-ngspice.test.ts) the truth lay within two
 * stated standard deviations for every part. Near cut-off (the lower step carries under 3 %
 * of the upper one's current) the power law is anchored on the two steps above.
 * IDSS at VGS = 0 and the self-bias point are found on the same reading by root-finding in ID.
 * gos is the bracketing steps' dID/dVDS per ampere, interpolated and scaled to the current.
 * Outside what was measured it returns why, and the caller uses the model.
 */
export function readMeasuredFigures(
  t: OperatingTable | null,
  params: JfetParams,
  op: OperatingRequest,
): MeasuredFigures | MeasuredMiss {
  if (!t) return 'no_table';
  const st: Steps = { n: collectStepsAt(t, params, op.vdsV), params, vdsV: op.vdsV };
  const n = st.n;
  if (n < 2) return 'vds_outside';
  let idssA = NaN;
  for (let k = 0; k < n; k++) if (Math.abs(sv[k]) < 1e-9) idssA = si[k];

  if (op.kind === 'current') {
    const r = atCurrent(st, op.idA);
    return r ? finish(r, idssA) : 'current_outside';
  }
  if (!(sv[0] <= 1e-9 && sv[n - 1] >= -1e-9)) return 'current_outside';
  const rs = op.kind === 'self_bias' ? op.rsOhm : 0;
  if (rs === 0 && !Number.isNaN(idssA)) {
    // Exactly on the measured VGS = 0 step: its own reading.
    const below = atCurrent(st, idssA * (1 - 1e-9));
    if (!below) return 'current_outside';
    return finish({ ...below, idA: idssA, vgsV: 0, vgsSigmaV: 0 }, idssA);
  }
  // VGS(ID) + ID·RS rises with ID; it is ≥ 0 at the highest step's current when that step is at
  // VGS ≥ 0. Regula falsi (Illinois) between the lowest conducting current and the top.
  const g = (id: number) => {
    const r = atCurrent(st, id);
    return r ? r.vgsV + id * rs : NaN;
  };
  let lo = 0;
  while (lo < n - 1 && !(si[lo] > 0 && si[lo] >= NEAR_CUTOFF_SHARE * si[n - 1])) lo++;
  let a = si[lo];
  let b = si[n - 1];
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
  const r = atCurrent(st, x);
  if (!r) return 'current_outside';
  // On the load line VGS = −ID·RS, an error δ in the family moves VGS by δ·gm·RS/(1 + gm·RS).
  const shrink = rs > 0 ? (r.gmS * rs) / (1 + r.gmS * rs) : 0;
  return finish({ ...r, vgsV: -x * rs, vgsSigmaV: r.vgsSigmaV * shrink }, idssA);
}

interface Reading {
  idA: number;
  vgsV: number;
  gmS: number;
  vgsSigmaV: number;
  /** Bracketing steps (the lower one's scratch index) and where between them the reading lies. */
  lower: number;
  t: number;
}

function finish(r: Reading, idssA: number): MeasuredFigures {
  return { idA: r.idA, vgsV: r.vgsV, gmS: r.gmS, gosS: gosAt(r.lower, r.t, r.idA), vgsSigmaV: r.vgsSigmaV, idssA };
}

/** Fills the scratch arrays with the steps measured in saturation at `vds`; returns how many. */
function collectStepsAt(t: OperatingTable, params: JfetParams, vds: number): number {
  const steps = t.vgsV.length;
  ensureScratch(steps);
  const x = vds - t.vdsRefV;
  let n = 0;
  for (let k = 0; k < steps; k++) {
    if (!(vds >= t.vdsLoV[k] - VDS_TOLERANCE_V && vds <= t.vdsHiV[k] + VDS_TOLERANCE_V)) continue;
    const o = 6 * k;
    sv[n] = t.vgsV[k];
    si[n] = t.c0[k] + x * (t.c1[k] + x * t.c2[k]);
    const variance =
      t.cov[o] + x * (2 * t.cov[o + 1] + x * (2 * t.cov[o + 2] + t.cov[o + 3] + x * (2 * t.cov[o + 4] + x * t.cov[o + 5])));
    ss[n] = Math.sqrt(Math.max(variance, 0));
    sg[n] = t.c1[k] + 2 * x * t.c2[k];
    sm[n] = t.exponent[k];
    if (si[n] > 0) {
      const model = vgsAtCurrentV(params, si[n], vds);
      sd[n] = sv[n] - model;
      // dVGS_model/dID, to carry a step's current noise into δ.
      sf[n] = (vgsAtCurrentV(params, si[n] * (1 + 1e-6), vds) - model) / (si[n] * 1e-6);
    } else {
      sd[n] = NaN;
      sf[n] = NaN;
    }
    n++;
  }
  return n;
}

/** VGS where the family carries `idA`: the mean of the two readings, or null outside the steps. */
function atCurrent(st: Steps, idA: number): Reading | null {
  const n = st.n;
  if (!(idA > 0) || !(idA <= si[n - 1])) return null;
  let k = n - 2;
  while (k >= 0 && si[k] > idA) k--;
  if (k < 0) return null;
  const p = powerLawReading(n, k, idA);
  const b = backboneReading(st, k, idA);
  if (!p || !b) return null;
  const vgsV = (p.vgsV + b.vgsV) / 2;
  const gmS = (p.gmS + b.gmS) / 2;
  const methodSpreadV = Math.abs(p.vgsV - b.vgsV) / 2;
  const noiseV = Math.max(p.noiseV, b.noiseV);
  const floorV = INTERPOLATION_FLOOR_SHARE * (sv[k + 1] - sv[k]);
  const sigma = Math.sqrt(noiseV * noiseV + p.spreadV * p.spreadV + methodSpreadV * methodSpreadV + floorV * floorV);
  const t = Math.min(Math.max((vgsV - sv[k]) / (sv[k + 1] - sv[k]), 0), 1);
  return { idA, vgsV, gmS, vgsSigmaV: sigma, lower: k, t };
}

/** The two exponents for the bracket (a, a + 1): the nearest finite ones, outwards from it. */
function bracketExponents(n: number, a: number): [number, number] {
  let m0 = NaN;
  let m1 = NaN;
  for (let d = 0; d < n && (Number.isNaN(m0) || Number.isNaN(m1)); d++) {
    for (const k of [a - d, a + 1 + d]) {
      if (k < 0 || k >= n || Number.isNaN(sm[k])) continue;
      if (Number.isNaN(m0)) m0 = sm[k];
      else if (Number.isNaN(m1)) m1 = sm[k];
    }
  }
  if (Number.isNaN(m0)) return FALLBACK_EXPONENTS;
  return [m0, Number.isNaN(m1) ? m0 : m1];
}

/** Reading 1 (see `readMeasuredFigures`) between steps k and k + 1. */
function powerLawReading(n: number, k: number, idA: number) {
  const a = si[k] < NEAR_CUTOFF_SHARE * si[k + 1] && k + 2 < n ? k + 1 : k;
  if (!(si[a + 1] > si[a] && si[a] > 0)) return null;
  const h = sv[a + 1] - sv[a];
  const ms = bracketExponents(n, a);
  let v = 0;
  let gm = 0;
  let dvdA = 0;
  let dvdB = 0;
  const vs = [0, 0];
  for (let j = 0; j < 2; j++) {
    const m = ms[j];
    const ya = Math.pow(si[a], 1 / m);
    const yb = Math.pow(si[a + 1], 1 / m);
    const y = Math.pow(idA, 1 / m);
    const dy = yb - ya;
    vs[j] = sv[a] + (h * (y - ya)) / dy;
    v += vs[j] / 2;
    gm += (m * (idA / y) * dy) / h / 2;
    // ∂v/∂I at each anchor: ∂v/∂y · ∂y/∂I, with ∂y/∂I = y/(m·I).
    dvdA += ((h * (y - yb)) / (dy * dy)) * (ya / (m * si[a])) / 2;
    dvdB += ((-h * (y - ya)) / (dy * dy)) * (yb / (m * si[a + 1])) / 2;
  }
  return { vgsV: v, gmS: gm, noiseV: Math.hypot(dvdA * ss[a], dvdB * ss[a + 1]), spreadV: Math.abs(vs[0] - vs[1]) / 2 };
}

/** Reading 2 (see `readMeasuredFigures`): the model's VGS plus δ, quadratic in sqrt(ID). */
function backboneReading(st: Steps, k: number, idA: number) {
  const n = st.n;
  // Three conducting steps around the point: k − 1…k + 1 when k + 2 is missing, else k…k + 2.
  let b = k + 2 < n ? k : k - 1;
  while (b >= 0 && b + 2 < n && !(si[b] > 0)) b++;
  const model = vgsAtCurrentV(st.params, idA, st.vdsV);
  const dModel = (vgsAtCurrentV(st.params, idA * (1 + 1e-6), st.vdsV) - model) / (idA * 1e-6);
  const u = Math.sqrt(idA);
  if (b < 0 || b + 2 >= n || !(si[b] > 0)) {
    // Two conducting steps only: δ linear in sqrt(ID).
    if (!(si[k] > 0)) return null;
    const u0 = Math.sqrt(si[k]);
    const u1 = Math.sqrt(si[k + 1]);
    const w1 = (u - u0) / (u1 - u0);
    const delta = (1 - w1) * sd[k] + w1 * sd[k + 1];
    const dDelta = (sd[k + 1] - sd[k]) / (u1 - u0) / (2 * u);
    const noiseV = Math.hypot((1 - w1) * sf[k] * ss[k], w1 * sf[k + 1] * ss[k + 1]);
    return { vgsV: model + delta, gmS: 1 / (dModel + dDelta), noiseV };
  }
  const x0 = Math.sqrt(si[b]);
  const x1 = Math.sqrt(si[b + 1]);
  const x2 = Math.sqrt(si[b + 2]);
  const l0 = ((u - x1) * (u - x2)) / ((x0 - x1) * (x0 - x2));
  const l1 = ((u - x0) * (u - x2)) / ((x1 - x0) * (x1 - x2));
  const l2 = ((u - x0) * (u - x1)) / ((x2 - x0) * (x2 - x1));
  const delta = l0 * sd[b] + l1 * sd[b + 1] + l2 * sd[b + 2];
  const dl0 = (2 * u - x1 - x2) / ((x0 - x1) * (x0 - x2));
  const dl1 = (2 * u - x0 - x2) / ((x1 - x0) * (x1 - x2));
  const dl2 = (2 * u - x0 - x1) / ((x2 - x0) * (x2 - x1));
  const dDelta = (dl0 * sd[b] + dl1 * sd[b + 1] + dl2 * sd[b + 2]) / (2 * u);
  const noiseV = Math.hypot(l0 * sf[b] * ss[b], l1 * sf[b + 1] * ss[b + 1], l2 * sf[b + 2] * ss[b + 2]);
  return { vgsV: model + delta, gmS: 1 / (dModel + dDelta), noiseV };
}

/** gos at the reading: the bracketing steps' dID/dVDS per ampere, interpolated, times ID. */
function gosAt(k: number, t: number, idA: number): number {
  const r0 = si[k] > 0 ? sg[k] / si[k] : NaN;
  const r1 = si[k + 1] > 0 ? sg[k + 1] / si[k + 1] : NaN;
  // A step carrying under 5 % of its neighbour's current gives too noisy a ratio to use.
  const use0 = Number.isFinite(r0) && si[k] >= 0.05 * si[k + 1];
  const use1 = Number.isFinite(r1);
  if (use0 && use1) return ((1 - t) * r0 + t * r1) * idA;
  if (use1) return r1 * idA;
  if (use0) return r0 * idA;
  return NaN;
}
