import { describe, expect, it } from 'vitest';
import { gfsAtZeroVgsS, idssA, type JfetParams } from '~/core/jfet-model';
import {
  commonSourceGain,
  EstimateInputError,
  paramsFromIdssVp,
  solveSelfBias,
  sourceResistorForCurrent,
} from '~/core/estimates';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('Boylestad, Electronic Devices and Circuit Theory (worked examples)', () => {
  it('self-bias: IDSS 6 mA, VP −3 V, RS 1.6 kΩ → ID ≈ 1.08 mA, VGS ≈ −1.73 V', () => {
    const r = solveSelfBias(paramsFromIdssVp(6e-3, -3), { rsOhm: 1600, vdsV: 10 });
    expect(Math.abs(r.idA - 1.08e-3)).toBeLessThan(0.005e-3);
    expect(Math.abs(r.vgsV - -1.73)).toBeLessThan(0.005);
    expect(r.saturated).toBe(true);
  });

  it('IDSS 8 mA, VP −4 V → gm0 = 4 mS and gm = 2.5 mS at VGS = −1.5 V', () => {
    const p = paramsFromIdssVp(8e-3, -4);
    expect(gfsAtZeroVgsS(p, 0)).toBeCloseTo(4e-3, 15);
    // VGS = −1.5 V carries 8 mA·(1 − 1.5/4)² = 3.125 mA (square law), i.e. RS = 480 Ω self-bias (derived).
    const byResistor = solveSelfBias(p, { rsOhm: 480, vdsV: 10 });
    expect(byResistor.vgsV).toBeCloseTo(-1.5, 12);
    expect(byResistor.gmS).toBeCloseTo(2.5e-3, 12);
    const byCurrent = sourceResistorForCurrent(p, 3.125e-3, 10);
    expect(byCurrent.rsOhm).toBeCloseTo(480, 9);
    expect(byCurrent.gmS).toBeCloseTo(2.5e-3, 12);
  });

  it('fixed-bias gain: gm 1.875 mS, rd 25 kΩ (yos 40 µS), RD 2 kΩ → Av −3.47 with rd, −3.75 without (from memory)', () => {
    const gmS = gfsAtZeroVgsS(paramsFromIdssVp(10e-3, -8), 0) * (1 - -2 / -8); // IDSS 10 mA, VP −8 V, VGS −2 V
    expect(gmS).toBeCloseTo(1.875e-3, 15);
    expect(commonSourceGain({ gmS, gosS: 40e-6, drainLoadOhm: 2000 })).toBeCloseTo(-3.47, 2);
    expect(commonSourceGain({ gmS, gosS: 0, drainLoadOhm: 2000 })).toBeCloseTo(-3.75, 12);
  });
});

// ngspice-39 (Debian), .model JX NJF(VTO=-2.5 BETA=1.2e-3 LAMBDA=0.02 RS=15 RD=20), set numdgt=10.
const part: JfetParams = { vtoV: -2.5, betaAPerV2: 1.2e-3, lambdaPerV: 0.02, rsOhm: 15, rdOhm: 20 };

describe('against ngspice operating points and AC gain', () => {
  it('self-bias with λ and series resistance: .op with VDS held at 10 V, RS 680 Ω', () => {
    // J1 d 0 s JX; R1 s 0 680; Vd d x DC 10; E1 x 0 s 0 1 → i(Vd) = −1.930295454e-3, v(s) = 1.3126009004
    const r = solveSelfBias(part, { rsOhm: 680, vdsV: 10 });
    expect(rel(r.idA, 1.930295454e-3)).toBeLessThan(1e-6);
    expect(rel(r.vgsV, -1.3126009004)).toBeLessThan(1e-6);
    expect(r.saturated).toBe(true);
  });

  it('source resistor for the current ngspice found brings back RS = 680 Ω', () => {
    const r = sourceResistorForCurrent(part, 1.930295454e-3, 10);
    expect(rel(r.rsOhm, 680)).toBeLessThan(1e-5);
  });

  it('gain into RD 2.2 kΩ from VDD 15 V, bypassed (1 kF across RS) and unbypassed, .ac at 1 kHz', () => {
    // .op: v(d) − v(s) = 9.4560395847 V; .ac: vr(d) = −6.494985540 (bypassed), −2.145554267 (unbypassed)
    const r = solveSelfBias(part, { rsOhm: 680, vdsV: 9.4560395847, drainLoadOhm: 2200 });
    expect(rel(r.idA, 1.924986258e-3)).toBeLessThan(1e-6);
    expect(rel(r.gain!.bypassed, -6.49498554)).toBeLessThan(1e-6);
    expect(rel(r.gain!.unbypassed, -2.145554267)).toBeLessThan(1e-6);
  });
});

describe('contracts', () => {
  it('paramsFromIdssVp gives back the IDSS at its test VDS (jfet-model idssA; derived)', () => {
    const p = paramsFromIdssVp(9e-3, 2.2, 0.015, 15);
    expect(p.vtoV).toBe(-2.2);
    expect(idssA(p, 15)).toBeCloseTo(9e-3, 15);
  });

  it('returns VGS in datasheet sign for a p-channel part', () => {
    const r = solveSelfBias(paramsFromIdssVp(6e-3, 3), { rsOhm: 1600, vdsV: -10, channel: 'p' });
    expect(r.vgsV).toBeGreaterThan(1.72);
  });

  it('warns when VDS is too small for saturation', () => {
    const r = solveSelfBias(paramsFromIdssVp(6e-3, -3), { rsOhm: 100, vdsV: 0.5 });
    expect(r.saturated).toBe(false);
    expect(r.warnings[0]).toMatch(/out of saturation/);
  });

  it('refuses a target current at or above IDSS and names the field', () => {
    const p = paramsFromIdssVp(6e-3, -3);
    expect(() => sourceResistorForCurrent(p, 6e-3, 10)).toThrow(EstimateInputError);
    const err = (() => {
      try {
        sourceResistorForCurrent(p, 7e-3, 10);
      } catch (e) {
        return e;
      }
    })();
    expect(err).toBeInstanceOf(EstimateInputError);
    expect((err as EstimateInputError).issues.map((i) => i.field)).toEqual(['idA']);
    expect(() => solveSelfBias(p, { rsOhm: -1, vdsV: 10 })).toThrow(/rsOhm: expected a source resistor ≥ 0 Ω, got -1/);
  });
});
