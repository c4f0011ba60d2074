import {
  emptyFigures,
  partOperatingFigures,
  partOperatingFiguresInto,
  type PartBasis,
  type PartFigures,
} from '../operating-point/part-operating-figures';
import type { OperatingFigures, OperatingPoint, PartEvaluation } from './match-types';
import { float64Scratch, uint8Scratch } from './scratch';

export { selfBiasDrainCurrentA } from '../operating-point/part-operating-figures';

/** Figures of many parts in typed arrays, slot i for part i. */
export interface FigureArrays {
  idA: Float64Array;
  vgsV: Float64Array;
  gmS: Float64Array;
  gosS: Float64Array;
  idssA: Float64Array;
  vdsSatV: Float64Array;
  vgsSigmaV: Float64Array;
  /** 1 = read from the part's measurements, 0 = from its fitted model. */
  measured: Uint8Array;
  temperatureShiftV: Float64Array;
}

const shared = {
  idA: float64Scratch(),
  vgsV: float64Scratch(),
  gmS: float64Scratch(),
  gosS: float64Scratch(),
  idssA: float64Scratch(),
  vdsSatV: float64Scratch(),
  vgsSigmaV: float64Scratch(),
  measured: uint8Scratch(),
  temperatureShiftV: float64Scratch(),
};

/**
 * Figure arrays for `n` parts, the same memory every call (see scratch.ts): valid until the next
 * call, for matching, which copies out what it keeps before it returns.
 */
export function reusedFigureArrays(n: number): FigureArrays {
  return {
    idA: shared.idA.take(n),
    vgsV: shared.vgsV.take(n),
    gmS: shared.gmS.take(n),
    gosS: shared.gosS.take(n),
    idssA: shared.idssA.take(n),
    vdsSatV: shared.vdsSatV.take(n),
    vgsSigmaV: shared.vgsSigmaV.take(n),
    measured: shared.measured.take(n),
    temperatureShiftV: shared.temperatureShiftV.take(n),
  };
}

/** The first `m` slots of `a`, as views. */
export function firstSlots(a: FigureArrays, m: number): FigureArrays {
  return {
    idA: a.idA.subarray(0, m),
    vgsV: a.vgsV.subarray(0, m),
    gmS: a.gmS.subarray(0, m),
    gosS: a.gosS.subarray(0, m),
    idssA: a.idssA.subarray(0, m),
    vdsSatV: a.vdsSatV.subarray(0, m),
    vgsSigmaV: a.vgsSigmaV.subarray(0, m),
    measured: a.measured.subarray(0, m),
    temperatureShiftV: a.temperatureShiftV.subarray(0, m),
  };
}

type Unusable = Extract<PartEvaluation, { usable: false }>;
const scratchFigures = emptyFigures();

/**
 * Writes the figures of `part` at `op` (compared at `compareAtC`, °C) into slot `i` of `out`;
 * returns why the part is unusable, or null. The figures are `partOperatingFigures`'s.
 */
export function evaluateIntoArrays(
  part: PartBasis,
  op: OperatingPoint,
  out: FigureArrays,
  i: number,
  compareAtC?: number,
): Unusable | null {
  const f = scratchFigures;
  const bad = partOperatingFiguresInto(part, op, compareAtC, f);
  if (bad) return bad;
  out.idA[i] = f.idA;
  out.vgsV[i] = f.vgsV;
  out.gmS[i] = f.gmS;
  out.gosS[i] = f.gosS;
  out.idssA[i] = f.idssA;
  out.vdsSatV[i] = f.vdsSatV;
  out.vgsSigmaV[i] = Number.isFinite(f.vgsSigmaV) ? f.vgsSigmaV : 0;
  out.measured[i] = f.source === 'measured' ? 1 : 0;
  out.temperatureShiftV[i] = f.temperatureShiftV;
  return null;
}

/**
 * Figures of `parts[from..to)` at `op` into the same slots of `out`; `unusable[i]` = 1 where
 * part i cannot run there (its figures slot is then meaningless), else 0. The same numbers
 * `evaluateIntoArrays` gives part by part, so a stock can be evaluated in slices, on several
 * threads, and handed to `chooseMatchedSets` as `MatchInput.evaluated`.
 */
export function evaluateRange(
  parts: readonly PartBasis[],
  op: OperatingPoint,
  compareAtC: number | undefined,
  out: FigureArrays,
  unusable: Uint8Array,
  from: number,
  to: number,
): void {
  for (let i = from; i < to; i++) unusable[i] = evaluateIntoArrays(parts[i]!, op, out, i, compareAtC) ? 1 : 0;
}

/** Copies slot `from` of `a` into slot `to` of `b`. */
export function copySlot(a: FigureArrays, from: number, b: FigureArrays, to: number): void {
  b.idA[to] = a.idA[from]!;
  b.vgsV[to] = a.vgsV[from]!;
  b.gmS[to] = a.gmS[from]!;
  b.gosS[to] = a.gosS[from]!;
  b.idssA[to] = a.idssA[from]!;
  b.vdsSatV[to] = a.vdsSatV[from]!;
  b.vgsSigmaV[to] = a.vgsSigmaV[from]!;
  b.measured[to] = a.measured[from]!;
  b.temperatureShiftV[to] = a.temperatureShiftV[from]!;
}

/** Slot `i` of `a` as one part's figures at |VDS| `vdsV`. */
export function figuresAt(a: FigureArrays, i: number, vdsV: number): OperatingFigures {
  return {
    idA: a.idA[i]!,
    vdsV: Math.abs(vdsV),
    vgsV: a.vgsV[i]!,
    gmS: a.gmS[i]!,
    gosS: a.gosS[i]!,
    idssA: a.idssA[i]!,
    vdsSatV: a.vdsSatV[i]!,
    vgsSigmaV: a.vgsSigmaV[i]!,
    source: a.measured[i] ? 'measured' : 'model',
    temperatureShiftV: a.temperatureShiftV[i]!,
  };
}

/** A part's figures at an operating point as matching sees them (see `partOperatingFigures`). */
export function evaluateAtOperatingPoint(part: PartBasis, op: OperatingPoint, compareAtC?: number): PartEvaluation {
  const e = partOperatingFigures(part, op, compareAtC);
  if (!e.usable) return e;
  return { usable: true, figures: toOperatingFigures(e.figures) };
}

export function toOperatingFigures(f: PartFigures): OperatingFigures {
  return {
    idA: f.idA,
    vdsV: f.vdsV,
    vgsV: f.vgsV,
    gmS: f.gmS,
    gosS: f.gosS,
    idssA: f.idssA,
    vdsSatV: f.vdsSatV,
    vgsSigmaV: Number.isFinite(f.vgsSigmaV) ? f.vgsSigmaV : 0,
    source: f.source,
    temperatureShiftV: f.temperatureShiftV,
  };
}
