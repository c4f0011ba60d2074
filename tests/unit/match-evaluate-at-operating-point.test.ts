import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  evaluateAtOperatingPoint,
  selfBiasDrainCurrentA,
} from '~/core/match/evaluate-at-operating-point';
import { chooseMatchedSets } from '~/core/match/choose-matched-sets';
import type { JfetParams } from '~/core/jfet-model';
import { requireNgspice } from '../fixtures/ngspice/ngspice-fixtures.ts';

const part = (idssA: number, vtoV: number, extra: Partial<JfetParams> = {}): JfetParams => ({
  vtoV,
  betaAPerV2: idssA / (vtoV * vtoV),
  lambdaPerV: 0,
  rsOhm: 0,
  rdOhm: 0,
  ...extra,
});

function figures(p: JfetParams, op: Parameters<typeof evaluateAtOperatingPoint>[1]) {
  const e = evaluateAtOperatingPoint({ params: p }, op);
  if (!e.usable) throw new Error(e.reason);
  return e.figures;
}

describe('evaluateAtOperatingPoint against textbook worked examples', () => {
  // Boylestad, Electronic Devices and Circuit Theory: IDSS 8 mA, VP −4 V gives gm0 = 4 mS and
  // gm = 2.5 mS at VGS = −1.5 V (textbook worked example).
  const boylestad = part(8e-3, -4);

  it('gm0 at the idss point', () => {
    const f = figures(boylestad, { kind: 'idss', vdsV: 10 });
    expect(f.gmS).toBeCloseTo(4e-3, 9);
    expect(f.vgsV).toBe(0);
    expect(f.idA).toBeCloseTo(8e-3, 12);
    expect(f.vdsSatV).toBeCloseTo(4, 12);
  });

  it('VGS and gm at the current that VGS = −1.5 V gives', () => {
    const idA = 8e-3 * (1 - 1.5 / 4) ** 2; // Shockley's equation, same textbook
    const f = figures(boylestad, { kind: 'current', idA, vdsV: 10 });
    expect(f.vgsV).toBeCloseTo(-1.5, 9);
    expect(f.gmS).toBeCloseTo(2.5e-3, 9);
  });

  // Boylestad self-bias example: IDSS 6 mA, VP −3 V, RS 1.6 kΩ gives ID ≈ 1.08 mA, VGS ≈ −1.73 V.
  it('self-bias settles where the textbook says', () => {
    const f = figures(part(6e-3, -3), { kind: 'self_bias', rsOhm: 1600, vdsV: 10 });
    expect(f.idA).toBeCloseTo(1.08e-3, 5);
    expect(f.vgsV).toBeCloseTo(-1.73, 2);
  });

  it('the bisection path (fitted RS) agrees with the closed form as RS → 0', () => {
    const p = part(6e-3, -3, { lambdaPerV: 0.01 });
    const closed = selfBiasDrainCurrentA(p, 1600, 10);
    const bisected = selfBiasDrainCurrentA({ ...p, rsOhm: 1e-9 }, 1600, 10);
    expect(bisected).toBeCloseTo(closed, 10); // derived: same equation, two solution methods
  });
});

