import { fromNEquivalent, gmAtCurrentS, gosAtCurrentS, type Channel, type JfetParams } from '../jfet-model';
import { commonSourceGain } from './common-source-gain';
import type { EstimateInputIssue } from './estimate-input-error';

export interface SelfBiasGain {
  /** Drain load RD (Ω) the gains are for. */
  drainLoadOhm: number;
  /** Source resistor bypassed at the signal frequency: −gm·(RD ∥ 1/gos) (with the part's own RS, if fitted, as degeneration). */
  bypassed: number;
  /** Source resistor unbypassed: −gm·RD/(1 + gm·RS + gos·(RD + RS)), gos included. */
  unbypassed: number;
}

export interface SelfBiasPoint {
  /** Drain current magnitude (A). */
  idA: number;
  /** Gate–source voltage at the part's terminals, datasheet sign for the channel (V). */
  vgsV: number;
  /** Source resistor (Ω). */
  rsOhm: number;
  /** |VDS| at the part's terminals (V). */
  vdsV: number;
  /** Intrinsic gm and gos at the bias (S). */
  gmS: number;
  gosS: number;
  /** True when the intrinsic VDS is at least VGS − VTO (the saturation equations apply). */
  saturated: boolean;
  gain?: SelfBiasGain;
  warnings: string[];
}

export function paramIssues(p: JfetParams): EstimateInputIssue[] {
  const issues: EstimateInputIssue[] = [];
  if (!(p.vtoV < 0) || !Number.isFinite(p.vtoV)) issues.push({ field: 'params.vtoV', message: `expected VTO < 0 (N-equivalent sign), got ${p.vtoV}` });
  if (!(p.betaAPerV2 > 0) || !Number.isFinite(p.betaAPerV2)) issues.push({ field: 'params.betaAPerV2', message: `expected BETA > 0 A/V², got ${p.betaAPerV2}` });
  if (!(p.lambdaPerV >= 0) || !Number.isFinite(p.lambdaPerV)) issues.push({ field: 'params.lambdaPerV', message: `expected λ ≥ 0 1/V, got ${p.lambdaPerV}` });
  if (!(p.rsOhm >= 0)) issues.push({ field: 'params.rsOhm', message: `expected RS ≥ 0 Ω, got ${p.rsOhm}` });
  if (!(p.rdOhm >= 0)) issues.push({ field: 'params.rdOhm', message: `expected RD ≥ 0 Ω, got ${p.rdOhm}` });
  return issues;
}

/** Figures of a saturated bias point found by either self-bias solver. */
export function selfBiasPoint(
  p: JfetParams,
  idA: number,
  rsOhm: number,
  vdsV: number,
  channel: Channel,
  drainLoadOhm: number | undefined,
): SelfBiasPoint {
  const vdsInternalV = vdsV - idA * (p.rsOhm + p.rdOhm);
  const vovV = -p.vtoV - idA * (rsOhm + p.rsOhm);
  const gmS = gmAtCurrentS(p, idA, vdsInternalV);
  const gosS = gosAtCurrentS(p, idA, vdsInternalV);
  const saturated = vdsInternalV >= vovV;
  const warnings: string[] = [];
  if (!saturated) {
    warnings.push(
      `VDS ${vdsV.toFixed(3)} V leaves the part out of saturation (needs the intrinsic VDS ≥ VGS − VTO = ${vovV.toFixed(3)} V); the estimate assumes saturation and does not hold here.`,
    );
  }
  const result: SelfBiasPoint = {
    idA,
    vgsV: fromNEquivalent(channel, -idA * rsOhm),
    rsOhm,
    vdsV,
    gmS,
    gosS,
    saturated,
    warnings,
  };
  if (drainLoadOhm !== undefined) {
    result.gain = {
      drainLoadOhm,
      bypassed: commonSourceGain({ gmS, gosS, drainLoadOhm, sourceDegenerationOhm: p.rsOhm, drainSeriesOhm: p.rdOhm }),
      unbypassed: commonSourceGain({ gmS, gosS, drainLoadOhm, sourceDegenerationOhm: rsOhm + p.rsOhm, drainSeriesOhm: p.rdOhm }),
    };
  }
  return result;
}
