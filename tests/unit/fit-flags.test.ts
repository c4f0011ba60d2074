/**
 * Review flags of fitCurveFamily on ngspice-simulated families (tests/fixtures/ngspice,
 * Debian ngspice) cut down or disturbed to provoke each flag.
 */
import { describe, expect, it } from 'vitest';
import type { CurveFamily } from '~/core/fit/definitions.ts';
import { fitCurveFamily } from '~/core/fit/fit-curve-family.ts';
import { CurveFamilyShapeError } from '~/core/fit/prepared-curves.ts';
import { maxCurrentA, readCommittedFamily, readNetlistTruth, withNoise } from '../fixtures/ngspice/ngspice-fixtures.ts';

const medium = readCommittedFamily('njf-medium');
const codes = (f: CurveFamily, extended: 'auto' | 'never' = 'auto') => {
  const r = fitCurveFamily(f, { vdsTestV: 10, extended });
  return r.flags.map((x) => x.code);
};

describe('flags', () => {
  // Level-1 ID carries (1 + LAMBDA·VDS) in both regions, so rescaling the ngspice family by
  // (1 + λ·VDS)/(1 + LAMBDA_card·VDS) is that card with LAMBDA = λ (RS = RD = 0 in njf-medium).
  const withLambda = (lambda: number): CurveFamily => {
    const card = readNetlistTruth('njf-medium').params.lambdaPerV;
    return {
      curves: medium.curves.map((c) => ({
        vgsV: c.vgsV,
        points: { vdsV: c.points.vdsV, idA: c.points.idA.map((id, k) => (id * (1 + lambda * c.points.vdsV[k])) / (1 + card * c.points.vdsV[k])) },
      })),
    };
  };
  it('parameter_at_bound: LAMBDA = 0.6 /V, beyond the 0.5 /V limit; 0.45 /V is still fitted freely', () => {
    const r = fitCurveFamily(withLambda(0.6), { vdsTestV: 10, extended: 'never' });
    expect(r.flags.map((f) => f.code)).toEqual(['parameter_at_bound']);
    expect(r.flags[0].message).toMatch(/^LAMBDA ended at the limit/);
    expect(r.needsReview).toBe(true);
    const inside = fitCurveFamily(withLambda(0.45), { vdsTestV: 10, extended: 'never' });
    expect(inside.flags).toEqual([]);
    if (inside.status !== 'fitted') throw new Error(`LAMBDA = 0.45 /V was not fitted: ${inside.status}`);
    expect(inside.parameters.lambdaPerV.value).toBeCloseTo(0.45, 6);
  });
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