describe('evaluateAtOperatingPoint refuses points a part cannot run at', () => {
  it('a current above IDSS needs a forward-biased gate', () => {
    // Derived from the model: ID > IDSS in saturation needs VGS > 0.
    const e = evaluateAtOperatingPoint({ params: part(0.8e-3, -1) }, { kind: 'current', idA: 1e-3, vdsV: 10 });
    expect(e.usable).toBe(false);
    if (!e.usable) {
      expect(e.code).toBe('forward_gate');
      expect(e.reason).toMatch(/exceeds this part's IDSS \(0\.800 mA/);
    }
  });

  it('a VDS below VGS − VTO leaves the part out of saturation', () => {
    // Derived: IDSS 8 mA, VTO −4 V at 1 mA has VGS − VTO = 4·sqrt(1/8) ≈ 1.41 V > 1 V.
    const e = evaluateAtOperatingPoint({ params: part(8e-3, -4) }, { kind: 'current', idA: 1e-3, vdsV: 1 });
    expect(e.usable).toBe(false);
    if (!e.usable) expect(e.code).toBe('not_saturated');
  });
});

function ngspiceOp(netlist: string, nodes: string[]): Record<string, number> {
  const dir = mkdtempSync(join(tmpdir(), 'sluice-match-'));
  const file = join(dir, 'c.cir');
  writeFileSync(file, `${netlist}\n.control\nop\nprint ${nodes.map((n) => `v(${n})`).join(' ')}\n.endc\n.end\n`);
  // Batch mode exits non-zero when the deck has no .print line; the printed values still count.
  const out = spawnSync('/usr/bin/ngspice', ['-b', file], { encoding: 'utf8', timeout: 15_000 }).stdout;
  const res: Record<string, number> = {};
  for (const n of nodes) {
    const m = out.match(new RegExp(`v\\(${n}\\) = (\\S+)`));
    if (!m) throw new Error(`ngspice gave no v(${n}):\n${out}`);
    res[n] = Number(m[1]);
  }
  return res;
}

const card = (name: string, p: JfetParams) =>
  `.model ${name} NJF (VTO=${p.vtoV} BETA=${p.betaAPerV2} LAMBDA=${p.lambdaPerV} RS=${p.rsOhm} RD=${p.rdOhm})`;

describe('operating figures and the cascode condition against ngspice', () => {
  beforeAll(requireNgspice);
  it('VGS at a forced current, with fitted RS and RD', () => {
    const p: JfetParams = { vtoV: -2.2, betaAPerV2: 1.1e-3, lambdaPerV: 0.015, rsOhm: 35, rdOhm: 20 };
    const f = figures(p, { kind: 'current', idA: 1.5e-3, vdsV: 10 });
    // ngspice: gate grounded, 1.5 mA drawn from the source, drain 10 V above the predicted source.
    const v = ngspiceOp(
      `vgs at current\n${card('JP', p)}\nVD d 0 ${10 - f.vgsV}\nJ1 d 0 s JP\nI1 s 0 1.5m`,
      ['s', 'd'],
    );
    expect(v.d! - v.s!).toBeCloseTo(10, 3);
    expect(f.vgsV).toBeCloseTo(-v.s!, 4);
  });

  it('a valid cascode: the lower sits at VDS = −VGS(upper) and stays saturated', () => {
    const lower: JfetParams = { vtoV: -2, betaAPerV2: 1.25e-3, lambdaPerV: 0.02, rsOhm: 0, rdOhm: 0 };
    const upper: JfetParams = { vtoV: -3.5, betaAPerV2: 1e-3, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };
    const r = chooseMatchedSets({
      candidates: [
        { id: 'L', lotId: null, binCode: null, params: lower },
        { id: 'U', lotId: null, binCode: null, params: upper },
      ],
      operatingPoint: { kind: 'current', idA: 1e-3, vdsV: 10 },
      shape: 'cascode_pair',
      count: 1,
      tolerances: { maxDvgsV: Infinity, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0.3 },
    });
    expect(r.sets).toHaveLength(1);
    const lo = r.sets[0]!.parts.find((x) => x.role === 'lower')!;
    const up = r.sets[0]!.parts.find((x) => x.role === 'upper')!;
    expect(lo.id).toBe('L'); // only this orientation: U as lower needs 1.9 V, L gives 1.1 V
    const predictedD1 = -lo.vgsV + lo.vdsV;
    // ngspice: the upper's VDS set to the 10 V the picker assumes (supply share).
    const v = ngspiceOp(
      `cascode\n${card('JL', lower)}\n${card('JU', upper)}\nVDD d2 0 ${predictedD1 + 10}\n` +
        'J2 d2 s1 d1 JU\nJ1 d1 0 s1 JL\nI1 s1 0 1m',
      ['s1', 'd1'],
    );
    expect(-v.s1!).toBeCloseTo(lo.vgsV, 4); // VGS(lower)
    expect(v.d1! - v.s1!).toBeCloseTo(-up.vgsV, 4); // VDS(lower) = −VGS(upper)
    expect(v.d1! - v.s1!).toBeGreaterThan(-v.s1! - lower.vtoV + 0.3); // saturated, with margin
  });

  it('a refused cascode: ngspice shows the lower out of saturation', () => {
    const p: JfetParams = { vtoV: -1.5, betaAPerV2: 0.5e-3, lambdaPerV: 0.01, rsOhm: 0, rdOhm: 0 };
    const r = chooseMatchedSets({
      candidates: [
        { id: 'A', lotId: null, binCode: null, params: p },
        { id: 'B', lotId: null, binCode: null, params: { ...p, vtoV: -1.55 } },
      ],
      operatingPoint: { kind: 'current', idA: 1e-3, vdsV: 10 },
      shape: 'cascode_pair',
      count: 1,
      tolerances: { maxDvgsV: Infinity, maxGmMismatch: Infinity, maxIdssMismatch: Infinity, cascodeMarginV: 0 },
    });
    expect(r.sets).toHaveLength(0);
    const v = ngspiceOp(
      `cascode refused\n${card('JA', p)}\n${card('JB', { ...p, vtoV: -1.55 })}\nVDD d2 0 15\n` +
        'J2 d2 s1 d1 JB\nJ1 d1 0 s1 JA\nI1 s1 0 1m',
      ['s1', 'd1'],
    );
    expect(v.d1! - v.s1!).toBeLessThan(-v.s1! - p.vtoV); // VDS(lower) < VGS − VTO: linear region
  });
});
