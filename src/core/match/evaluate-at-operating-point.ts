import { gmAtCurrentS, idssA, vgsAtCurrentV, type JfetParams } from '../jfet-model';
import type { OperatingFigures, OperatingPoint, PartEvaluation } from './match-types';

/**
 * Drain current (A) of a part with its gate at 0 V and `rsOhm` from source to ground, at
 * external |VDS| `vdsV`: the root of VGS(ID) + ID·RS = 0, VGS(ID) from `vgsAtCurrentV`.
 * `rsOhm = 0` gives the part's IDSS at VGS = 0 (including its own fitted RS/RD when present).
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
  let hi = idssA(p, vds);
  while (vgsAtCurrentV(p, hi, vds) + hi * rsOhm < 0) hi *= 2;
  for (let i = 0; i < 80 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (vgsAtCurrentV(p, mid, vds) + mid * rsOhm < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

const fmtMa = (a: number) => `${(a * 1e3).toPrecision(3)} mA`;

/** Figures of many parts in typed arrays, slot i for part i. */
export interface FigureArrays {
  idA: Float64Array;
  vgsV: Float64Array;
  gmS: Float64Array;
  idssA: Float64Array;
  vdsSatV: Float64Array;
}

export function allocateFigureArrays(n: number): FigureArrays {
  return {
    idA: new Float64Array(n),
    vgsV: new Float64Array(n),
    gmS: new Float64Array(n),
    idssA: new Float64Array(n),
    vdsSatV: new Float64Array(n),
  };
}

type Unusable = Extract<PartEvaluation, { usable: false }>;

/**
 * Writes the figures of `p` at `op` into slot `i` of `out`; returns why the part is unusable,
 * or null. See `evaluateAtOperatingPoint` for the model.
 */
export function evaluateIntoArrays(
  p: JfetParams,
  op: OperatingPoint,
  out: FigureArrays,
  i: number,
): Unusable | null {
  if (
    !(p.vtoV < 0) ||
    !(p.betaAPerV2 > 0) ||
    !(p.lambdaPerV >= 0) ||
    !(p.rsOhm >= 0) ||
    !(p.rdOhm >= 0)
  ) {
    return {
      usable: false,
      code: 'invalid_model',
      reason: 'model needs VTO < 0, BETA > 0 and LAMBDA, RS, RD ≥ 0',
    };
  }
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
          `${fmtMa(idA)} exceeds this part's IDSS (${fmtMa(idssA(p, vdsV))} at ${vdsV} V): ` +
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
    return {
      usable: false,
      code: 'invalid_model',
      reason: `no saturated solution at ${fmtMa(idA)}, ${vdsV} V`,
    };
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
  out.idA[i] = idA;
  out.vgsV[i] = vgsV;
  out.gmS[i] = gmInternalS / (1 + gmInternalS * p.rsOhm);
  out.idssA[i] = idssA(p, vdsV);
  out.vdsSatV[i] = vgsV - p.vtoV;
  return null;
}

/** Slot `i` of `a` as one part's figures at |VDS| `vdsV`. */
export function figuresAt(a: FigureArrays, i: number, vdsV: number): OperatingFigures {
  return {
    idA: a.idA[i]!,
    vdsV: Math.abs(vdsV),
    vgsV: a.vgsV[i]!,
    gmS: a.gmS[i]!,
    idssA: a.idssA[i]!,
    vdsSatV: a.vdsSatV[i]!,
  };
}

const scratch = allocateFigureArrays(1);

/**
 * A part's figures at an operating point (N-equivalent, SI):
 * VGS from the saturation model (`vgsAtCurrentV`), gm = gm_int/(1 + gm_int·RS) with gm_int from
 * `gmAtCurrentS` at the internal VDS (source degeneration, derived), IDSS from `idssA` at the
 * operating VDS, and VDS(sat) = VGS − VTO.
 * Not usable when the point needs a forward-biased gate (operating current above what the part
 * gives at VGS = 0), or when the operating VDS leaves the part out of saturation.
 */
export function evaluateAtOperatingPoint(p: JfetParams, op: OperatingPoint): PartEvaluation {
  const bad = evaluateIntoArrays(p, op, scratch, 0);
  return bad ?? { usable: true, figures: figuresAt(scratch, 0, op.vdsV) };
}
