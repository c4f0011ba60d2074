/**
 * The solver hands ml-levenberg-marquardt a compressed problem (q + 1 rows with the full
 * problem's normal matrix, gradient and sum of squares). Levenberg–Marquardt steps depend on
 * the data only through JᵀJ, Jᵀr and the SSE (Moré, "The Levenberg–Marquardt algorithm:
 * implementation and theory", 1978, eq. 2.2 — from memory), so the compressed and the
 * full hand-off must give the same iterates. Checked on the ngspice families (Debian
 * ngspice, tests/fixtures/ngspice), clean and with 0.3 % noise, level-1 and RS/RD.
 */
import { describe, expect, it } from 'vitest';
import { fitCurveFamily } from '~/core/fit/fit-curve-family.ts';
import { fixtureNames, maxCurrentA, readCommittedFamily, withNoise } from '../fixtures/ngspice/ngspice-fixtures.ts';

const cases = fixtureNames().flatMap((name) => [
  { name, noise: 0 },
  { name, noise: 0.003 },
]);

describe.each(cases)('$name, noise $noise of IDSS', ({ name, noise }) => {
  const clean = readCommittedFamily(name);
  const family = noise ? withNoise(clean, noise * maxCurrentA(clean), 7) : clean;

  it.each(['never', 'always'] as const)('extended=%s: same parameters, errors and iterations', (extended) => {
    const compressed = fitCurveFamily(family, { vdsTestV: 10, extended, solverRows: 'compressed' });
    const full = fitCurveFamily(family, { vdsTestV: 10, extended, solverRows: 'full' });
    // Every committed family fits in both modes; a failure to fit is a failure here.
    if (compressed.status !== 'fitted' || full.status !== 'fitted') {
      throw new Error(`${name}: not fitted (compressed: ${compressed.status}, full: ${full.status})`);
    }
    expect(compressed.model).toBe(full.model);
    // On clean data the last steps move the SSE by amounts at rounding level, where the two
    // hand-offs (JᵀJ summed in another order) may take a different number of them (two more
    // on pjf-medium); the parameters still agree. With noise every step is decided well
    // above rounding, so the counts are equal.
    expect(Math.abs(compressed.quality.iterations - full.quality.iterations)).toBeLessThanOrEqual(noise ? 0 : 2);
    for (const key of ['vtoV', 'betaAPerV2', 'lambdaPerV', 'rsOhm', 'rdOhm'] as const) {
      const a = compressed.parameters[key];
      const b = full.parameters[key];
      // Clean data: relative to the value, with a floor of 1 Ω for RS/RD (often near 0).
      const scale = noise ? Math.max(b.standardError, 1e-12) : Math.max(Math.abs(b.value), key === 'rsOhm' || key === 'rdOhm' ? 1 : 1e-3);
      expect(Math.abs(a.value - b.value), key).toBeLessThanOrEqual(1e-6 * scale);
      // Standard errors are finite in every case (0 for RS and RD when the level-1 model holds them at 0).
      expect(Number.isFinite(b.standardError), key).toBe(true);
      expect(Math.abs(a.standardError - b.standardError), key).toBeLessThanOrEqual(1e-6 * b.standardError);
    }
    expect(compressed.flags.map((f) => f.code)).toEqual(full.flags.map((f) => f.code));
  });
});
