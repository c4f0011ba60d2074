import { describe, expect, it } from 'vitest';
import { COMMON_PRACTICE_GRADES, meetsAskedTolerances, proposalVerdict, setGradeWarnings, toleranceWarnings } from '~/core/match/grade-warnings';

// Grades of matched duals: |ΔVGS| 10 mV, IDSS ratio ≥ 0.95, gfs ratio ≥ 0.97 — common practice.
const practice = { maxDvgsV: 0.01, maxGmMismatch: 0.03, maxIdssMismatch: 0.05 };

describe('common-practice grades', () => {
  it('are the usual figures (common practice)', () => {
    expect(COMMON_PRACTICE_GRADES.maxDvgsV).toBe(0.01);
    expect(1 - COMMON_PRACTICE_GRADES.maxIdssMismatch).toBeCloseTo(0.95, 12);
    expect(1 - COMMON_PRACTICE_GRADES.maxGmMismatch).toBeCloseTo(0.97, 12);
  });
});

describe('toleranceWarnings', () => {
  it('is silent at the common-practice grades and tighter', () => {
    expect(toleranceWarnings(practice)).toEqual([]);
    expect(toleranceWarnings({ maxDvgsV: 0.005, maxGmMismatch: 0.01, maxIdssMismatch: 0.02 })).toEqual([]);
  });
  it('warns about every empty or looser tolerance', () => {
    const w = toleranceWarnings({ maxDvgsV: null, maxGmMismatch: 0.1, maxIdssMismatch: null });
    expect(w.map((x) => x.figure)).toEqual(['dvgs', 'gm', 'idss']);
    expect(w[0].message).toContain('No |ΔVGS| limit');
    expect(w[1].message).toContain('gfs ratio ≥ 0.900');
  });
});

describe('setGradeWarnings and the verdict', () => {
  // The case the issue reports: empty tolerances gave a P-channel pair with 34.5 % gm and
  // 27.9 % IDSS mismatch, marked "best possible".
  const bad = { dvgsV: 0.004, gmMismatch: 0.345, idssMismatch: 0.279 };
  const good = { dvgsV: 0.004, gmMismatch: 0.01, idssMismatch: 0.02 };
  it('names the figures outside common practice', () => {
    const w = setGradeWarnings(bad);
    expect(w.map((x) => x.figure)).toEqual(['gm', 'idss']);
    expect(w[0].message).toBe('gfs ratio 0.655 is below the common-practice 0.970');
  });
  it('never says "best possible" with empty tolerances or a set outside them', () => {
    const none = { maxDvgsV: null, maxGmMismatch: null, maxIdssMismatch: null };
    expect(proposalVerdict({ exact: true, tolerances: none, sets: [bad], matched: true })).toBe('outside_common_practice');
    expect(proposalVerdict({ exact: true, tolerances: none, sets: [good], matched: true })).toBe('outside_common_practice');
    expect(proposalVerdict({ exact: true, tolerances: practice, sets: [good], matched: true })).toBe('best_possible');
    expect(proposalVerdict({ exact: false, tolerances: practice, sets: [good], matched: true })).toBe('not_proven_best');
    expect(proposalVerdict({ exact: true, tolerances: { ...practice, maxGmMismatch: 0.5 }, sets: [bad], matched: true })).toBe('outside_common_practice');
    expect(proposalVerdict({ exact: true, tolerances: practice, sets: [], matched: true })).toBe('none_found');
  });
  it('checks each asked tolerance', () => {
    expect(meetsAskedTolerances(good, practice)).toBe(true);
    expect(meetsAskedTolerances({ ...good, dvgsV: 0.0101 }, practice)).toBe(false);
  });
});
