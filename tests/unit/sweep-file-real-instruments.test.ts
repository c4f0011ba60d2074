import { describe, expect, it } from 'vitest';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { intrinsicDrainCurrentA, type JfetParams } from '~/core/jfet-model';
import { seededRandom } from '~/core/random/seeded-random';
import { parseSweepFile, SweepFileError, type ParsedSweepPart } from '~/core/sweep-file';

/**
 * Files as real curve tracers write them (the three cases), each of which must parse
 * and fit. Currents come from the SPICE level-1 model (src/core/jfet-model.ts, checked against
 * ngspice in fit-ngspice.test.ts) plus what real instruments add: Gaussian noise and an
 * offset of a 12-bit range, gate-diode current on forward gate steps, and curves cut short
 * by a power limit. The parameters must come back within a few standard errors (derived).
 */

/** Seeded normal deviates (Box–Muller on the seeded generator), so every run sees the same noise. */
function normals(seed: number): () => number {
  const uniform = seededRandom(seed);
  return () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
}

const CARD: JfetParams = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.02, rsOhm: 0, rdOhm: 0 };
const IDSS_A = CARD.betaAPerV2 * CARD.vtoV ** 2;

function longFile(rows: [number, number, number][], serial = 'JX-0901'): string {
  return [`# serial: ${serial}`, 'vgs (V),vds (V),id (A)', ...rows.map((r) => r.map((v) => Number(v.toPrecision(7))).join(','))].join('\n') + '\n';
}

function fit(part: ParsedSweepPart, card: JfetParams) {
  const result = fitCurveFamily({ curves: part.curves.map((c) => ({ vgsV: c.vgsV, points: { vdsV: c.points.vdsV, idA: c.points.idA } })) }, { vdsTestV: 10 });
  if (result.status !== 'fitted') throw new Error(`not fitted: ${result.flags.map((f) => f.message).join(' ')}`);
  // Within 2 % of the card: the noise below moves VTO and BETA by well under 1 % (derived from
  // the fitted standard errors, which the fit reports).
  expect(result.parameters.vtoV.value).toBeCloseTo(card.vtoV, 1);
  expect(Math.abs(result.parameters.vtoV.value / card.vtoV - 1)).toBeLessThan(0.02);
  expect(Math.abs(result.parameters.betaAPerV2.value / card.betaAPerV2 - 1)).toBeLessThan(0.02);
  return result;
}

