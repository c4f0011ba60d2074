import { describe, expect, it } from 'vitest';
import { checkInputsAgainstPart, estimateDefaultsForPart } from '~/core/estimates/defaults-from-part';
import { E24, E96, nearestPreferredValue } from '~/core/estimates/preferred-values';
import { solveSelfBias } from '~/core/estimates/solve-self-bias';
import { paramsFromIdssVp } from '~/core/estimates/params-from-idss-vp';

describe('IEC 60063 E series', () => {
  it('E96 is 10^(i/96) rounded to three figures, every one of its 96 values (IEC 60063; the formula, derived)', () => {
    expect(E96).toHaveLength(96);
    E96.forEach((m, i) => expect(m).toBeCloseTo(Number((10 ** (i / 96)).toPrecision(3)), 10));
  });
  it('E24 has 24 values and departs from the rounded formula at the values the standard keeps (IEC 60063, from memory)', () => {
    expect(E24).toHaveLength(24);
    const departs = E24.filter((m, i) => Math.abs(m - Number((10 ** (i / 24)).toPrecision(2))) > 1e-9);
    expect(departs).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });
  it.each([
    [1712, 'E24', 1800],
    [1712, 'E96', 1690],
    [955, 'E24', 1000],
    [930, 'E24', 910],
    [97.6, 'E24', 100],
    [9.6e3, 'E96', 9.53e3],
    [151, 'E96', 150],
    [152, 'E96', 154],
  ] as const)('nearest to %d Ω in %s is %d Ω', (ohms, series, want) => {
    expect(nearestPreferredValue(ohms, series)).toBe(want);
  });
  it('refuses a value that is not a resistance', () => {
    expect(nearestPreferredValue(0, 'E24')).toBeNull();
    expect(nearestPreferredValue(Number.NaN, 'E96')).toBeNull();
  });
  it('gives the current a preferred resistor sets: Boylestad self-bias example, IDSS 6 mA, VP −3 V, RS 1.6 kΩ → ID ≈ 1.08 mA (textbook worked example)', () => {
    const params = paramsFromIdssVp(6e-3, -3, 0, 0);
    const rs = nearestPreferredValue(1600, 'E24')!;
    expect(rs).toBe(1600);
    expect(solveSelfBias(params, { rsOhm: rs, vdsV: 10 }).idA).toBeCloseTo(1.08e-3, 5);
  });
});

describe('defaults from the part', () => {
  // Square law: ID = IDSS·(1 − VGS/VP)², so VGS = VP/2 gives IDSS/4 (derived).
  it('biases at a quarter of IDSS, VGS0 = VP/2, and keeps LO + RF inside |VP|/2', () => {
    const d = estimateDefaultsForPart({ idssA: 4.4e-3, vpV: -1.19 });
    expect(d.targetCurrentA).toBeCloseTo(1.1e-3, 12);
    expect(Math.abs(d.vgs0V - -1.19 / 2)).toBeLessThanOrEqual(0.005 + 1e-12);
    expect(d.loAmplitudeV + d.rfAmplitudeV).toBeLessThan(1.19 / 2);
    expect(estimateDefaultsForPart({ idssA: 8e-3, vpV: 2.4 }).vgs0V).toBeCloseTo(1.2, 12);
  });
  it('explains a VGS0 past pinch-off for a part with VP −1.19 V (the old fixed −1.78 V)', () => {
    const p = checkInputsAgainstPart({ idssA: 4.2e-3, vpV: -1.19 }, { vgs0V: -1.78 });
    expect(p).toHaveLength(1);
    expect(p[0]).toMatchObject({ field: 'vgs0V', severity: 'error' });
    expect(p[0].message).toBe('VGS0 \u22121.78 V is at or past this part\'s pinch-off (VP \u22121.19 V): the part is cut off. Choose between \u22121.19 V and 0 V, e.g. \u2212590 mV (VP/2).');
  });
  it('explains a target current at or above IDSS and a forward-biased gate', () => {
    expect(checkInputsAgainstPart({ idssA: 4.2e-3, vpV: -1.19 }, { targetCurrentA: 5e-3 })[0].message).toContain("IDSS is 4.20 mA");
    expect(checkInputsAgainstPart({ idssA: 4.2e-3, vpV: 1.19 }, { vgs0V: -0.2 })[0].message).toContain('forward-biases the gate of a P-channel part');
  });
  it('cautions when LO + RF swing past the room VGS0 leaves', () => {
    const p = checkInputsAgainstPart({ idssA: 10e-3, vpV: -3.9 }, { vgs0V: -0.3, loAmplitudeV: 0.4, rfAmplitudeV: 0.132 });
    expect(p).toEqual([expect.objectContaining({ field: 'loAmplitudeV', severity: 'caution' })]);
    expect(checkInputsAgainstPart({ idssA: 10e-3, vpV: -3.9 }, { vgs0V: -1.95, loAmplitudeV: 0.4, rfAmplitudeV: 0.132 })).toEqual([]);
  });
});
