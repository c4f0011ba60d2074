import type { JfetParams } from '../jfet-model';
import { EstimateInputError } from './estimate-input-error';

/**
 * Level-1 parameters (N-equivalent signs, no series resistance) from data-sheet IDSS and VP:
 * VTO = −|VP|, BETA = IDSS / (VP²·(1 + λ·|VDS test|)). With the default λ = 0 (or a test VDS of
 * 0) this is BETA = IDSS/VP². `vpV` may carry either datasheet sign.
 */
export function paramsFromIdssVp(idssA: number, vpV: number, lambdaPerV = 0, idssTestVdsV = 0): JfetParams {
  const issues = [];
  if (!(idssA > 0) || !Number.isFinite(idssA)) issues.push({ field: 'idssA', message: `expected IDSS in A, > 0, got ${idssA}` });
  if (!(vpV !== 0) || !Number.isFinite(vpV)) issues.push({ field: 'vpV', message: `expected a non-zero pinch-off in V, got ${vpV}` });
  if (!(lambdaPerV >= 0) || !Number.isFinite(lambdaPerV)) issues.push({ field: 'lambdaPerV', message: `expected λ in 1/V, ≥ 0, got ${lambdaPerV}` });
  if (!Number.isFinite(idssTestVdsV)) issues.push({ field: 'idssTestVdsV', message: `expected a finite VDS in V, got ${idssTestVdsV}` });
  if (issues.length > 0) throw new EstimateInputError(issues);
  return {
    vtoV: -Math.abs(vpV),
    betaAPerV2: idssA / (vpV * vpV * (1 + lambdaPerV * Math.abs(idssTestVdsV))),
    lambdaPerV,
    rsOhm: 0,
    rdOhm: 0,
  };
}
