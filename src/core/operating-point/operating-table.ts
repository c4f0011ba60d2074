import type { PreparedCurve } from '../fit/prepared-curves';

/**
 * What a part's own measurements say about it in saturation, kept compactly so that any
 * operating point inside the measured range can be read without the raw curves.
 *
 * Each gate step's saturated points (VDS ≥ 1.3·(VGS − VTO) + 0.2 V, points the fit kept) are
 * smoothed by a least-squares polynomial in VDS — a line, or a quadratic where the step has at
 * least 12 such points over 2 V or more and the bend is significant — with its covariance from
 * the residual scatter. A point between gate steps is then read by interpolating across the
 * steps at the requested VDS (`readMeasuredFigures`). All values N-equivalent and SI.
 *
 * Layout (float64, from `offset` in `data`, so a whole stock's tables can share one array):
 * [version, step count n, vdsRefV, then n steps in ascending VGS of STEP_FLOATS values:
 *  vgs, vdsLo, vdsHi, c0, c1, c2, v00, v01, v02, v11, v12, v22, exponent]
 * - ID = c0 + c1·x + c2·x², x = VDS − vdsRefV, read only inside [vdsLo, vdsHi] (the saturated
 *   range the step was measured over);
 * - v.. the covariance of (c0, c1, c2);
 * - exponent: the local power-law exponent m of ID ∝ (VGS − V0)^m through the step and its two
 *   neighbours (ID^(1/m) on one straight line) at vdsRefV; 0 where it cannot be told (an end
 *   step, or a neighbour near cut-off).
 */
export interface OperatingTable {
  data: Float64Array;
  offset: number;
}

export const TABLE_FORMAT_VERSION = 1;
export const STEP_FLOATS = 13;
export const HEADER_FLOATS = 3;
/** Field positions within a step. */
export const F_VGS = 0, F_LO = 1, F_HI = 2, F_C0 = 3, F_C1 = 4, F_C2 = 5, F_COV = 6, F_EXP = 12;

/** Number of gate steps in a table. */
export function tableSteps(t: OperatingTable): number {
  return t.data[t.offset + 1]!;
}

/** Position of step k's first field in `t.data`. */
export function stepBase(t: OperatingTable, k: number): number {
  return t.offset + HEADER_FLOATS + STEP_FLOATS * k;
}
/** Saturation onset used for the table: VDS ≥ KNEE_FACTOR·(VGS − VTO) + KNEE_OFFSET_V. */
const KNEE_FACTOR = 1.3;
const KNEE_OFFSET_V = 0.2;
const MIN_POINTS_LINE = 3;
const MIN_POINTS_QUADRATIC = 12;
const MIN_SPAN_QUADRATIC_V = 2;

/**
 * The operating table of one fitted sweep: `curves` as the fit saw them (reviewer and flag
 * exclusions applied), `vtoV` the fitted VTO (where saturation starts) and `lambdaPerV` the
 * fitted λ (the slope of a step with too few points to show its own). A step with one or two
 * saturated points — a transfer sweep's gate voltage, or a curve cut short by the instrument's
 * power limit — is kept and read only at the VDS it was measured at. Null when no step is left.
 */
