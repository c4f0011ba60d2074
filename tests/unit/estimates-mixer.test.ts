import { describe, expect, it } from 'vitest';
import {
  EstimateInputError,
  estimateMixer,
  type MixerEstimate,
  type MixerEstimateInput,
  type MixerProductName,
} from '~/core/estimates';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const product = (m: MixerEstimate, name: MixerProductName) => m.products.find((p) => p.name === name)!;

/** Peak amplitude of bin k of x (one common period sampled N times); bin 0 gives the mean. */
function dftAmplitude(x: readonly number[], k: number): number {
  let re = 0;
  let im = 0;
  const n = x.length;
  for (let i = 0; i < n; i++) {
    const phase = (2 * Math.PI * k * i) / n;
    re += x[i] * Math.cos(phase);
    im -= x[i] * Math.sin(phase);
  }
  const mag = Math.hypot(re, im) / n;
  return k === 0 ? mag : 2 * mag;
}

describe('closed forms against a DFT of the sampled square law (derived check)', () => {
  const f0 = 1e5;
  const cases: [string, MixerEstimateInput][] = [
    ['LO on source, RF on gate', { channel: 'n', idssA: 10.12e-3, vpV: -3.9, vgs0V: -1.78, loadOhm: 48, lo: { amplitudeV: 0.4, terminal: 'source', frequencyHz: 7 * f0 }, rf: { amplitudeV: 0.132, terminal: 'gate', frequencyHz: 5 * f0 } }],
    ['both on the gate, with leaks', { channel: 'n', idssA: 6e-3, vpV: -2.5, vgs0V: -1.1, loadOhm: 200, lo: { amplitudeV: 0.3, terminal: 'gate', frequencyHz: 7 * f0, leakV: 0.02 }, rf: { amplitudeV: 0.05, terminal: 'gate', frequencyHz: 5 * f0, leakV: 0.004 } }],
    ['p-channel, LO on source with leak', { channel: 'p', idssA: 12e-3, vpV: 3.2, vgs0V: 1.5, loadOhm: 50, lo: { amplitudeV: 0.5, terminal: 'source', frequencyHz: 7 * f0, leakV: 0.01 }, rf: { amplitudeV: 0.2, terminal: 'source', frequencyHz: 5 * f0, leakV: 0.03 } }],
  ];
  const bins: Record<MixerProductName, number> = { rf: 5, lo: 7, lo_minus_rf: 2, lo_plus_rf: 12, two_lo: 14, two_rf: 10 };

  it.each(cases)('%s: every product to 1e-6, nothing at third order', (_, input) => {
    const m = estimateMixer(input);
    const n = 1024;
    const samples: number[] = [];
    for (let i = 0; i < n; i++) {
      const t = i / (n * f0);
      const lo = input.lo.amplitudeV * Math.cos(2 * Math.PI * input.lo.frequencyHz * t);
      const rf = input.rf.amplitudeV * Math.cos(2 * Math.PI * input.rf.frequencyHz * t);
      const loLeak = (input.lo.leakV ?? 0) * Math.cos(2 * Math.PI * input.lo.frequencyHz * t);
      const rfLeak = (input.rf.leakV ?? 0) * Math.cos(2 * Math.PI * input.rf.frequencyHz * t);
      // Terminal voltages (gate bias VGS0, source at 0), each drive's leak on the other terminal.
      let vg = input.vgs0V;
      let vs = 0;
      if (input.lo.terminal === 'gate') { vg += lo; vs += loLeak; } else { vs += lo; vg += loLeak; }
      if (input.rf.terminal === 'gate') { vg += rf; vs += rfLeak; } else { vs += rf; vg += rfLeak; }
      samples.push(input.idssA * (1 - (vg - vs) / input.vpV) ** 2);
    }
    for (const p of m.products) {
      expect(p.frequencyHz).toBeCloseTo(bins[p.name] * f0, 6);
      expect(rel(p.currentA, dftAmplitude(samples, bins[p.name]))).toBeLessThan(1e-6);
    }
    expect(rel(m.dcDrainCurrentA, dftAmplitude(samples, 0))).toBeLessThan(1e-9);
    for (const k of [3, 19, 21]) expect(dftAmplitude(samples, k)).toBeLessThan(1e-12 * input.idssA);
    expect(m.warnings).toEqual([]);
  });
});

describe('bench check (common practice, no published source): LO fundamental measured at −28.4 dBV', () => {
  const bench: MixerEstimateInput = {
    channel: 'n', idssA: 10.12e-3, vpV: -3.9, vgs0V: -1.78, loadOhm: 48,
    lo: { amplitudeV: 0.4, terminal: 'source', frequencyHz: 7e6 },
    rf: { amplitudeV: 0.132, terminal: 'gate', frequencyHz: 5e6 },
  };

  it('lands within 0.2 dB without leak correction (estimate −28.336 dBV)', () => {
    const lo = product(estimateMixer(bench), 'lo');
    expect(Math.abs(lo.dbv! - -28.4)).toBeLessThan(0.2);
  });

  it('lands within 0.2 dB with 3.6 mV LO leak onto the gate and 17.9 mV RF onto the source (−28.414 dBV)', () => {
    const m = estimateMixer({ ...bench, lo: { ...bench.lo, leakV: 0.0036 }, rf: { ...bench.rf, leakV: 0.0179 } });
    expect(Math.abs(product(m, 'lo').dbv! - -28.4)).toBeLessThan(0.2);
    // ngspice-39 transient + fourier of the same circuit (NJF VTO=-3.9 BETA=6.6535e-4, 48 Ω load,
    // the four SIN sources on gate and source): v(d) at 7 MHz 0.05367736537 V, 5 MHz 0.01545053793 V,
    // 2 MHz 0.001444480746 V, 12 MHz 0.001444472696 V, 14 MHz 0.002509148963 V, 10 MHz 0.0002078892884 V.
    const spice: [MixerProductName, number][] = [
      ['lo', 0.05367736537], ['rf', 0.01545053793], ['lo_minus_rf', 0.001444480746],
      ['lo_plus_rf', 0.001444472696], ['two_lo', 0.002509148963], ['two_rf', 0.0002078892884],
    ];
    for (const [name, v] of spice) expect(rel(product(m, name).outputPeakV, v)).toBeLessThan(1e-4);
  });
});

