/**
 * A part measured only as a transfer sweep (ID against VGS at one fixed VDS) gets its
 * operating-point figures from that sweep at that VDS, and from its model elsewhere. The part is
 * a power law ID = K·(VGS − V0)^2.5·(1 + λ·VDS) (the shape of measured JFETs; exponent within
 * the published 2.4–2.8), so the truth is its closed form (derived).
 */
import { describe, expect, it } from 'vitest';
import { fitCurveFamily } from '~/core/fit/fit-curve-family';
import type { CurveFamily } from '~/core/fit/definitions';
import { partOperatingFigures } from '~/core/operating-point/part-operating-figures';

const K = 3e-3;
const V0 = -2.2;
const LAMBDA = 0.01;
const M = 2.5;
const idAt = (vgs: number, vds: number) => K * Math.pow(Math.max(vgs - V0, 0), M) * (1 + LAMBDA * vds);

/** One curve per gate voltage, each with its single point at the sweep's fixed VDS. */
function transferFamily(vdsV: number): CurveFamily {
  const curves = [];
  for (let g = 0; g <= 22; g++) {
    const vgs = -2.2 + 0.1 * g;
    curves.push({ vgsV: Number(vgs.toFixed(3)), points: { vdsV: [vdsV], idA: [idAt(vgs, vdsV)] } });
  }
  return { curves };
}

describe('transfer sweeps feed the operating-point figures', () => {
  it('reads VGS at 1 mA from the sweep at its own VDS, the model elsewhere', () => {
    const fit = fitCurveFamily(transferFamily(10), { vdsTestV: 10 });
    expect(fit.status).toBe('fitted');
    if (fit.status !== 'fitted') throw new Error(`not fitted: ${fit.status}`);
    const p = fit.parameters;
    const basis = {
      params: { vtoV: p.vtoV.value, betaAPerV2: p.betaAPerV2.value, lambdaPerV: p.lambdaPerV.value, rsOhm: p.rsOhm.value, rdOhm: p.rdOhm.value },
      table: fit.operatingTable,
      modelSigmaV: fit.modelVgsSigmaV,
    };
    const truth = V0 + Math.pow(1e-3 / (K * (1 + LAMBDA * 10)), 1 / M);
    const at10 = partOperatingFigures(basis, { kind: 'current', idA: 1e-3, vdsV: 10 });
    expect(at10.usable).toBe(true);
    if (!at10.usable) throw new Error(`not usable: ${at10.code}`);
    expect(at10.figures.source).toBe('measured');
    expect(Math.abs(at10.figures.vgsV - truth)).toBeLessThan(0.5e-3);
    expect(Math.abs(at10.figures.vgsV - truth)).toBeLessThanOrEqual(2 * at10.figures.vgsSigmaV + 1e-9);
    const idss = partOperatingFigures(basis, { kind: 'idss', vdsV: 10 });
    expect(idss.usable && Math.abs(idss.figures.idssA / idAt(0, 10) - 1)).toBeLessThan(0.005);
    const at12 = partOperatingFigures(basis, { kind: 'current', idA: 1e-3, vdsV: 12 });
    expect(at12.usable && at12.figures.source).toBe('model');
  });
});
