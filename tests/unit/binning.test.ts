import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  assignBin,
  binCatalogue,
  binEdges,
  BinPlanError,
  parseBinPlan,
  planMoves,
  type BinPlan,
} from '~/core/binning';

/** IDSS 6.0–8.0 mA in 0.5 mA steps × VP −2.4 to −1.8 V in three explicit ranges. */
const plan: BinPlan = {
  axes: [
    { quantity: 'idss', edges: { kind: 'uniform', startValue: 6.0e-3, width: 0.5e-3, count: 4 } },
    { quantity: 'vp', edges: { kind: 'explicit', edges: [-2.4, -2.2, -2.0, -1.8] } },
  ],
};

describe('binEdges', () => {
  it('gives uniform edges equal to the decimal values typed (derived: 6.0 + i·0.5 mA)', () => {
    expect(binEdges(plan.axes[0])).toEqual([6.0e-3, 6.5e-3, 7.0e-3, 7.5e-3, 8.0e-3]);
    // 0.1 + 0.2 ≠ 0.3 in binary floating point (IEEE 754, common practice): the rounding must hide it.
    const e = binEdges({ quantity: 'vp', edges: { kind: 'uniform', startValue: 0.1, width: 0.1, count: 3 } });
    expect(e[2]).toBe(0.3);
  });

  it('rejects edges that are not strictly increasing with a message naming the edge', () => {
    const axis = { quantity: 'vp' as const, edges: { kind: 'explicit' as const, edges: [-2.4, -2.0, -2.0, -1.8] } };
    expect(() => binEdges(axis)).toThrow(BinPlanError);
    expect(() => binEdges(axis)).toThrowErrorMatchingInlineSnapshot(
      `[BinPlanError: The bin plan is not valid: edges, edge 3: edges must be strictly increasing, but edge 3 (-2) is not above edge 2 (-2). Correct the plan and save it again.]`,
    );
  });

  it('rejects a VGS axis without its reference current and two axes on one quantity', () => {
    expect(() =>
      parseBinPlan({
        axes: [
          { quantity: 'vgs_at_current', edges: { kind: 'uniform', startValue: -2, width: 0.1, count: 5 } },
          { quantity: 'vgs_at_current', edges: { kind: 'uniform', startValue: -2, width: 0.1, count: 5 }, referenceCurrentA: 1e-3 },
        ],
      }),
    ).toThrowError(/axis 1, reference current: .*axis 2, quantity: /s);
  });
});

describe('assignBin', () => {
  it('codes and labels a part (label form: SI Brochure 9th ed. — space before unit, prefix symbols; U+2212 minus; from memory)', () => {
    const a = assignBin(plan, { idssA: 6.2e-3, vpV: -1.9 });
    expect(a).toEqual({ code: 'I01-P03', label: 'IDSS 6.0–6.5 mA · VP −1.8 to −2.0 V', isHold: false });
  });

  it('puts a value exactly on an edge into the upper bin, half-open [lo, hi) (derived from the plan rule)', () => {
    expect(assignBin(plan, { idssA: 6.5e-3, vpV: -2.2 }).code).toBe('I02-P02');
    expect(assignBin(plan, { idssA: 6.0e-3, vpV: -2.4 }).code).toBe('I01-P01');
  });

  it.each([
    ['the top edge', { idssA: 8.0e-3, vpV: -2.0 }, 'outside_grid'],
    ['below the grid', { idssA: 5.99e-3, vpV: -2.0 }, 'outside_grid'],
    ['VP outside', { idssA: 7.0e-3, vpV: -1.8 }, 'outside_grid'],
    ['a missing figure', { idssA: 7.0e-3 }, 'missing_figure'],
    ['a NaN figure', { idssA: Number.NaN, vpV: -2.0 }, 'missing_figure'],
  ])('holds a part with %s', (_, figures, reason) => {
    expect(assignBin(plan, figures)).toMatchObject({ code: 'HOLD', isHold: true, holdReason: reason });
  });

  it('pads codes to the axis count and labels a VGS axis with its reference current', () => {
    const p: BinPlan = {
      axes: [{ quantity: 'vgs_at_current', referenceCurrentA: 1e-3, edges: { kind: 'uniform', startValue: -3, width: 0.025, count: 120 } }],
    };
    // [−3 + 40·0.025, −3 + 41·0.025) = [−2.000, −1.975): the 41st range.
    expect(assignBin(p, { vgsAtCurrentV: -1.99 })).toEqual({
      code: 'G041',
      label: 'VGS at 1 mA −1.975 to −2.000 V',
      isHold: false,
    });
  });
});