describe('real instruments: noise and offset near zero', () => {
  // A 12-bit tracer range on IDSS: one count is IDSS/4096 ≈ 0.024 % of IDSS; noise of 0.3 %
  // of IDSS (the figure) and an offset of −0.1 % make VDS = 0 and cut-off readings
  // slightly negative, which the old fixed 0.1 % rule refused as mixed signs.
  const noise = normals(11);
  const rows: [number, number, number][] = [];
  for (const vgs of [-2.5, -1.5, -1, -0.5, 0]) {
    for (let vds = 0; vds <= 10; vds += 0.5) rows.push([vgs, vds, intrinsicDrainCurrentA(CARD, vgs, vds) + IDSS_A * (0.003 * noise() - 0.001)]);
  }
  const text = longFile(rows);

  it('parses (no sign conflict) and fits to the card', () => {
    const negatives = rows.filter((r) => r[2] < 0).length;
    expect(negatives).toBeGreaterThan(10);
    const part = parseSweepFile({ text, fileName: 'noisy.csv', byteLength: text.length }).parts[0];
    expect(part.notes).toEqual([]);
    fit(part, CARD);
  });

  it('still refuses a file whose bulk has both signs, naming the line', () => {
    // Same file with the VGS = -0.5 V curve negated: a real conflict, far above the noise.
    const flipped = longFile(rows.map((r) => (r[0] === -0.5 ? [r[0], r[1], -r[2]] : r)));
    try {
      parseSweepFile({ text: flipped, fileName: 'flipped.csv', byteLength: flipped.length });
      throw new Error('accepted');
    } catch (error) {
      expect(error).toBeInstanceOf(SweepFileError);
      expect((error as SweepFileError).code).toBe('mixed_signs');
      expect((error as SweepFileError).message).toMatch(/^flipped\.csv, line \d+ \(ID\): ID is positive on line \d+ and negative on line \d+ \(currents within the part's noise floor, [\d.]+ µA, may have either sign\)/);
    }
  });
});

describe('real instruments: gate leakage on forward gate steps', () => {
  // Steps up to +0.15 and +0.3 V: the gate diode conducts, and the drain reads −5 and −14 µA at
  // VDS = 0 (the measured figures), with noise of 0.02 % of IDSS (about one count of a
  // 12-bit range). Those two points are left out of the fit, with a note.
  const noise = normals(23);
  const rows: [number, number, number][] = [];
  const leakA: Record<string, number> = { '0.15': -5e-6, '0.3': -14e-6 };
  for (const vgs of [-1.5, -1, -0.5, 0, 0.15, 0.3]) {
    for (let vds = 0; vds <= 10; vds += 0.5) {
      const id = vds === 0 && leakA[String(vgs)] !== undefined ? leakA[String(vgs)] : intrinsicDrainCurrentA(CARD, vgs, vds) + IDSS_A * 0.0002 * noise();
      rows.push([vgs, vds, id]);
    }
  }
  const text = longFile(rows, 'JX-0902');

  it('recognises the leak points, leaves them out, says so, and fits', () => {
    const part = parseSweepFile({ text, fileName: 'forward.csv', byteLength: text.length }).parts[0];
    expect(part.notes.map((n) => [n.code, n.vgsV])).toEqual([
      ['gate_leakage', 0.15],
      ['gate_leakage', 0.3],
    ]);
    expect(part.notes[1].message).toBe(
      'Gate step VGS = 0.3 V forward-biases the gate: ID at VDS = 0 reads -14 µA (line 108), gate-diode current rather than drain current; left out of the fit.',
    );
    const forward = part.curves.find((c) => c.vgsV === 0.3)!;
    expect(forward.points.vdsV[0]).toBe(0.5);
    expect(forward.points.idA.every((i) => i > 0)).toBe(true);
    fit(part, CARD);
  });

  it('does not take a large negative current on a reverse step for leakage', () => {
    const bad = longFile(rows.map((r) => (r[0] === -1 && r[1] === 0 ? [r[0], r[1], -0.2e-3] : r)), 'JX-0903');
    expect(() => parseSweepFile({ text: bad, fileName: 'reverse.csv', byteLength: bad.length })).toThrow(/ID is positive on line \d+ and negative on line \d+/);
  });
});

describe('real instruments: curves cut short by a power limit', () => {
  // A high-IDSS part (VTO −3.5 V, BETA 4 mA/V²: IDSS ≈ 49 mA) swept to 20 V with a 0.27 W
  // limit: the tracer stops each curve once VDS·ID would pass it, so VGS = 0 keeps 6 points
  // (VDS 0…5 V), as in the published family.
  const card: JfetParams = { vtoV: -3.5, betaAPerV2: 4e-3, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };
  const rows: [number, number, number][] = [];
  for (const vgs of [-3, -2.5, -2, -1.5, -1, -0.5, 0]) {
    for (let vds = 0; vds <= 20; vds += 1) {
      const id = intrinsicDrainCurrentA(card, vgs, vds);
      if (vds * id > 0.27) break;
      rows.push([vgs, vds, id]);
    }
  }
  const text = longFile(rows, 'JX-0904');

  it('keeps the short curves with a note each, and fits', () => {
    const part = parseSweepFile({ text, fileName: 'power-limited.csv', byteLength: text.length }).parts[0];
    const short = part.notes.filter((n) => n.code === 'short_curve');
    expect(short.length).toBeGreaterThanOrEqual(1);
    const top = part.curves.find((c) => c.vgsV === 0)!;
    expect(top.points.vdsV.length).toBe(6);
    expect(short.find((n) => n.vgsV === 0)!.message).toBe(
      'Gate step VGS = 0 V has only 6 points, up to VDS = 5 V where the other curves reach 20 V: cut short, most likely by the tracer\'s power or current limit. Its points are kept in the fit.',
    );
    expect(part.curves.length).toBe(7);
    fit(part, card);
  });

  it('drops a curve that has only VDS = 0 points, with a note, and keeps the file', () => {
    const withStub = longFile([...rows, [0.2, 0, 0]], 'JX-0905');
    const part = parseSweepFile({ text: withStub, fileName: 'stub.csv', byteLength: withStub.length }).parts[0];
    expect(part.curves.some((c) => c.vgsV === 0.2)).toBe(false);
    expect(part.notes.find((n) => n.code === 'short_curve_dropped')!.message).toBe(
      'Gate step VGS = 0.2 V has only 1 point, all at VDS = 0, which tell the fit nothing; the curve was left out.',
    );
  });
});