describe('load, levels and conversion', () => {
  // 1 V peak = 0.7071 V RMS = −3.01 dBV; 1 V peak across 500 Ω = 1 mW = 0 dBm (common practice).
  const base: MixerEstimateInput = {
    channel: 'n', idssA: 10e-3, vpV: -4, vgs0V: -2, loadOhm: 500,
    lo: { amplitudeV: 0.8, terminal: 'gate', frequencyHz: 10e6 },
    rf: { amplitudeV: 0.1, terminal: 'gate', frequencyHz: 9e6 },
  };

  it('gives dBV and dBm of a 1 V-peak product (LO current 2·10 mA·0.5·0.8/4 = 2 mA, derived)', () => {
    const lo = product(estimateMixer(base), 'lo');
    expect(lo.currentA).toBeCloseTo(2e-3, 15);
    expect(lo.dbv).toBeCloseTo(-3.0103, 4);
    expect(lo.dbm).toBeCloseTo(0, 10);
  });

  it('lowers each product by the probe capacitance: |Z| of 500 Ω ∥ 10 pF computed as a complex admittance', () => {
    const m = estimateMixer({ ...base, probeCapacitanceF: 10e-12 });
    for (const p of m.products) {
      const w = 2 * Math.PI * p.frequencyHz;
      const z = 1 / Math.hypot(1 / 500, w * 10e-12); // |1/(G + jωC)|
      expect(rel(p.loadImpedanceOhm, z)).toBeLessThan(1e-12);
      expect(rel(p.outputPeakV, p.currentA * z)).toBeLessThan(1e-12);
    }
    expect(product(m, 'lo_minus_rf').loadImpedanceOhm).toBeGreaterThan(product(m, 'two_lo').loadImpedanceOhm);
  });

  it('reports the conversion transconductance IDSS·b/VP² and the effective drives', () => {
    const m = estimateMixer({ ...base, lo: { ...base.lo, terminal: 'source', leakV: 0.05 } });
    expect(m.effectiveDrive.loV).toBeCloseTo(-0.75, 15);
    expect(m.conversionTransconductanceS).toBeCloseTo((10e-3 * 0.75) / 16, 15);
    expect(product(m, 'lo_minus_rf').currentA).toBeCloseTo(m.conversionTransconductanceS * 0.1, 15);
  });
});

describe('validation and warnings', () => {
  const good: MixerEstimateInput = {
    channel: 'n', idssA: 10e-3, vpV: -4, vgs0V: -2, loadOhm: 50,
    lo: { amplitudeV: 0.5, terminal: 'source', frequencyHz: 10e6 },
    rf: { amplitudeV: 0.1, terminal: 'gate', frequencyHz: 9e6 },
  };
  const fieldsOf = (input: unknown) => {
    try {
      estimateMixer(input as MixerEstimateInput);
    } catch (e) {
      if (e instanceof EstimateInputError) return e.issues.map((i) => i.field);
      throw e;
    }
    return [];
  };

  it.each([
    ['vpV', { ...good, vpV: 4 }],
    ['vgs0V', { ...good, vgs0V: -4.5 }],
    ['vgs0V', { ...good, vgs0V: 0.2 }],
    ['lo.amplitudeV', { ...good, lo: { ...good.lo, amplitudeV: -0.1 } }],
    ['rf.frequencyHz', { ...good, rf: { ...good.rf, frequencyHz: 0 } }],
    ['loadOhm', { ...good, loadOhm: 0 }],
    ['rf.terminal', { ...good, rf: { ...good.rf, terminal: 'drain' } }],
  ])('names %s', (field, input) => {
    expect(fieldsOf(input)).toEqual([field]);
  });

  it('says what was expected', () => {
    expect(() => estimateMixer({ ...good, channel: 'p' })).toThrowErrorMatchingInlineSnapshot(
      `[EstimateInputError: The stage estimate cannot be computed — vpV: expected a positive pinch-off for a p-channel part (datasheet sign), got -4. Correct the inputs and try again.]`,
    );
  });

  it('warns when vGS swings past pinch-off or above 0 V', () => {
    expect(estimateMixer({ ...good, lo: { ...good.lo, amplitudeV: 2.0 } }).warnings.join(' ')).toMatch(/pinch-off.*0 V/s);
    expect(estimateMixer({ ...good, vgs0V: -0.3 }).warnings).toHaveLength(1);
    expect(estimateMixer(good).warnings).toEqual([]);
  });

  it('warns when products coincide', () => {
    const w = estimateMixer({ ...good, lo: { ...good.lo, frequencyHz: 18e6 } }).warnings;
    expect(w.join(' ')).toMatch(/lo and two_rf fall at the same frequency/);
  });
});
