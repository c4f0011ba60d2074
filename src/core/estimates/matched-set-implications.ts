import { throwIfIssues, type EstimateInputIssue } from './estimate-input-error';

export interface MatchedSetImplications {
  /** Differential-pair input offset voltage (V): ΔVGS at equal drain currents. */
  inputOffsetV: number;
  /** Drain-current difference of the pair with both gates at the same voltage (A): gm·ΔVGS. */
  drainCurrentImbalanceA: number;
  /** Differential output offset across equal drain loads (V): gm·ΔVGS·RD; null without a load. */
  outputOffsetV: number | null;
  /**
   * LO feedthrough of a balanced pair relative to a single-ended stage delivering the same
   * wanted output (dB): 20·log10(mismatch/2); null for a perfect match (no first-order leak).
   */
  loLeakageRelativeDb: number | null;
  /** Residual LO current at the balanced output (A peak): mismatch·gm·b/2; null without an LO amplitude. */
  loLeakageCurrentA: number | null;
}

/**
 * What a pair's mismatch means in two circuits (derived from the square law; equal loads, gos
 * neglected):
 * - Differential pair with a tail current: at balance each side carries the same current, so
 *   the input offset is the VGS difference at that current; with equal gates the current splits
 *   unevenly by gm·ΔVGS (gm of one part at half the tail current).
 * - Balanced mixer (LO common to both parts, RF and output antiphase): each part's LO current
 *   is exactly gm_k·b in the square law, so the output (i1 − i2)/2 — scaled to carry the same
 *   difference product as one part — keeps (gm1 − gm2)·b/2 = mismatch·gm·b/2 of LO, i.e.
 *   mismatch/2 of a single-ended stage's gm·b.
 * `gmMismatch` is |gm1 − gm2| / mean(gm1, gm2) as a fraction (0.03 for 3 %); `gmS` the mean gm.
 */
export function matchedSetImplications(args: {
  dvgsV: number;
  gmMismatch: number;
  gmS: number;
  drainLoadOhm?: number;
  loAmplitudeV?: number;
}): MatchedSetImplications {
  const { dvgsV, gmMismatch, gmS, drainLoadOhm, loAmplitudeV } = args;
  const issues: EstimateInputIssue[] = [];
  if (!Number.isFinite(dvgsV)) issues.push({ field: 'dvgsV', message: `expected a VGS difference in V, got ${dvgsV}` });
  if (!(gmMismatch >= 0 && gmMismatch < 2)) issues.push({ field: 'gmMismatch', message: `expected a fractional gm mismatch from 0 up to 2, got ${gmMismatch}` });
  if (!(gmS > 0) || !Number.isFinite(gmS)) issues.push({ field: 'gmS', message: `expected the pair's mean gm in S, > 0, got ${gmS}` });
  if (drainLoadOhm !== undefined && !(drainLoadOhm >= 0)) issues.push({ field: 'drainLoadOhm', message: `expected a drain load ≥ 0 Ω, got ${drainLoadOhm}` });
  if (loAmplitudeV !== undefined && !(loAmplitudeV >= 0)) issues.push({ field: 'loAmplitudeV', message: `expected an LO peak amplitude ≥ 0 V, got ${loAmplitudeV}` });
  throwIfIssues(issues);
  const offset = Math.abs(dvgsV);
  return {
    inputOffsetV: offset,
    drainCurrentImbalanceA: gmS * offset,
    outputOffsetV: drainLoadOhm === undefined ? null : gmS * offset * drainLoadOhm,
    loLeakageRelativeDb: gmMismatch > 0 ? 20 * Math.log10(gmMismatch / 2) : null,
    loLeakageCurrentA: loAmplitudeV === undefined ? null : (gmMismatch * gmS * loAmplitudeV) / 2,
  };
}