export function buildOperatingTable(curves: readonly PreparedCurve[], vtoV: number, lambdaPerV = 0): OperatingTable | null {
  interface Step { vgs: number; lo: number; hi: number; c: number[]; cov: number[] }
  const steps: Step[] = [];
  let vdsSum = 0;
  let vdsCount = 0;
  const picked: { curve: PreparedCurve; idx: number[] }[] = [];
  for (const curve of curves) {
    const knee = KNEE_FACTOR * Math.max(curve.vgsV - vtoV, 0) + KNEE_OFFSET_V;
    const idx: number[] = [];
    for (let k = 0; k < curve.vdsV.length; k++) {
      if (curve.included[k] && curve.vdsV[k] >= knee) idx.push(k);
    }
    if (idx.length === 0) continue;
    picked.push({ curve, idx });
    for (const k of idx) {
      vdsSum += curve.vdsV[k];
      vdsCount++;
    }
  }
  if (picked.length === 0) return null;
  const ref = vdsSum / vdsCount;
  const offsetA = zeroCurrentOffsetA(curves);
  for (const { curve, idx } of picked) {
    const lo = curve.vdsV[idx[0]];
    const hi = curve.vdsV[idx[idx.length - 1]];
    if (idx.length < MIN_POINTS_LINE) {
      // One or two saturated points (a transfer sweep's gate voltage, or a curve the instrument
      // cut short): read only at the VDS they were taken at, the slope from the fitted λ.
      let iSum = 0;
      let vSum = 0;
      for (const k of idx) {
        iSum += curve.idA[k] - offsetA;
        vSum += curve.vdsV[k];
      }
      const i0 = iSum / idx.length;
      const v0 = vSum / idx.length;
      const slope = (lambdaPerV * i0) / (1 + lambdaPerV * v0);
      steps.push({ vgs: curve.vgsV, lo, hi, c: [i0 + slope * (ref - v0), slope, 0], cov: [0, 0, 0, 0, 0, 0] });
      continue;
    }
    let fit = idx.length >= MIN_POINTS_QUADRATIC && hi - lo >= MIN_SPAN_QUADRATIC_V ? fitPolynomial(curve, idx, ref, 2, offsetA) : null;
    // Keep the bend only where the data show one (|c2| over 3 standard errors): a line reads
    // the current with less noise.
    if (!fit || !(Math.abs(fit.c[2]) > 3 * Math.sqrt(fit.cov[5]))) fit = fitPolynomial(curve, idx, ref, 1, offsetA);
    if (!fit) continue;
    steps.push({ vgs: curve.vgsV, lo, hi, c: fit.c, cov: fit.cov });
  }
  if (steps.length === 0) return null;
  steps.sort((a, b) => a.vgs - b.vgs);
  // Two curves at one gate step (a retaken curve): keep the one measured over the wider range.
  const unique: Step[] = [];
  for (const s of steps) {
    const last = unique[unique.length - 1];
    if (last && Math.abs(last.vgs - s.vgs) < 1e-9) {
      if (s.hi - s.lo > last.hi - last.lo) unique[unique.length - 1] = s;
    } else unique.push(s);
  }
  const n = unique.length;
  const data = new Float64Array(HEADER_FLOATS + STEP_FLOATS * n);
  data[0] = TABLE_FORMAT_VERSION;
  data[1] = n;
  data[2] = ref;
  unique.forEach((st, i) => {
    const o = HEADER_FLOATS + STEP_FLOATS * i;
    data[o + F_VGS] = st.vgs;
    data[o + F_LO] = st.lo;
    data[o + F_HI] = st.hi;
    data[o + F_C0] = st.c[0];
    data[o + F_C1] = st.c[1];
    data[o + F_C2] = st.c[2];
    for (let j = 0; j < 6; j++) data[o + F_COV + j] = st.cov[j];
  });
  const t: OperatingTable = { data, offset: 0 };
  fillLocalExponents(t);
  return t;
}

/** Below this share of the next step's current a step is too near cut-off to shape a power law. */
const EXPONENT_MIN_SHARE = 0.03;
const EXPONENT_RANGE: [number, number] = [1.2, 5];

/**
 * Local exponents (see `OperatingTable.exponent`) from the steps' currents at the reference
 * VDS: for three neighbouring steps, the m in EXPONENT_RANGE that puts ID^(1/m) on a straight
 * line (bisection; the bend of ID^(1/m) falls as m grows). Clamped at the range's ends.
 */
