import { fromNEquivalent, gmAtCurrentS, gosAtCurrentS, type Channel, type JfetParams } from '../jfet-model';
import type { PartBasis, PartFigures } from '../operating-point/part-operating-figures';
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
  /** gm and gos at the part's terminals at the bias (S), as `partOperatingFigures` gives them. */
  gmS: number;
  gosS: number;
  /** Where VGS, gm and gos came from: the part's measurements or its fitted model. */
  source?: 'measured' | 'model';
  /** One standard deviation of VGS (V), when known. */
  vgsSigmaV?: number;
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

/** A basis from either a bare model or a stored part's basis. */
export function asPartBasis(part: JfetParams | PartBasis): PartBasis {
  return 'params' in part ? part : { params: part };
}

/**
 * A saturated bias point from `partOperatingFigures`' figures (the one source of operating-point
 * figures). Gains: from the measurements, gm and gos are terminal quantities, so only the
 * external source resistor degenerates; from the model, the intrinsic gm and gos with the
 * part's own RS and RD as in `selfBiasPoint` (checked against ngspice's .ac gain).
 */
export function selfBiasPointFromFigures(
  part: PartBasis,
  f: PartFigures,
  rsOhm: number,
  channel: Channel,
  drainLoadOhm: number | undefined,
): SelfBiasPoint {
  if (f.source === 'model') {
    const m = selfBiasPoint(part.params, f.idA, rsOhm, f.vdsV, channel, drainLoadOhm);
    return { ...m, vgsV: fromNEquivalent(channel, f.vgsV), gmS: f.gmS, gosS: f.gosS, source: 'model', vgsSigmaV: f.vgsSigmaV };
  }
  const result: SelfBiasPoint = {
    idA: f.idA,
    vgsV: fromNEquivalent(channel, f.vgsV),
    rsOhm,
    vdsV: f.vdsV,
    gmS: f.gmS,
    gosS: f.gosS,
    saturated: true,
    warnings: [],
    source: 'measured',
    vgsSigmaV: f.vgsSigmaV,
  };
  if (drainLoadOhm !== undefined) {
    const gosS = Number.isFinite(f.gosS) ? f.gosS : 0;
    result.gain = {
      drainLoadOhm,
      bypassed: commonSourceGain({ gmS: f.gmS, gosS, drainLoadOhm, sourceDegenerationOhm: 0, drainSeriesOhm: 0 }),
      unbypassed: commonSourceGain({ gmS: f.gmS, gosS, drainLoadOhm, sourceDegenerationOhm: rsOhm, drainSeriesOhm: 0 }),
    };
  }
  return result;
}
