import { describe, expect, it } from 'vitest';
import { binShareGrid, binShares, cpk, histogram, lotTrend, summarize, yieldBreakdown } from '~/core/statistics';

// Twelve IDSS readings in mA (invented). Reference figures from NumPy 1.24.2 (/usr/bin/python3):
// mean, std(ddof=1), percentile (default linear method) and histogram.
const idssMa = [5.8, 6.1, 6.4, 6.2, 7.0, 5.5, 6.6, 6.3, 6.9, 6.0, 5.9, 6.7];

describe('summarize', () => {
  it('matches NumPy 1.24.2 on a 12-value sample', () => {
    const s = summarize(idssMa);
    expect(s.n).toBe(12);
    expect(s.mean).toBeCloseTo(6.283333333333334, 12);
    expect(s.sd).toBeCloseTo(0.4569331228832933, 12); // numpy std(ddof=1)
    expect([s.min, s.max]).toEqual([5.5, 7.0]);
    const expected = [5.665, 5.975, 6.25, 6.625, 6.945]; // numpy.percentile at 5, 25, 50, 75, 95
    [s.p5, s.p25, s.median, s.p75, s.p95].forEach((v, i) => expect(v).toBeCloseTo(expected[i], 12));
  });

  it('hand-computed: [1, 2, 3, 4] has sd sqrt(5/3), p25 = 1.75 (type-7 interpolation at (n−1)·p)', () => {
    const s = summarize([4, 1, 3, 2]);
    expect(s.sd).toBeCloseTo(Math.sqrt(5 / 3), 14);
    expect(s.p25).toBeCloseTo(1.75, 14);
    expect(s.median).toBe(2.5);
  });

  it('leaves out non-finite values, counts them, and handles n = 0 and n = 1', () => {
    expect(summarize([1, Number.NaN, 3, Infinity])).toMatchObject({ n: 2, nExcluded: 2, mean: 2 });
    expect(summarize([]).mean).toBeNull();
    expect(summarize([5])).toMatchObject({ n: 1, mean: 5, sd: null, median: 5, p5: 5 });
  });
});

describe('cpk', () => {
  // Montgomery, Introduction to Statistical Quality Control, off-centre process (from memory):
  // USL 62, LSL 38, µ 53, σ 2 → Cpu = 1.5, Cpl = 2.5, Cpk = 1.5.
  const c = Math.sqrt(1.6); // five values 53 + c·(−2…2): sample sd = sqrt(10c²/4) = 2 (derived)
  const sample = [-2, -1, 0, 1, 2].map((k) => 53 + k * c);

  it('reproduces the two-sided and one-sided textbook values', () => {
    expect(cpk(sample, 38, 62)).toBeCloseTo(1.5, 12);
    expect(cpk(sample, undefined, 62)).toBeCloseTo(1.5, 12);
    expect(cpk(sample, 38)).toBeCloseTo(2.5, 12);
  });

  it('lower limit only: bursting strength µ 264, s 32, LSL 200 → Cpl 0.67 (Montgomery, from memory)', () => {
    const d = 32 / Math.SQRT2; // two values 264 ± d have sample sd d·√2 = 32 (derived)
    expect(cpk([264 - d, 264 + d], 200)).toBeCloseTo(0.67, 2);
  });

  it('is null when n < 2 or σ = 0, and refuses missing or crossed limits', () => {
    expect(cpk([1], 0, 2)).toBeNull();
    expect(cpk([1, 1, 1], 0, 2)).toBeNull();
    expect(() => cpk([1, 2])).toThrow(/at least one specification limit/);
    expect(() => cpk([1, 2], 3, 2)).toThrow(/lsl below usl/);
  });
});