function fillLocalExponents(t: OperatingTable): void {
  const n = tableSteps(t);
  const d = t.data;
  const ref = d[t.offset + 2]!;
  // At the reference VDS each polynomial is its constant term.
  const current = (k: number) => {
    const o = stepBase(t, k);
    return d[o + F_LO]! - 1e-6 <= ref && ref <= d[o + F_HI]! + 1e-6 ? d[o + F_C0]! : NaN;
  };
  for (let k = 1; k < n - 1; k++) {
    const i0 = current(k - 1);
    const i1 = current(k);
    const i2 = current(k + 1);
    if (!(i0 > EXPONENT_MIN_SHARE * i2 && i1 > i0 && i2 > i1)) continue;
    const h0 = d[stepBase(t, k) + F_VGS]! - d[stepBase(t, k - 1) + F_VGS]!;
    const h1 = d[stepBase(t, k + 1) + F_VGS]! - d[stepBase(t, k) + F_VGS]!;
    const bend = (m: number) => {
      const y0 = Math.pow(i0, 1 / m);
      const y1 = Math.pow(i1, 1 / m);
      const y2 = Math.pow(i2, 1 / m);
      return (y2 - y1) / h1 - (y1 - y0) / h0;
    };
    let [lo, hi] = EXPONENT_RANGE;
    let m: number;
    if (bend(lo) <= 0) m = lo;
    else if (bend(hi) >= 0) m = hi;
    else {
      for (let it = 0; it < 50; it++) {
        const mid = 0.5 * (lo + hi);
        if (bend(mid) > 0) lo = mid;
        else hi = mid;
      }
      m = 0.5 * (lo + hi);
    }
    d[stepBase(t, k) + F_EXP] = m;
  }
}

/**
 * The instrument's current offset: the median reading at VDS = 0 over the gate steps that
 * do not forward-bias the gate (VGS ≤ 0, N-equivalent), where a JFET's drain current is
 * zero. 0 when the sweep has no such points. Subtracted before the steps are smoothed.
 */
export function zeroCurrentOffsetA(curves: readonly PreparedCurve[]): number {
  const at0: number[] = [];
  for (const c of curves) {
    if (c.vgsV > 1e-9) continue;
    for (let k = 0; k < c.vdsV.length; k++) if (c.included[k] && Math.abs(c.vdsV[k]) < 1e-9) at0.push(c.idA[k]);
  }
  if (at0.length === 0) return 0;
  at0.sort((a, b) => a - b);
  const mid = at0.length >> 1;
  return at0.length % 2 ? at0[mid] : 0.5 * (at0[mid - 1] + at0[mid]);
}

/**
 * Ordinary least squares of ID − offset on 1, x, x² (x = VDS − ref) over the points `idx`; the
 * covariance is s²·(XᵀX)⁻¹ with s² = SSE/(n − p). Degree 1 leaves c2 and its variances 0.
 */
function fitPolynomial(curve: PreparedCurve, idx: number[], ref: number, degree: 1 | 2, offsetA: number) {
  const p = degree + 1;
  const a = new Float64Array(9);
  const b = new Float64Array(3);
  for (const k of idx) {
    const x = curve.vdsV[k] - ref;
    const row = [1, x, x * x];
    for (let i = 0; i < p; i++) {
      b[i] += row[i] * (curve.idA[k] - offsetA);
      for (let j = 0; j < p; j++) a[i * 3 + j] += row[i] * row[j];
    }
  }
  const inv = invertSymmetric(a, p);
  if (!inv) return null;
  const c = [0, 0, 0];
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) c[i] += inv[i * 3 + j] * b[j];
  let sse = 0;
  for (const k of idx) {
    const x = curve.vdsV[k] - ref;
    const r = curve.idA[k] - offsetA - (c[0] + c[1] * x + c[2] * x * x);
    sse += r * r;
  }
  const dof = idx.length - p;
  const s2 = dof > 0 ? sse / dof : 0;
  const cov = [inv[0] * s2, inv[1] * s2, inv[2] * s2, inv[4] * s2, inv[5] * s2, inv[8] * s2];
  return { c, cov };
}

