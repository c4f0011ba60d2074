import { AppError } from '../errors';
import { mean, sampleStandardDeviation } from 'simple-statistics';

/**
 * Process capability index Cpk = min(USL − µ, µ − LSL) / (3σ) (common practice), one-sided
 * (Cpu or Cpl) when only one limit is given. µ and σ are the sample mean and the sample
 * standard deviation of all values — no rational subgroups, so in the automotive vocabulary this
 * is strictly Ppk. Returns null when n < 2 or σ = 0. Non-finite values are left out.
 */
export function cpk(values: readonly number[], lsl?: number | null, usl?: number | null): number | null {
  const hasL = lsl !== undefined && lsl !== null;
  const hasU = usl !== undefined && usl !== null;
  if (!hasL && !hasU) throw new AppError('cpk_needs_limit');
  if (hasL && hasU && !(lsl < usl)) {
    throw new AppError('cpk_limits_reversed', { lsl, usl });
  }
  const finite = values.filter(Number.isFinite);
  if (finite.length < 2) return null;
  const mu = mean(finite);
  const sigma = sampleStandardDeviation(finite);
  if (!(sigma > 0)) return null;
  const sides: number[] = [];
  if (hasU) sides.push((usl - mu) / (3 * sigma));
  if (hasL) sides.push((mu - lsl) / (3 * sigma));
  return Math.min(...sides);
}