describe('histogram', () => {
  it('with a bin count matches numpy.histogram(x, bins=4): [2, 4, 3, 3] over 5.5..7.0', () => {
    const h = histogram(idssMa, 4);
    expect(h.bins.map((b) => b.count)).toEqual([2, 4, 3, 3]);
    expect(h.bins.map((b) => b.loValue)).toEqual([5.5, 5.875, 6.25, 6.625]);
    expect(h.bins[3].hiValue).toBe(7.0);
  });

  it('with explicit edges is half-open throughout: numpy gives [3, 5, 4] because it closes its last bin', () => {
    const h = histogram(idssMa, [5.5, 6.0, 6.5, 7.0]);
    expect(h.bins.map((b) => b.count)).toEqual([3, 5, 3]);
    expect(h.above).toBe(1); // the 7.0 reading that numpy puts in its closed last bin
    expect(histogram([0, 10, Number.NaN], [1, 2])).toMatchObject({ below: 1, above: 1, excluded: 1 });
  });

  it('puts equal values in one range and rejects bad edges', () => {
    expect(histogram([2, 2, 2], 5).bins).toEqual([{ loValue: 2, hiValue: 2, count: 3 }]);
    expect(() => histogram([1], [1, 1])).toThrow(/strictly increasing/);
  });
});

describe('yieldBreakdown and binShares (hand-computed)', () => {
  it('gives shares per status and the yield', () => {
    const y = yieldBreakdown({ binned: 180, hold: 12, review: 6, rejected: 2 });
    expect(y.total).toBe(200);
    expect(y.yieldShare).toBeCloseTo(0.9, 14);
    expect(y.entries[1]).toEqual({ status: 'hold', count: 12, share: 0.06 });
    expect(yieldBreakdown({ binned: 3, hold: 1 }, ['binned', 'hold']).yieldShare).toBe(1);
    expect(yieldBreakdown({}).yieldShare).toBeNull();
    expect(() => yieldBreakdown({ binned: -1 })).toThrow(/'binned'/);
  });

  it('lists every catalogue bin, empty ones too, then unknown codes', () => {
    const s = binShares(['I01', 'I02', 'I01', 'HOLD', 'X9'], ['I01', 'I02', 'I03', 'HOLD']);
    expect(s).toEqual([
      { code: 'I01', count: 2, share: 0.4 },
      { code: 'I02', count: 1, share: 0.2 },
      { code: 'I03', count: 0, share: 0 },
      { code: 'HOLD', count: 1, share: 0.2 },
      { code: 'X9', count: 1, share: 0.2 },
    ]);
  });
});

describe('lotTrend', () => {
  it('orders lots by receipt and fits the drift of their means (numpy.polyfit: slope 0.01377551 per day)', () => {
    const t0 = Date.UTC(2026, 2, 2);
    const day = 86_400_000;
    const r = lotTrend([
      { lotId: 'L3', receivedAt: new Date(t0 + 21 * day), values: [6.3, 6.5] },
      { lotId: 'L1', receivedAt: new Date(t0), values: [6.0, 6.2] },
      { lotId: 'L2', receivedAt: new Date(t0 + 7 * day), values: [6.25] },
    ]);
    expect(r.points.map((p) => p.lotId)).toEqual(['L1', 'L2', 'L3']);
    expect(r.points[0].mean).toBeCloseTo(6.1, 14);
    expect(r.points[0].sd).toBeCloseTo(Math.sqrt(0.02), 14); // hand: two values ±0.1 → s = 0.1·√2
    expect(r.points[1].sd).toBeNull();
    expect(r.driftPerDay).toBeCloseTo(0.01377551, 8);
    // Standard error of the slope: scipy.stats.linregress(x, y).stderr = 0.0026510981748503
    // (SciPy, /usr/bin/python3, x = [0, 7, 21], y = [6.1, 6.25, 6.4]); also the textbook formula.
    expect(r.driftSePerDay).toBeCloseTo(0.0026510981748503, 12);
    expect(r.driftSePerDay).toBeCloseTo(slopeSe([0, 7, 21], [6.1, 6.25, 6.4]), 12);
    expect(r.enough).toBe(true);
    expect(lotTrend([r.points[0]].map((p) => ({ ...p, values: [1] }))).driftPerDay).toBeNull();
  });

  it('says there is not enough for lots received minutes apart (no 75 V/day drift)', () => {
    const t0 = Date.UTC(2026, 2, 2);
    const minute = 60_000;
    const r = lotTrend([
      { lotId: 'A', receivedAt: new Date(t0), values: [-1.2, -1.3] },
      { lotId: 'B', receivedAt: new Date(t0 + 5 * minute), values: [-1.0] },
      { lotId: 'C', receivedAt: new Date(t0 + 9 * minute), values: [-0.9] },
    ]);
    expect(r.enough).toBe(false);
    expect(r.driftPerDay).toBeNull();
    expect(r.driftSePerDay).toBeNull();
    expect(r.notEnoughReason).toBe('The 3 lots were received within 9 minutes; a trend needs them spread over 14 days or more.');
  });

  it('needs three lots', () => {
    const day = 86_400_000;
    const r = lotTrend([
      { lotId: 'A', receivedAt: new Date(0), values: [1] },
      { lotId: 'B', receivedAt: new Date(60 * day), values: [2] },
    ]);
    expect(r.enough).toBe(false);
    expect(r.notEnoughReason).toContain('Only 2 lots');
  });
});

