import { describe, expect, it } from 'vitest';
import { EstimateInputError, matchedSetImplications } from '~/core/estimates';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Peak amplitude at bin k of one sampled common period. */
function dftAmplitude(x: readonly number[], k: number): number {
  let re = 0;
  let im = 0;
  for (let i = 0; i < x.length; i++) {
    re += x[i] * Math.cos((2 * Math.PI * k * i) / x.length);
    im -= x[i] * Math.sin((2 * Math.PI * k * i) / x.length);
  }
  return (2 * Math.hypot(re, im)) / x.length;
}

describe('balanced mixer LO leakage (derived; checked by a DFT of two sampled square-law parts)', () => {
  it('leaves mismatch/2 of a single-ended stage’s LO, i.e. 20·log10(mismatch/2) dB', () => {
    const vp = -3;
    const vgs0 = -1.2;
    const idss = [10e-3, 10.4e-3];
    const u = 1 - vgs0 / vp;
    const gm = idss.map((i) => (2 * i * u) / Math.abs(vp));
    const gmMean = (gm[0] + gm[1]) / 2;
    const mismatch = (gm[1] - gm[0]) / gmMean;

    const n = 1024;
    const [kLo, kRf] = [7, 5];
    const [a, b] = [0.05, 0.3];
    const balanced: number[] = [];
    const single: number[] = [];
    for (let i = 0; i < n; i++) {
      const lo = b * Math.cos((2 * Math.PI * kLo * i) / n);
      const rf = a * Math.cos((2 * Math.PI * kRf * i) / n);
      const i1 = idss[0] * (1 - (vgs0 + rf + lo) / vp) ** 2;
      const i2 = idss[1] * (1 - (vgs0 - rf + lo) / vp) ** 2;
      balanced.push((i1 - i2) / 2);
      const iMean = ((idss[0] + idss[1]) / 2) * (1 - (vgs0 + rf + lo) / vp) ** 2;
      single.push(iMean);
    }
    // The balanced output carries the same difference product as the single-ended stage …
    expect(rel(dftAmplitude(balanced, kLo - kRf), dftAmplitude(single, kLo - kRf))).toBeLessThan(1e-9);
    const measuredDb = 20 * Math.log10(dftAmplitude(balanced, kLo) / dftAmplitude(single, kLo));

    const r = matchedSetImplications({ dvgsV: 0.004, gmMismatch: Math.abs(mismatch), gmS: gmMean, loAmplitudeV: b });
    expect(Math.abs(r.loLeakageRelativeDb! - measuredDb)).toBeLessThan(1e-6);
    expect(rel(r.loLeakageCurrentA!, dftAmplitude(balanced, kLo))).toBeLessThan(1e-6);
  });
});

describe('differential pair (derived; checked by solving the pair numerically)', () => {
  it('input offset is ΔVGS at equal currents and the split at equal gates is ≈ gm·ΔVGS', () => {
    // Two square-law parts, a 4 mA tail; gates both at 0 V, shared source at vs.
    const parts = [
      { idss: 9e-3, vp: -2.0 },
      { idss: 9e-3, vp: -2.01 },
    ];
    const tail = 4e-3;
    const id = (p: { idss: number; vp: number }, vgs: number) =>
      vgs <= p.vp ? 0 : p.idss * (1 - vgs / p.vp) ** 2;
    let lo = 0;
    let hi = 3;
    for (let k = 0; k < 200; k++) {
      const vs = (lo + hi) / 2;
      if (id(parts[0], -vs) + id(parts[1], -vs) > tail) lo = vs;
      else hi = vs;
    }
    const vs = (lo + hi) / 2;
    const split = id(parts[1], -vs) - id(parts[0], -vs);

    const half = tail / 2;
    const vgsAt = (p: { idss: number; vp: number }) => p.vp * (1 - Math.sqrt(half / p.idss));
    const dvgs = vgsAt(parts[0]) - vgsAt(parts[1]);
    const gm = (2 * Math.sqrt(half * parts[0].idss)) / Math.abs(parts[0].vp);
    const r = matchedSetImplications({ dvgsV: dvgs, gmMismatch: 0, gmS: gm, drainLoadOhm: 1000 });
    expect(r.inputOffsetV).toBeCloseTo(Math.abs(dvgs), 15);
    expect(rel(r.drainCurrentImbalanceA, split)).toBeLessThan(0.005); // first order in ΔVGS: 0.25 % here
    expect(r.outputOffsetV).toBeCloseTo(r.drainCurrentImbalanceA * 1000, 15);
    expect(r.loLeakageRelativeDb).toBeNull();
  });

  it('a 3 % gm mismatch leaves LO 36.5 dB below a single-ended stage (20·log10(0.015), derived)', () => {
    expect(matchedSetImplications({ dvgsV: 0.005, gmMismatch: 0.03, gmS: 5e-3 }).loLeakageRelativeDb).toBeCloseTo(-36.478, 3);
    expect(() => matchedSetImplications({ dvgsV: 0.005, gmMismatch: -0.1, gmS: 5e-3 })).toThrow(EstimateInputError);
  });
});
