/**
 * Review flags of fitCurveFamily on ngspice-simulated families (tests/fixtures/ngspice,
 * Debian ngspice) cut down or disturbed to provoke each flag.
 */
import { describe, expect, it } from 'vitest';
import type { CurveFamily } from '../../src/core/fit/definitions.ts';
import { fitCurveFamily } from '../../src/core/fit/fit-curve-family.ts';
import { CurveFamilyShapeError } from '../../src/core/fit/prepared-curves.ts';
import { maxCurrentA, readCommittedFamily, withNoise } from '../fixtures/ngspice/ngspice-fixtures.ts';

const medium = readCommittedFamily('njf-medium');
const codes = (f: CurveFamily, extended: 'auto' | 'never' = 'auto') => {
  const r = fitCurveFamily(f, { vdsTestV: 10, extended });
  return r.flags.map((x) => x.code);
};

describe('flags', () => {
  it('too_few_curves: only 2 VGS steps', () => {
    expect(codes({ curves: medium.curves.slice(0, 2) })).toContain('too_few_curves');
  });
  it('too_few_saturation_points: VDS stops at 1 V, below the knee of most curves', () => {
    const cut = { curves: medium.curves.map((c) => {
      const keep = c.points.vdsV.map((v, k) => (v <= 1 ? k : -1)).filter((k) => k >= 0);
      return { vgsV: c.vgsV, points: { vdsV: keep.map((k) => c.points.vdsV[k]), idA: keep.map((k) => c.points.idA[k]) } };
    }) };
    expect(codes(cut)).toContain('too_few_saturation_points');
  });
  it('poor_fit: 5 % of IDSS noise is far above the 2 % limit', () => {
    expect(codes(withNoise(medium, 0.05 * maxCurrentA(medium), 7), 'never')).toContain('poor_fit');
  });
  it('none on the clean family, and a reviewer-excluded point is not fitted', () => {
    const r = fitCurveFamily(medium, { vdsTestV: 10, excludedPoints: [5, 70] });
    if (r.status !== 'fitted') throw new Error('not fitted');
    expect(r.flags).toEqual([]);
    expect(r.quality.pointsFitted).toBe(9 * 61 - 2);
  });
  it('not_fitted when no curve carries current', () => {
    const off = { curves: medium.curves.map((c) => ({ vgsV: c.vgsV - 5, points: { vdsV: c.points.vdsV, idA: c.points.vdsV.map(() => 0) } })) };
    const r = fitCurveFamily(off, { vdsTestV: 10 });
    expect(r.status).toBe('not_fitted');
    expect(r.needsReview).toBe(true);
  });
  it('refuses a malformed family with a sentence saying what to fix', () => {
    expect(() => fitCurveFamily({ curves: [] }, { vdsTestV: 10 })).toThrow(CurveFamilyShapeError);
    expect(() => fitCurveFamily({ curves: [{ vgsV: 0, points: { vdsV: [1, 2], idA: [1] } }] }, { vdsTestV: 10 })).toThrow(/each point needs both/);
  });
});