describe('binCatalogue', () => {
  const cat = binCatalogue(plan);

  it('lists every cell once and the hold bin last', () => {
    expect(cat).toHaveLength(4 * 3 + 1);
    expect(new Set(cat.map((e) => e.code)).size).toBe(cat.length);
    expect(cat.at(-1)).toMatchObject({ code: 'HOLD', isHold: true, ranges: [] });
    expect(cat[0]).toEqual({
      code: 'I01-P01',
      label: 'IDSS 6.0–6.5 mA · VP −2.2 to −2.4 V',
      isHold: false,
      ranges: [
        { quantity: 'idss', loValue: 6.0e-3, hiValue: 6.5e-3 },
        { quantity: 'vp', loValue: -2.4, hiValue: -2.2 },
      ],
    });
  });

  it('agrees with assignBin for any part inside the grid (property; derived from [lo, hi))', () => {
    fc.assert(
      fc.property(fc.double({ min: 6.0e-3, max: 8.0e-3, noNaN: true }), fc.double({ min: -2.4, max: -1.8, noNaN: true }), (idssA, vpV) => {
        const a = assignBin(plan, { idssA, vpV });
        const entry = cat.find((e) => e.code === a.code)!;
        if (a.isHold) return idssA === 8.0e-3 || vpV === -1.8;
        return entry.label === a.label && entry.ranges.every((r) => {
          const v = r.quantity === 'idss' ? idssA : vpV;
          return v >= r.loValue && v < r.hiValue;
        });
      }),
    );
  });
});

describe('planMoves', () => {
  it('moves parts whose bin changes and counts each from → to (hand-worked example)', () => {
    const newPlan: BinPlan = {
      axes: [{ quantity: 'idss', edges: { kind: 'uniform', startValue: 6.0e-3, width: 1.0e-3, count: 2 } }],
    };
    const parts = [
      { serial: 'A1', figures: { idssA: 6.2e-3, vpV: -1.9 }, currentCode: 'I01-P03' }, // → I01
      { serial: 'A2', figures: { idssA: 6.7e-3, vpV: -2.1 }, currentCode: 'I02-P02' }, // → I01
      { serial: 'A3', figures: { idssA: 6.9e-3, vpV: -2.3 }, currentCode: null }, // old I02-P01 → I01
      { serial: 'A4', figures: { idssA: 7.9e-3, vpV: -2.3 }, currentCode: 'I04-P01' }, // → I02
      { serial: 'A5', figures: { idssA: 9.0e-3, vpV: -2.3 }, currentCode: 'HOLD' }, // stays HOLD
      { serial: 'A6', figures: { idssA: 6.1e-3, vpV: -2.3 }, currentCode: 'I03-P01' }, // recorded wrongly; → I01
    ];
    const r = planMoves(plan, newPlan, parts);
    expect(r.moves.map((m) => m.serial)).toEqual(['A1', 'A2', 'A3', 'A4', 'A6']);
    expect(r.moves[2]).toEqual({ serial: 'A3', from: 'I02-P01', to: 'I01' });
    expect(r.unchangedCount).toBe(1);
    expect(r.counts).toHaveLength(5);
    expect(r.counts.every((c) => c.count === 1)).toBe(true);
    expect(r.discrepancies).toEqual([{ serial: 'A6', currentCode: 'I03-P01', oldPlanCode: 'I01-P01' }]);
    expect(r.relabelled).toEqual([]);
  });

  it('aggregates counts and reports codes whose range changed', () => {
    const a: BinPlan = { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [1e-3, 2e-3, 3e-3] } }] };
    const b: BinPlan = { axes: [{ quantity: 'idss', edges: { kind: 'explicit', edges: [1e-3, 2.5e-3, 3e-3] } }] };
    const parts = [2.1e-3, 2.2e-3, 2.6e-3, 1.5e-3].map((idssA, i) => ({ serial: `S${i}`, figures: { idssA }, currentCode: null }));
    const r = planMoves(a, b, parts);
    expect(r.counts).toEqual([{ from: 'I02', to: 'I01', count: 2 }]);
    expect(r.unchangedCount).toBe(2);
    expect(r.relabelled).toEqual([
      { code: 'I01', oldLabel: 'IDSS 1.0–2.0 mA', newLabel: 'IDSS 1.0–2.5 mA' },
      { code: 'I02', oldLabel: 'IDSS 2.0–3.0 mA', newLabel: 'IDSS 2.5–3.0 mA' },
    ]);
  });
});
