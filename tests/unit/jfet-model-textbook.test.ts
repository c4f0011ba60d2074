/**
 * Derived-figure and series-resistance functions against textbook worked examples
 * (Boylestad, Electronic Devices and Circuit Theory), plus the analytic partials against
 * finite differences (derived) and the model card text.
 */
import { describe, expect, it } from 'vitest';
import { gfsAtZeroVgsS, gmAtCurrentS, idssA, intrinsicDrainCurrentA, type JfetParams } from '~/core/jfet-model.ts';
import { deriveFigures } from '~/core/fit/derived-figures.ts';
import { PARTIALS_LENGTH, intrinsicCurrentWithPartials } from '~/core/fit/level1-partials.ts';
import { formatModelCard, modelCardName } from '~/core/fit/model-card.ts';
import { SERIES_PARTIALS_LENGTH, drainCurrentA, seriesCurrentWithPartials } from '~/core/fit/series-resistance.ts';

/** A square-law part from datasheet IDSS and VP: BETA = IDSS/VP², λ = 0 (derived). */
const fromDatasheet = (idss: number, vp: number, rsOhm = 0): JfetParams => ({
  vtoV: vp, betaAPerV2: idss / (vp * vp), lambdaPerV: 0, rsOhm, rdOhm: 0,
});

describe('Boylestad worked examples', () => {
  const part = fromDatasheet(8e-3, -4);
  it('IDSS 8 mA, VP −4 V: gm0 = 4 mS (Boylestad)', () => {
    expect(gfsAtZeroVgsS(part, 10)).toBeCloseTo(4e-3, 12);
    const d = deriveFigures(part, new Float64Array(25), 10);
    expect(d.gfsS.value).toBeCloseTo(4e-3, 9);
    expect(d.idssA.value).toBeCloseTo(8e-3, 12);
  });
  it('IDSS 8 mA, VP −4 V: gm = 2.5 mS at VGS = −1.5 V (Boylestad)', () => {
    const id = intrinsicDrainCurrentA(part, -1.5, 10);
    expect(gmAtCurrentS(part, id, 10)).toBeCloseTo(2.5e-3, 12);
  });
  it('self-bias IDSS 6 mA, VP −3 V, RS 1.6 kΩ: ID ≈ 1.08 mA, VGS ≈ −1.73 V (Boylestad)', () => {
    // Gate at ground: the series-resistance solution is the self-bias point.
    const id = drainCurrentA(fromDatasheet(6e-3, -3, 1600), 0, 10);
    expect(id).toBeCloseTo(1.08e-3, 5);
    expect(-id * 1600).toBeCloseTo(-1.73, 2);
  });
});

describe('analytic partials match central differences (derived)', () => {
  const cases: Array<[number, number]> = [[-0.5, 0.4], [-0.5, 6], [0, 1], [-1, -0.7], [0.2, 12]];
  it.each(cases)('intrinsic at VGS %f, VDS %f', (vgs, vds) => {
    const theta = [-2.1, 1.3e-3, 0.012, vgs, vds];
    const out = new Float64Array(PARTIALS_LENGTH);
    intrinsicCurrentWithPartials(theta[0], theta[1], theta[2], theta[3], theta[4], out);
    const tmp = new Float64Array(PARTIALS_LENGTH);
    theta.forEach((v, k) => {
      const h = 1e-6 * Math.max(Math.abs(v), 1e-3);
      const up = theta.slice(); up[k] += h;
      const dn = theta.slice(); dn[k] -= h;
      const num = (intrinsicCurrentWithPartials(up[0], up[1], up[2], up[3], up[4], tmp) -
        intrinsicCurrentWithPartials(dn[0], dn[1], dn[2], dn[3], dn[4], tmp)) / (2 * h);
      expect(out[k]).toBeCloseTo(num, 8);
    });
  });
  it.each(cases)('with RS 30 Ω, RD 50 Ω at VGS %f, VDS %f', (vgs, vds) => {
    const theta = [-2.1, 1.3e-3, 0.012, 30, 50];
    const out = new Float64Array(SERIES_PARTIALS_LENGTH);
    const s = new Float64Array(PARTIALS_LENGTH);
    const id = (t: number[]) => seriesCurrentWithPartials(t[0], t[1], t[2], t[3], t[4], vgs, vds, 0, new Float64Array(SERIES_PARTIALS_LENGTH), s);
    seriesCurrentWithPartials(theta[0], theta[1], theta[2], theta[3], theta[4], vgs, vds, 0, out, s);
    const slots = [0, 1, 2, 5, 6];
    theta.forEach((v, k) => {
      const h = 1e-6 * Math.max(Math.abs(v), 1e-3);
      const up = theta.slice(); up[k] += h;
      const dn = theta.slice(); dn[k] -= h;
      expect(out[slots[k]]).toBeCloseTo((id(up) - id(dn)) / (2 * h), 8);
    });
  });
});

describe('derived figures', () => {
  it('reduce to the closed forms of the brief when RS = RD = 0 (derived)', () => {
    const p: JfetParams = { vtoV: -2.1, betaAPerV2: 1.3e-3, lambdaPerV: 0.012, rsOhm: 0, rdOhm: 0 };
    const d = deriveFigures(p, new Float64Array(25), 10);
    expect(d.idssA.value).toBeCloseTo(idssA(p, 10), 14);
    expect(d.gosS.value).toBeCloseTo(p.lambdaPerV * p.betaAPerV2 * p.vtoV ** 2, 12);
    expect(d.rdsOnOhm.value).toBeCloseTo(1 / (2 * 1.3e-3 * 2.1), 9);
    // Error propagation: only VTO uncertain, σ = 10 mV → σ(IDSS) = |∂IDSS/∂VTO|·σ.
    const cov = new Float64Array(25);
    cov[0] = 1e-4;
    const withError = deriveFigures(p, cov, 10);
    expect(withError.idssA.standardError).toBeCloseTo(2 * 1.3e-3 * 2.1 * 1.12 * 0.01, 9);
    expect(withError.vpV.standardError).toBeCloseTo(0.01, 9);
  });
});

describe('SPICE model card', () => {
  const p: JfetParams = { vtoV: -2.1, betaAPerV2: 1.3e-3, lambdaPerV: 0.012, rsOhm: 25, rdOhm: 0 };
  it('writes an NJF card named by the sanitized serial', () => {
    expect(formatModelCard({ serial: 'LOT 7/A-12', channel: 'n', params: p })).toMatchInlineSnapshot(
      `".model J_LOT_7_A_12 NJF(VTO=-2.1 BETA=0.0013 LAMBDA=0.012 RS=25 RD=0)"`,
    );
  });
  it('keeps VTO negative in a PJF card (SPICE convention) and adds TNOM', () => {
    expect(formatModelCard({ serial: 'P1', channel: 'p', params: p, temperatureC: 25 })).toBe(
      '.model J_P1 PJF(VTO=-2.1 BETA=0.0013 LAMBDA=0.012 RS=25 RD=0 TNOM=25)',
    );
    expect(modelCardName('  ')).toBe('J_UNNAMED');
  });
});
