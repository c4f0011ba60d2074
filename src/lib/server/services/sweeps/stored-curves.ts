import { AppError } from '~/core/errors';
import type { CurveFamily } from '~/core/fit/definitions';
import type { SweepCurve } from '~/core/sweep-file';

/** A curve as kept in sweep.curves: N-equivalent SI values, points sorted by VDS. */
export interface StoredCurve {
  vgs_v: number;
  vds_v: number[];
  id_a: number[];
  first_line: number;
}

export function toStoredCurves(curves: readonly SweepCurve[]): StoredCurve[] {
  return curves.map((c) => ({ vgs_v: c.vgsV, vds_v: c.points.vdsV, id_a: c.points.idA, first_line: c.firstLine }));
}

export function toCurveFamily(curves: readonly StoredCurve[]): CurveFamily {
  return { curves: curves.map((c) => ({ vgsV: c.vgs_v, points: { vdsV: c.vds_v, idA: c.id_a } })) };
}

/** [curveIndex, pointIndex] pairs → the fitter's flat indices; refuses pairs outside the sweep. */
export function toFlatIndices(curves: readonly StoredCurve[], pairs: readonly (readonly [number, number])[]): number[] {
  const offsets: number[] = [];
  let total = 0;
  for (const c of curves) {
    offsets.push(total);
    total += c.vds_v.length;
  }
  return pairs.map(([ci, pi]) => {
    const c = curves[ci];
    if (!c || pi < 0 || pi >= c.vds_v.length || !Number.isInteger(pi)) {
      throw new AppError('point_not_in_sweep', { curve: ci, point: pi, curves: curves.length });
    }
    return offsets[ci] + pi;
  });
}

/** Flat indices → [curveIndex, pointIndex] pairs. */
export function toPointPairs(curves: readonly StoredCurve[], flat: readonly number[]): [number, number][] {
  const out: [number, number][] = [];
  for (const f of flat) {
    let rest = f;
    for (let ci = 0; ci < curves.length; ci++) {
      if (rest < curves[ci].vds_v.length) {
        out.push([ci, rest]);
        break;
      }
      rest -= curves[ci].vds_v.length;
    }
  }
  return out;
}
