import { max, mean, min, quantileSorted, sampleStandardDeviation } from 'simple-statistics';

export interface Summary {
  /** Count of finite values used. */
  n: number;
  /** Non-finite values (NaN, ±Infinity) left out. */
  nExcluded: number;
  mean: number | null;
  /** Sample standard deviation (n − 1 denominator); null when n < 2. */
  sd: number | null;
  min: number | null;
  max: number | null;
  p5: number | null;
  p25: number | null;
  median: number | null;
  p75: number | null;
  p95: number | null;
}

/**
 * Descriptive figures of a sample. Percentiles interpolate linearly between order statistics
 * (Hyndman–Fan type 7: the default of R's quantile and numpy.percentile).
 */
export function summarize(values: readonly number[]): Summary {
  const finite = values.filter(Number.isFinite);
  const nExcluded = values.length - finite.length;
  const n = finite.length;
  if (n === 0) {
    return { n, nExcluded, mean: null, sd: null, min: null, max: null, p5: null, p25: null, median: null, p75: null, p95: null };
  }
  const sorted = [...finite].sort((a, b) => a - b);
  return {
    n,
    nExcluded,
    mean: mean(sorted),
    sd: n >= 2 ? sampleStandardDeviation(sorted) : null,
    min: min(sorted),
    max: max(sorted),
    p5: quantileSorted(sorted, 0.05),
    p25: quantileSorted(sorted, 0.25),
    median: quantileSorted(sorted, 0.5),
    p75: quantileSorted(sorted, 0.75),
    p95: quantileSorted(sorted, 0.95),
  };
}
