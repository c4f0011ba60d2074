import type { MatchTolerances, SetCost } from './match-types';

export interface SetMismatch {
  dvgsV: number;
  /** One standard deviation of `dvgsV`: σ of the highest and the lowest member combined (V). */
  dvgsSigmaV: number;
  /**
   * What the ΔVGS tolerance is checked against: the largest |VGSi − VGSj| + k·σ(VGSi − VGSj) over
   * the set's pairs, k = `DVGS_GUARD_SIGMAS` (for a pair, ΔVGS + k·dvgsSigmaV).
   */
  dvgsGuardedV: number;
  gmMismatch: number;
  idssMismatch: number;
}

/**
 * A set qualifies under a ΔVGS tolerance only when ΔVGS + 2·σ(ΔVGS) stays within it: with
 * Gaussian errors, a true ΔVGS beyond the tolerance then passes less than 2.3 % of the time.
 */
export const DVGS_GUARD_SIGMAS = 2;

/**
 * Mismatch of a set of parts: ΔVGS = max − min VGS; gm and IDSS as 1 − min/max, the complement
 * of the "ratio ≥ 0.95 / 0.97" the trade grades duals by (common practice). 1 − min/max never
 * shrinks when a part is added, so a set meets a tolerance exactly when every pair in it does.
 */
export function measureSetMismatch(
  parts: readonly { vgsV: number; gmS: number; idssA: number; vgsSigmaV?: number }[],
  guardSigmas: number = DVGS_GUARD_SIGMAS,
): SetMismatch {
  let vMin = Infinity;
  let vMax = -Infinity;
  let sMin = 0;
  let sMax = 0;
  let gMin = Infinity;
  let gMax = -Infinity;
  let iMin = Infinity;
  let iMax = -Infinity;
  for (const p of parts) {
    if (p.vgsV < vMin) {
      vMin = p.vgsV;
      sMin = p.vgsSigmaV ?? 0;
    }
    if (p.vgsV > vMax) {
      vMax = p.vgsV;
      sMax = p.vgsSigmaV ?? 0;
    }
    if (p.gmS < gMin) gMin = p.gmS;
    if (p.gmS > gMax) gMax = p.gmS;
    if (p.idssA < iMin) iMin = p.idssA;
    if (p.idssA > iMax) iMax = p.idssA;
  }
  const dvgsSigmaV = parts.length > 1 ? Math.hypot(sMin, sMax) : 0;
  // The worst pair's guarded ΔVGS, so a set meets the tolerance exactly when every pair does.
  let dvgsGuardedV = 0;
  for (let a = 0; a < parts.length; a++)
    for (let b = a + 1; b < parts.length; b++) {
      const x = parts[a]!, y = parts[b]!;
      dvgsGuardedV = Math.max(dvgsGuardedV, Math.abs(x.vgsV - y.vgsV) + guardSigmas * Math.hypot(x.vgsSigmaV ?? 0, y.vgsSigmaV ?? 0));
    }
  return {
    dvgsV: vMax - vMin,
    dvgsSigmaV,
    dvgsGuardedV,
    gmMismatch: 1 - gMin / gMax,
    idssMismatch: 1 - iMin / iMax,
  };
}

/** mismatch / tolerance; 0 for an unconstrained (Infinity) tolerance or a perfect match. */
function term(mismatch: number, tolerance: number): number {
  if (tolerance === Infinity || mismatch <= 0) return 0;
  return tolerance > 0 ? mismatch / tolerance : Infinity;
}

/**
 * Scalar cost of a set: Σ mismatch/tolerance over the three figures. Each term is ≤ 1 for a set
 * within tolerance, so the total is ≤ 3 and a figure counts in proportion to how much of its
 * tolerance it uses.
 */
export function setCostFromMismatch(m: SetMismatch, tol: MatchTolerances): SetCost {
  const dvgsTerm = term(m.dvgsGuardedV, tol.maxDvgsV);
  const gmTerm = term(m.gmMismatch, tol.maxGmMismatch);
  const idssTerm = term(m.idssMismatch, tol.maxIdssMismatch);
  return { dvgsTerm, gmTerm, idssTerm, total: dvgsTerm + gmTerm + idssTerm };
}

export function meetsMatchTolerances(m: SetMismatch, tol: MatchTolerances): boolean {
  return (
    m.dvgsGuardedV <= tol.maxDvgsV &&
    m.gmMismatch <= tol.maxGmMismatch &&
    m.idssMismatch <= tol.maxIdssMismatch
  );
}
