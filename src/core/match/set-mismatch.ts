import type { MatchTolerances, SetCost } from './match-types';

export interface SetMismatch {
  dvgsV: number;
  gmMismatch: number;
  idssMismatch: number;
}

/**
 * Mismatch of a set of parts: ΔVGS = max − min VGS; gm and IDSS as 1 − min/max, the complement
 * of the "ratio ≥ 0.95 / 0.97" the trade grades duals by (common practice). 1 − min/max never
 * shrinks when a part is added, so a set meets a tolerance exactly when every pair in it does.
 */
export function measureSetMismatch(
  parts: readonly { vgsV: number; gmS: number; idssA: number }[],
): SetMismatch {
  let vMin = Infinity;
  let vMax = -Infinity;
  let gMin = Infinity;
  let gMax = -Infinity;
  let iMin = Infinity;
  let iMax = -Infinity;
  for (const p of parts) {
    if (p.vgsV < vMin) vMin = p.vgsV;
    if (p.vgsV > vMax) vMax = p.vgsV;
    if (p.gmS < gMin) gMin = p.gmS;
    if (p.gmS > gMax) gMax = p.gmS;
    if (p.idssA < iMin) iMin = p.idssA;
    if (p.idssA > iMax) iMax = p.idssA;
  }
  return { dvgsV: vMax - vMin, gmMismatch: 1 - gMin / gMax, idssMismatch: 1 - iMin / iMax };
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
  const dvgsTerm = term(m.dvgsV, tol.maxDvgsV);
  const gmTerm = term(m.gmMismatch, tol.maxGmMismatch);
  const idssTerm = term(m.idssMismatch, tol.maxIdssMismatch);
  return { dvgsTerm, gmTerm, idssTerm, total: dvgsTerm + gmTerm + idssTerm };
}

export function meetsMatchTolerances(m: SetMismatch, tol: MatchTolerances): boolean {
  return (
    m.dvgsV <= tol.maxDvgsV &&
    m.gmMismatch <= tol.maxGmMismatch &&
    m.idssMismatch <= tol.maxIdssMismatch
  );
}
