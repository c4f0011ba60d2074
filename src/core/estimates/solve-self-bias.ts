import type { Channel, JfetParams } from '../jfet-model';
import { partOperatingFigures, type PartBasis } from '../operating-point/part-operating-figures';
import { throwIfIssues, type EstimateInputIssue } from './estimate-input-error';
import { asPartBasis, paramIssues, selfBiasPoint, selfBiasPointFromFigures, type SelfBiasPoint } from './self-bias-point';

export interface SelfBiasOptions {
  /** External source resistor (Ω), gate returned to ground: VGS = −ID·RS. */
  rsOhm: number;
  /** |VDS| at the part's terminals (V). */
  vdsV: number;
  /** Drain load for the gain figures (Ω); omit for no gain. */
  drainLoadOhm?: number;
  /** Sign of the returned VGS; 'n' by default. */
  channel?: Channel;
  /** Compare temperature (°C) for a stored part's figures; 25 by default. */
  compareAtC?: number;
}

/**
 * Self-bias operating point of a part (a bare model, or a stored part's basis): the figures come
 * from `partOperatingFigures` — the part's measurements where the point lies inside them, else
 * its model. Where even the model leaves the part out of saturation, the point is still solved
 * from the model equation below and returned with `saturated: false` and a warning.
 * The model equation (N-equivalent signs):
 *   ID = BETA·(|VTO| − ID·R)²·(1 + λ·(VDS − ID·(RS_part + RD_part))),  R = RS + RS_part,
 * since the intrinsic VGS is −ID·R. When the last factor is constant (λ = 0 or no fitted series
 * resistance) the smaller root of the quadratic is taken in its cancellation-free form
 *   ID = 2k·VP² / (1 + 2k|VP|R + sqrt(1 + 4k|VP|R)),  k = BETA·(1 + λ·VDS);
 * otherwise the unique root in [0, |VTO|/R] is found by bisection (the residual is monotonic).
 */
export function solveSelfBias(part: JfetParams | PartBasis, options: SelfBiasOptions): SelfBiasPoint {
  const basis = asPartBasis(part);
  const params = basis.params;
  const { rsOhm, drainLoadOhm } = options;
  const vdsV = Math.abs(options.vdsV);
  const issues: EstimateInputIssue[] = paramIssues(params);
  if (!(rsOhm >= 0) || !Number.isFinite(rsOhm)) issues.push({ field: 'rsOhm', message: `expected a source resistor ≥ 0 Ω, got ${rsOhm}` });
  if (!Number.isFinite(vdsV)) issues.push({ field: 'vdsV', message: `expected a finite VDS in V, got ${options.vdsV}` });
  if (drainLoadOhm !== undefined && !(drainLoadOhm >= 0)) issues.push({ field: 'drainLoadOhm', message: `expected a drain load ≥ 0 Ω, got ${drainLoadOhm}` });
  throwIfIssues(issues);

  const e = partOperatingFigures(basis, { kind: 'self_bias', rsOhm, vdsV }, options.compareAtC);
  if (e.usable) return selfBiasPointFromFigures(basis, e.figures, rsOhm, options.channel ?? 'n', drainLoadOhm);

  const beta = params.betaAPerV2;
  const lambda = params.lambdaPerV;
  const pinch = -params.vtoV;
  const r = rsOhm + params.rsOhm;
  const rSeries = params.rsOhm + params.rdOhm;
  let idA: number;
  if (lambda === 0 || rSeries === 0) {
    const k = beta * (1 + lambda * vdsV);
    const x = k * pinch * r;
    idA = (2 * k * pinch * pinch) / (1 + 2 * x + Math.sqrt(1 + 4 * x));
  } else if (r === 0) {
    idA = (beta * pinch * pinch * (1 + lambda * vdsV)) / (1 + beta * pinch * pinch * lambda * rSeries);
  } else {
    const residual = (id: number) => {
      const vov = Math.max(0, pinch - id * r);
      return id - beta * vov * vov * (1 + lambda * (vdsV - id * rSeries));
    };
    let lo = 0;
    let hi = pinch / r;
    for (let i = 0; i < 200 && hi - lo > 1e-16 * hi; i++) {
      const mid = 0.5 * (lo + hi);
      if (residual(mid) > 0) hi = mid;
      else lo = mid;
    }
    idA = 0.5 * (lo + hi);
  }
  return selfBiasPoint(params, idA, rsOhm, vdsV, options.channel ?? 'n', drainLoadOhm);
}
