import { AppError, type ErrorParams } from '../errors';
import type { CurveFamily } from './definitions.ts';

/** One curve sorted by VDS, with the flat index of each point and whether it is fitted. */
export interface PreparedCurve {
  vgsV: number;
  vdsV: Float64Array;
  idA: Float64Array;
  flatIndex: Int32Array;
  /** 1 = fitted; 0 = left out (by the reviewer or by a flag). */
  included: Uint8Array;
}

/** Curves no fit can read; a stored sweep this malformed is refused (422), not a server fault. */
export class CurveFamilyShapeError extends AppError<'curve_family_shape'> {
  constructor(params: ErrorParams<'curve_family_shape'>) {
    super('curve_family_shape', params);
    this.name = 'CurveFamilyShapeError';
  }
}

/**
 * Sorts each curve by VDS and marks excluded points. Throws `CurveFamilyShapeError` for
 * data no fit can read: no curves, VDS and ID of unequal length, non-finite numbers.
 */
export function prepareCurves(family: CurveFamily, excludedPoints: readonly number[] = []): PreparedCurve[] {
  if (!family || !Array.isArray(family.curves) || family.curves.length === 0) {
    throw new CurveFamilyShapeError({ problem: 'no_curves' });
  }
  const excluded = new Set(excludedPoints);
  // One buffer per column for the whole family, a view per curve: typed-array construction
  // costs far more than a view, and a fit prepares dozens of curves.
  let total = 0;
  for (const curve of family.curves) total += curve.points?.vdsV?.length ?? 0;
  const vdsAll = new Float64Array(total);
  const idAll = new Float64Array(total);
  const flatAll = new Int32Array(total);
  const includedAll = new Uint8Array(total);
  let flat = 0;
  return family.curves.map((curve, c) => {
    const { vdsV, idA } = curve.points;
    if (!Number.isFinite(curve.vgsV) || vdsV.length !== idA.length) {
      throw new CurveFamilyShapeError({ problem: 'unequal_columns', curve: c, vdsCount: vdsV.length, idCount: idA.length });
    }
    let sorted = true;
    for (let i = 1; i < vdsV.length && sorted; i++) sorted = vdsV[i] >= vdsV[i - 1];
    const n = vdsV.length;
    let order: number[] | null = null;
    if (!sorted) {
      order = Array.from({ length: n }, (_, i) => i);
      order.sort((a, b) => vdsV[a] - vdsV[b]);
    }
    const prepared: PreparedCurve = {
      vgsV: curve.vgsV,
      vdsV: vdsAll.subarray(flat, flat + n),
      idA: idAll.subarray(flat, flat + n),
      flatIndex: flatAll.subarray(flat, flat + n),
      included: includedAll.subarray(flat, flat + n),
    };
    for (let k = 0; k < n; k++) {
      const i = order ? order[k] : k;
      if (!Number.isFinite(vdsV[i]) || !Number.isFinite(idA[i])) {
        throw new CurveFamilyShapeError({ problem: 'not_finite', curve: c, point: i });
      }
      prepared.vdsV[k] = vdsV[i];
      prepared.idA[k] = idA[i];
      prepared.flatIndex[k] = flat + i;
      prepared.included[k] = excluded.size > 0 && excluded.has(flat + i) ? 0 : 1;
    }
    flat += n;
    return prepared;
  });
}
