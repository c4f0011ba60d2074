/**
 * Operating-point figures read from the measurements, checked against ngspice (Debian package
 * `ngspice`) on parts that are not square law: JFET level 2 (Parker–Skellern) with Q 1.8–2.5
 * (some with LFGAM and DELTA), and level 1 with the doping-tail parameter B 0.45–0.9, N- and
 * P-channel, clean and with 0.5 % noise of reading plus a 1 µA offset. The truth is ngspice's
 * own DC operating point of a current-forced circuit (see nonsquare-parts.ts), never the
 * level-1 formulas. Also square-law (level-1, B = 1) parts, where the fitted model is exact.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import type { CurveFamily } from '~/core/fit/definitions';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import { toNEquivalent, vgsAtCurrentV } from '~/core/jfet-model';
import { partOperatingFigures, type PartBasis } from '~/core/operating-point/part-operating-figures';
import { operatingTableFromBytes, operatingTableToBytes } from '~/core/operating-point/operating-table';
import {
  nonSquareParts,
  simulateParts,
  squareLawParts,
  withReadingNoise,
  type SimulatedPart,
} from '../fixtures/ngspice/nonsquare-parts';

interface Reading {
  name: string;
  channel: 'n' | 'p';
  noisy: boolean;
  /** Measured-data VGS minus the truth (V, N-equivalent). */
  errorV: number;
  sigmaV: number;
  source: string;
  /** Level-1 model VGS minus the truth (V). */
  modelErrorV: number;
  idssRelError: number;
  gmRelError: number;
}

function basisOf(family: CurveFamily): { basis: PartBasis; flags: string[] } {
  const fit = fitCurveFamily(family, { vdsTestV: 10 });
  if (fit.status !== 'fitted') throw new Error('not fitted');
  const p = fit.parameters;
  const params = { vtoV: p.vtoV.value, betaAPerV2: p.betaAPerV2.value, lambdaPerV: p.lambdaPerV.value, rsOhm: p.rsOhm.value, rdOhm: p.rdOhm.value };
  // Through the stored form, as the server reads it.
  const table = fit.operatingTable ? operatingTableFromBytes(operatingTableToBytes(fit.operatingTable)) : null;
  return { basis: { params, table, modelSigmaV: fit.modelVgsSigmaV }, flags: fit.flags.map((f) => f.code) };
}

function readAll(parts: SimulatedPart[]): Reading[] {
  const out: Reading[] = [];
  for (const noisy of [false, true]) {
    parts.forEach((part, i) => {
      const family = noisy ? withReadingNoise(part.family, 1000 + i) : part.family;
      const { basis } = basisOf(family);
      const truthN = toNEquivalent(part.channel, part.at1mA.vgsV, 0).vgsV;
      const e = partOperatingFigures(basis, { kind: 'current', idA: 1e-3, vdsV: 10 });
      const idss = partOperatingFigures(basis, { kind: 'idss', vdsV: 10 });
      if (!e.usable || !idss.usable) throw new Error(`${part.name}: not usable`);
      out.push({
        name: part.name,
        channel: part.channel,
        noisy,
        errorV: e.figures.vgsV - truthN,
        sigmaV: e.figures.vgsSigmaV,
        source: e.figures.source,
        modelErrorV: vgsAtCurrentV(basis.params, 1e-3, 10) - truthN,
        idssRelError: idss.figures.idssA / part.idss10A - 1,
        gmRelError: e.figures.gmS / part.at1mA.gmS - 1,
      });
    });
  }
  return out;
}

const p95 = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(0.95 * s.length))]!;
};

function pairErrors(rows: Reading[], pick: (r: Reading) => number): number[] {
  const d: number[] = [];
  for (let a = 0; a < rows.length; a++)
    for (let b = a + 1; b < rows.length; b++) if (rows[a]!.channel === rows[b]!.channel) d.push(Math.abs(pick(rows[a]!) - pick(rows[b]!)));
  return d;
}

let nonSquare: Reading[];
let square: Reading[];
beforeAll(() => {
  nonSquare = readAll(simulateParts(nonSquareParts(), { fractions: false }));
  square = readAll(simulateParts(squareLawParts(), { fractions: false }));
}, 120_000);

describe.each([
  ['clean', false],
  ['0.5 % noise of reading + 1 µA offset', true],
])('non-square-law parts from ngspice, %s', (_label, noisy) => {
  const rows = () => nonSquare.filter((r) => r.noisy === noisy);

  it('reads every part from its measurements at 1 mA / 10 V, where the model alone is tens of mV off', () => {
    expect(rows().length).toBe(48);
    expect(rows().every((r) => r.source === 'measured')).toBe(true);
    // The level-1 extrapolation misses by tens of millivolts on these parts (why this exists).
    expect(Math.max(...rows().map((r) => Math.abs(r.modelErrorV)))).toBeGreaterThan(0.02);
  });

  it('VGS at 1 mA / 10 V within 3 mV of ngspice for every part', () => {
    expect(Math.max(...rows().map((r) => Math.abs(r.errorV)))).toBeLessThan(0.003);
  });

  it('ΔVGS error over all same-channel pairs: 95th percentile ≤ 1.5 mV', () => {
    const d = pairErrors(rows(), (r) => r.errorV);
    expect(d.length).toBe(2 * (24 * 23) / 2);
    expect(p95(d)).toBeLessThanOrEqual(0.0015);
  });

  it('IDSS at 10 V within 0.5 % of ngspice', () => {
    expect(Math.max(...rows().map((r) => Math.abs(r.idssRelError)))).toBeLessThan(0.005);
  });

  it('the stated uncertainty covers the truth: within 2 σ for at least 90 % of parts', () => {
    const covered = rows().filter((r) => Math.abs(r.errorV) <= 2 * r.sigmaV).length;
    expect(covered / rows().length).toBeGreaterThanOrEqual(0.9);
  });

  it('gm at 1 mA within 3 % of ngspice’s device gm', () => {
    expect(Math.max(...rows().map((r) => Math.abs(r.gmRelError)))).toBeLessThan(0.03);
  });
});

describe('square-law (level-1, B = 1) parts from ngspice: nothing gets worse than the fitted model', () => {
  it('clean: the measured reading is as exact as the model (both within 0.1 mV)', () => {
    const clean = square.filter((r) => !r.noisy);
    expect(Math.max(...clean.map((r) => Math.abs(r.modelErrorV)))).toBeLessThan(1e-4);
    expect(Math.max(...clean.map((r) => Math.abs(r.errorV)))).toBeLessThan(1e-4);
  });

  it('noisy: pair ΔVGS error p95 no worse than the model’s', () => {
    const noisy = square.filter((r) => r.noisy);
    expect(p95(pairErrors(noisy, (r) => r.errorV))).toBeLessThanOrEqual(p95(pairErrors(noisy, (r) => r.modelErrorV)) + 1e-4);
    const covered = noisy.filter((r) => Math.abs(r.errorV) <= 2 * r.sigmaV).length;
    expect(covered / noisy.length).toBeGreaterThanOrEqual(0.9);
  });
});
