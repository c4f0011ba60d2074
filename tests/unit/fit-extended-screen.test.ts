/**
 * The one-step screen in front of the RS/RD fit (extended-model-screen.ts): it must never
 * leave out the extended model where the full F-test keeps it, and it should leave it out
 * on most level-1 parts. Data: the ngspice fixtures (tests/fixtures/ngspice), seeded noise,
 * and level-1 families with small RS/RD added by the engine's own series solution.
 */
import { describe, expect, it } from 'vitest';
import type { CurveFamily, FitResult } from '~/core/fit/definitions.ts';
import { fitCurveFamily } from '~/core/fit/fit-curve-family.ts';
import { drainCurrentA } from '~/core/fit/series-resistance.ts';
import { maxCurrentA, readCommittedFamily, readNetlistTruth, withNoise } from '../fixtures/ngspice/ngspice-fixtures.ts';

const SEEDS = [3001, 3002, 3003, 3004, 3005, 3006, 3007, 3008];

const noisy = (f: CurveFamily, share: number, seed: number) => withNoise(f, share * maxCurrentA(f), seed);

function fitted(f: CurveFamily, extended: 'auto' | 'always') {
  const r: FitResult = fitCurveFamily(f, { vdsTestV: 10, extended });
  if (r.status !== 'fitted' || !r.extendedTest) throw new Error('expected a fit with an extended-model test');
  return r;
}

describe.each(['njf-series', 'pjf-series'])('RS/RD card %s: never screened out', (name) => {
  const clean = readCommittedFamily(name);
  const cases: Array<[string, CurveFamily]> = [
    ['clean', clean],
    ...SEEDS.map((s): [string, CurveFamily] => [`0.3 % noise, seed ${s}`, noisy(clean, 0.003, s)]),
    ...SEEDS.slice(0, 3).map((s): [string, CurveFamily] => [`1 % noise, seed ${s}`, noisy(clean, 0.01, s)]),
  ];
  it.each(cases)('%s', (_label, family) => {
    const r = fitted(family, 'auto');
    expect(r.extendedTest!.screened).toBe(false);
    expect(r.model).toBe('level1+rs_rd');
    expect(r.extendedTest!.predictedPValue).toBeLessThan(1e-6);
  });
});

describe.each(['njf-medium', 'njf-low-pinchoff', 'pjf-medium'])('level-1 card %s, 0.3 % noise', (name) => {
  const clean = readCommittedFamily(name);
  const runs = SEEDS.map((s) => {
    const family = noisy(clean, 0.003, s);
    return { auto: fitted(family, 'auto'), unscreened: fitted(family, 'always').extendedTest! };
  });
  it('screens the RS/RD fit out for most seeds', () => {
    const screened = runs.filter((r) => r.auto.extendedTest!.screened).length;
    expect(screened).toBeGreaterThanOrEqual(SEEDS.length / 2);
  });
  it('chooses the model the unscreened F-test chooses', () => {
    for (const { auto, unscreened } of runs) {
      expect(auto.model).toBe(unscreened.kept ? 'level1+rs_rd' : 'level1');
      if (auto.extendedTest!.screened) expect(auto.extendedTest!.pValue).toBeGreaterThan(0.5);
    }
  });
});

describe('near the detection limit (njf-medium card with small RS/RD, 0.3 % noise)', () => {
  const base = readCommittedFamily('njf-medium');
  const truth = readNetlistTruth('njf-medium').params;
  const cases = [0.2, 0.5, 1, 2].flatMap((ohm) =>
    [[1, 0], [0, 1], [1, 1]].flatMap(([s, d]) => [11, 12, 13].map((seed) => ({ rsOhm: ohm * s, rdOhm: ohm * d, seed }))),
  );
  it('the screen never changes the chosen model, and its predicted F tracks the fitted one', () => {
    let kept = 0;
    for (const { rsOhm, rdOhm, seed } of cases) {
      const p = { ...truth, rsOhm, rdOhm };
      const clean = {
        curves: base.curves.map((c) => ({
          vgsV: c.vgsV,
          points: { vdsV: c.points.vdsV, idA: c.points.vdsV.map((v) => drainCurrentA(p, c.vgsV, v)) },
        })),
      };
      const family = noisy(clean, 0.003, seed);
      const auto = fitted(family, 'auto');
      const unscreened = fitted(family, 'always').extendedTest!;
      expect(auto.model).toBe(unscreened.kept ? 'level1+rs_rd' : 'level1');
      if (unscreened.kept) kept++;
      // Where the decision is close (F of a few), the linearised prediction is within 5 %.
      if (unscreened.fStatistic > 1 && unscreened.fStatistic < 50) {
        expect(Math.abs(auto.extendedTest!.predictedFStatistic! / unscreened.fStatistic - 1)).toBeLessThan(0.05);
      }
    }
    // The grid straddles the limit: some parts keep RS/RD, some do not.
    expect(kept).toBeGreaterThan(0);
    expect(kept).toBeLessThan(cases.length);
  });
});
