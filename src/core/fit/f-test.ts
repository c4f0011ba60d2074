import type { ExtendedModelTest } from './definitions.ts';

/** Significance level at which the extended (RS, RD) model is kept. */
export const EXTENDED_MODEL_P_VALUE = 0.01;

/**
 * Extra-sum-of-squares F-test for nested least-squares models that differ by 2 parameters:
 * F = ((SSE₁ − SSE₂)/2) / (SSE₂/(n − p₂)), with d₁ = 2, d₂ = n − p₂. For d₁ = 2 the
 * F-distribution's upper tail is closed-form: P(F > f) = (1 + 2f/d₂)^(−d₂/2) (derived from
 * the regularized incomplete beta I_x(1, b) = 1 − (1 − x)^b).
 */
export function fTestTwoExtraParameters(
  sseSimple: number,
  sseExtended: number,
  pointCount: number,
  extendedParamCount: number,
): ExtendedModelTest {
  const d2 = pointCount - extendedParamCount;
  if (!(d2 > 0) || !(sseSimple > sseExtended)) return { fStatistic: 0, pValue: 1, kept: false };
  const fStatistic = sseExtended > 0 ? (sseSimple - sseExtended) / 2 / (sseExtended / d2) : Infinity;
  const pValue = Number.isFinite(fStatistic) ? Math.exp((-d2 / 2) * Math.log1p((2 * fStatistic) / d2)) : 0;
  return { fStatistic, pValue, kept: pValue < EXTENDED_MODEL_P_VALUE };
}
