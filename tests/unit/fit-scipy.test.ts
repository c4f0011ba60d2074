/**
 * fitCurveFamily against SciPy: scipy.optimize.least_squares(method='lm') (MINPACK) run by
 * /usr/bin/python3 on the same ngspice-simulated, noise-added data
 * (tests/fixtures/scipy/fit_level1.py). Both must land on the same least-squares optimum.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { CurveFamily } from '~/core/fit/definitions.ts';
import { fTestTwoExtraParameters } from '~/core/fit/f-test.ts';
import { fitCurveFamily } from '~/core/fit/fit-curve-family.ts';
import { prepareCurves } from '~/core/fit/prepared-curves.ts';
import { estimateStartingValues } from '~/core/fit/starting-values.ts';
import { maxCurrentA, readCommittedFamily, withNoise } from '../fixtures/ngspice/ngspice-fixtures.ts';

const SCRIPT = fileURLToPath(new URL('../fixtures/scipy/fit_level1.py', import.meta.url));

function python(request: unknown): any {
  const run = spawnSync('/usr/bin/python3', [SCRIPT], { input: JSON.stringify(request), encoding: 'utf8', timeout: 60_000 });
  if (run.status === 3 || run.error) {
    throw new Error(`SciPy is needed for this test and /usr/bin/python3 cannot import it: apt-get install python3-scipy (${run.stderr ?? run.error})`);
  }
  if (run.status !== 0) throw new Error(`fit_level1.py failed: ${run.stderr}`);
  return JSON.parse(run.stdout);
}

function flatten(f: CurveFamily) {
  return {
    vgs: f.curves.flatMap((c) => c.points.vdsV.map(() => c.vgsV)),
    vds: f.curves.flatMap((c) => c.points.vdsV),
    id: f.curves.flatMap((c) => c.points.idA),
  };
}

const CASES = [
  { name: 'njf-medium', model: 'level1' },
  { name: 'njf-low-pinchoff', model: 'level1' },
  { name: 'pjf-medium', model: 'level1' },
  { name: 'njf-series', model: 'level1+rs_rd' },
  { name: 'pjf-series', model: 'level1+rs_rd' },
] as const;

describe('agreement with SciPy least_squares (method="lm") to 1e-4 relative', () => {
  it.each(CASES.map((c, i) => ({ ...c, seed: 2000 + i })))('$name, $model, noise 0.3 % of IDSS', ({ name, model, seed }) => {
    const clean = readCommittedFamily(name);
    const family = withNoise(clean, 0.003 * maxCurrentA(clean), seed);
    const start = estimateStartingValues(prepareCurves(family))!;
    const startVector = [start.vtoV, start.betaAPerV2, start.lambdaPerV, ...(model === 'level1' ? [] : [1, 1])];
    const reference = python({ model, families: [{ ...flatten(family), start: startVector }] }).results[0];
    expect(reference.status).toBeGreaterThan(0);

    const r = fitCurveFamily(family, { vdsTestV: 10, extended: model === 'level1' ? 'never' : 'always' });
    if (r.status !== 'fitted') throw new Error('not fitted');
    expect(r.flags).toEqual([]);
    const ours = [r.parameters.vtoV, r.parameters.betaAPerV2, r.parameters.lambdaPerV, r.parameters.rsOhm, r.parameters.rdOhm]
      .slice(0, reference.params.length)
      .map((e) => e.value);
    ours.forEach((v, k) => expect(Math.abs(v / reference.params[k] - 1)).toBeLessThan(1e-4));
  });
});

describe('the F-test p-value (closed form for 2 extra parameters) against scipy.stats.f.sf', () => {
  it('matches for a spread of F and residual degrees of freedom', () => {
    const cases: Array<[number, number]> = [[0.5, 20], [3, 100], [4.7, 544], [10, 544], [25, 300]];
    const expected: number[] = python({ f_sf: cases.map(([f, d2]) => [f, 2, d2]) }).f_sf;
    cases.forEach(([f, d2], i) => {
      // Choose SSEs that give this F with n − 5 = d2.
      const sseExtended = d2;
      const sseSimple = sseExtended + 2 * f;
      const t = fTestTwoExtraParameters(sseSimple, sseExtended, d2 + 5, 5);
      expect(t.fStatistic).toBeCloseTo(f, 12);
      expect(Math.abs(t.pValue / expected[i] - 1)).toBeLessThan(1e-10);
    });
  });
});