/** Inverse of the leading p × p block of a symmetric 3 × 3 matrix (row-major), or null. */
function invertSymmetric(a: Float64Array, p: number): Float64Array | null {
  const out = new Float64Array(9);
  if (p === 2) {
    const det = a[0] * a[4] - a[1] * a[3];
    if (!(Math.abs(det) > 1e-12 * Math.abs(a[0] * a[4]))) return null;
    out[0] = a[4] / det;
    out[1] = -a[1] / det;
    out[3] = -a[3] / det;
    out[4] = a[0] / det;
    return out;
  }
  const [m00, m01, m02, , m11, m12, , , m22] = a;
  const c00 = m11 * m22 - m12 * m12;
  const c01 = m02 * m12 - m01 * m22;
  const c02 = m01 * m12 - m02 * m11;
  const det = m00 * c00 + m01 * c01 + m02 * c02;
  if (!(Math.abs(det) > 1e-12 * Math.abs(m00 * m11 * m22))) return null;
  out[0] = c00 / det;
  out[1] = out[3] = c01 / det;
  out[2] = out[6] = c02 / det;
  out[4] = (m00 * m22 - m02 * m02) / det;
  out[5] = out[7] = (m01 * m02 - m00 * m12) / det;
  out[8] = (m00 * m11 - m01 * m01) / det;
  return out;
}

/** The table's values on their own (a copy), for storing: see `OperatingTable` for the layout. */
export function packOperatingTable(t: OperatingTable): Float64Array {
  return t.data.slice(t.offset, t.offset + HEADER_FLOATS + STEP_FLOATS * tableSteps(t));
}

/**
 * Checks stored values (`packOperatingTable`'s, as float64 values) and gives the table over
 * them; null for anything that is not a whole, finite table of this version.
 */
export function unpackOperatingTable(values: Float64Array | null | undefined, offset = 0): OperatingTable | null {
  if (!values || values.length - offset < HEADER_FLOATS) return null;
  const n = values[offset + 1]!;
  if (values[offset] !== TABLE_FORMAT_VERSION || !Number.isInteger(n) || n < 0 || values.length - offset < HEADER_FLOATS + STEP_FLOATS * n) return null;
  for (let i = offset; i < offset + HEADER_FLOATS + STEP_FLOATS * n; i++) if (!Number.isFinite(values[i]!)) return null;
  return { data: values, offset };
}

/** The number of float64 values a stored table takes, read from its header (0 when unreadable). */
export function storedTableLength(values: Float64Array, offset = 0): number {
  const n = values[offset + 1]!;
  return Number.isInteger(n) && n >= 0 ? HEADER_FLOATS + STEP_FLOATS * n : 0;
}

/** Each gate step's smoothed current at `vdsV` where the step was measured in saturation there. */
export function stepCurrentsAt(t: OperatingTable, vdsV: number): { vgsV: number; idA: number }[] {
  const d = t.data;
  const x = vdsV - d[t.offset + 2]!;
  const out: { vgsV: number; idA: number }[] = [];
  for (let k = 0; k < tableSteps(t); k++) {
    const o = stepBase(t, k);
    if (!(vdsV >= d[o + F_LO]! - 1e-6 && vdsV <= d[o + F_HI]! + 1e-6)) continue;
    out.push({ vgsV: d[o + F_VGS]!, idA: d[o + F_C0]! + x * (d[o + F_C1]! + x * d[o + F_C2]!) });
  }
  return out;
}

/** The table's values as little-endian float64 bytes, for a bytea column. */
export function operatingTableToBytes(t: OperatingTable): Uint8Array {
  const values = packOperatingTable(t);
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(8 * i, values[i]!, true);
  return bytes;
}

/**
 * Reads `operatingTableToBytes`' bytes into `into` at float64 index `at` (a fresh array when
 * absent); null when they are not a whole table. `into` lets a stock's tables share one array.
 */
export function operatingTableFromBytes(bytes: Uint8Array | null | undefined, into?: Float64Array, at = 0): OperatingTable | null {
  if (!bytes || bytes.byteLength % 8 !== 0 || bytes.byteLength < 8 * HEADER_FLOATS) return null;
  const n = bytes.byteLength / 8;
  const target = into ?? new Float64Array(n);
  if (target.length < at + n) return null;
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let i = 0; i < n; i++) target[at + i] = view.getFloat64(8 * i, true);
  const t = unpackOperatingTable(target, at);
  return t && storedTableLength(target, at) === n ? t : null;
}
