import { describe, expect, it } from 'vitest';
import { assignBin, binCatalogue, withStableBinCodes, type BinPlan } from '~/core/binning';

// The rule (our own): a bin code printed on a bag means one range in every plan version.
const v1: BinPlan = {
  axes: [
    { quantity: 'idss', edges: { kind: 'explicit', edges: [2e-3, 4e-3, 6e-3] } },
    { quantity: 'vp', edges: { kind: 'explicit', edges: [-3, -2, -1] } },
  ],
};
const earlierOf = (plan: BinPlan) => binCatalogue(plan).map((e) => ({ code: e.code, ranges: e.ranges }));

describe('withStableBinCodes', () => {
  it('keeps every code when the ranges repeat', () => {
    const again = withStableBinCodes(v1, earlierOf(v1), 2);
    expect(binCatalogue(again).map((e) => e.code)).toEqual(binCatalogue(v1).map((e) => e.code));
    expect(again.codes).toBeUndefined();
  });

  it('never reuses a code for a different range in a later version', () => {
    // Version 2 splits the first IDSS range: positional codes I01…I03 now mean other ranges.
    const draft: BinPlan = { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [2e-3, 3e-3, 4e-3, 6e-3] } }, v1.axes[1]] };
    const v2 = withStableBinCodes(draft, earlierOf(v1), 2);
    const old = new Map(binCatalogue(v1).map((e) => [e.code, e.ranges]));
    let kept = 0;
    for (const e of binCatalogue(v2)) {
      const before = old.get(e.code);
      if (!before || e.isHold) continue;
      expect(e.ranges).toEqual(before);
      kept++;
    }
    // Some codes of version 1 carry over, so the comparison above ran.
    expect(kept).toBeGreaterThan(0);
    const codes = binCatalogue(v2).map((e) => e.code);
    expect(new Set(codes).size).toBe(codes.length);
    // The unchanged 4–6 mA column keeps its old codes although its position moved (I02 → I03).
    expect(codes).toContain('I02-P01');
    expect(codes).toContain('I01-P01.v2');
    // Binning follows the codes.
    expect(assignBin(v2, { idssA: 5e-3, vpV: -2.5 }).code).toBe('I02-P01');
    expect(assignBin(v2, { idssA: 2.5e-3, vpV: -2.5 }).code).toBe('I01-P01.v2');
  });

  it('checks against every earlier version, not only the last', () => {
    const draftA: BinPlan = { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [1e-3, 2e-3] } }] };
    const draftB: BinPlan = { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [5e-3, 9e-3] } }] };
    const a = withStableBinCodes(draftA, [], 1);
    const b = withStableBinCodes(draftB, earlierOf(a), 2);
    const c = withStableBinCodes(draftA, [...earlierOf(a), ...earlierOf(b)], 3);
    expect(binCatalogue(b)[0].code).toBe('I01.v2');
    expect(binCatalogue(c)[0].code).toBe('I01');
  });
});