/** Standard error of an ordinary least-squares slope, written out from its textbook formula (derived). */
function slopeSe(x: number[], y: number[]): number {
  const n = x.length;
  const mx = x.reduce((a, b) => a + b) / n;
  const my = y.reduce((a, b) => a + b) / n;
  const sxx = x.reduce((a, v) => a + (v - mx) ** 2, 0);
  const sxy = x.reduce((a, v, i) => a + (v - mx) * (y[i] - my), 0);
  const m = sxy / sxx;
  const b = my - m * mx;
  const ssr = x.reduce((a, v, i) => a + (y[i] - (m * v + b)) ** 2, 0);
  return Math.sqrt(ssr / (n - 2) / sxx);
}

describe('binShareGrid', () => {
  // Two IDSS ranges × two VP ranges (N-channel) and the hold bin, counts invented; the layout
  // and shares are worked by hand (derived).
  const r = (quantity: string, loValue: number, hiValue: number) => ({ quantity, loValue, hiValue });
  const bins = [
    { code: 'I01-P01', count: 3, ranges: [r('idss', 0.002, 0.004), r('vp', -2, -1)] },
    { code: 'I01-P02', count: 1, ranges: [r('idss', 0.002, 0.004), r('vp', -1, -0.5)] },
    { code: 'I02-P01', count: 4, ranges: [r('idss', 0.004, 0.006), r('vp', -2, -1)] },
    { code: 'I02-P02', count: 0, ranges: [r('idss', 0.004, 0.006), r('vp', -1, -0.5)] },
    { code: 'HOLD', count: 2, ranges: [] },
  ];
  it('puts IDSS across, VP down from the end nearest 0 V, and the hold bin off the grid', () => {
    const g = binShareGrid(bins)!;
    expect(g.idss).toEqual([{ lo: 0.002, hi: 0.004 }, { lo: 0.004, hi: 0.006 }]);
    expect(g.vp).toEqual([{ lo: -1, hi: -0.5 }, { lo: -2, hi: -1 }]);
    expect(g.cells.map((row) => row.map((c) => c?.code))).toEqual([
      ['I01-P02', 'I02-P02'],
      ['I01-P01', 'I02-P01'],
    ]);
    expect(g.cells[1][1]!.share).toBeCloseTo(0.4, 15);
    expect(g.offGrid).toEqual([{ code: 'HOLD', count: 2, share: 0.2 }]);
    expect(g.maxCount).toBe(4);
  });
  it('gives one row for an IDSS-only plan and null for a plan on neither axis', () => {
    const g = binShareGrid([{ code: 'I01', count: 1, ranges: [r('idss', 0, 1)] }, { code: 'I02', count: 1, ranges: [r('idss', 1, 2)] }])!;
    expect(g.vp).toEqual([null]);
    expect(g.cells[0].map((c) => c?.code)).toEqual(['I01', 'I02']);
    expect(binShareGrid([{ code: 'G01', count: 1, ranges: [r('vgs_at_current', -1, 0)] }])).toBeNull();
  });
});
