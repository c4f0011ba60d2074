import { linearRegression, mean, sampleStandardDeviation } from 'simple-statistics';

export interface LotValues {
  lotId: string;
  receivedAt: Date;
  values: readonly number[];
}

export interface LotTrendPoint {
  lotId: string;
  receivedAt: Date;
  n: number;
  mean: number | null;
  /** Sample standard deviation; null when n < 2. */
  sd: number | null;
}

/**
 * What a lot trend needs before it says anything: at least this many lots with fitted parts,
 * received over at least this many days. Lots received minutes apart give a slope that is
 * all noise (a 0.1 mA difference over 10 minutes reads as 14 A per day).
 */
export const TREND_MINIMUM = { lots: 3, spanDays: 14 } as const;

export interface LotTrend {
  /** Lots in order of receipt (ties by lot id). */
  points: LotTrendPoint[];
  /** Least-squares slope of lot means against receipt time, per day; null when `enough` is false. */
  driftPerDay: number | null;
  /** Standard error of that slope (per day), from the residuals about the line; null likewise. */
  driftSePerDay: number | null;
  /** Days between the first and the last lot with fitted parts. */
  spanDays: number;
  /** Lots with fitted parts (the points the line goes through). */
  lotCount: number;
  enough: boolean;
  /** Why there is no trend, in words; null when there is one. */
  notEnoughReason: string | null;
}

const DAY_MS = 86_400_000;

function describeSpan(days: number): string {
  if (days < 1 / 1440) return 'less than a minute';
  if (days < 1 / 24) return `${Math.round(days * 1440)} minute${Math.round(days * 1440) === 1 ? '' : 's'}`;
  if (days < 2) return `${Math.round(days * 24)} hours`;
  return `${Math.round(days)} days`;
}

/** Mean and spread of a figure lot by lot, over time. Non-finite values are left out. */
export function lotTrend(lots: readonly LotValues[]): LotTrend {
  const points = [...lots]
    .sort((a, b) => a.receivedAt.getTime() - b.receivedAt.getTime() || a.lotId.localeCompare(b.lotId))
    .map((lot) => {
      const v = lot.values.filter(Number.isFinite);
      return {
        lotId: lot.lotId,
        receivedAt: lot.receivedAt,
        n: v.length,
        mean: v.length > 0 ? mean(v) : null,
        sd: v.length >= 2 ? sampleStandardDeviation(v) : null,
      };
    });
  const withMean = points.filter((p) => p.mean !== null);
  const t0 = withMean.length > 0 ? withMean[0].receivedAt.getTime() : 0;
  const pairs = withMean.map((p) => [(p.receivedAt.getTime() - t0) / DAY_MS, p.mean as number]);
  const spanDays = pairs.length > 0 ? pairs[pairs.length - 1][0] - pairs[0][0] : 0;
  const lotCount = pairs.length;
  let notEnoughReason: string | null = null;
  if (lotCount < TREND_MINIMUM.lots) {
    notEnoughReason = `${lotCount === 0 ? 'No lot' : lotCount === 1 ? 'Only one lot' : `Only ${lotCount} lots`} with fitted parts; a trend needs at least ${TREND_MINIMUM.lots} lots received over ${TREND_MINIMUM.spanDays} days or more.`;
  } else if (spanDays < TREND_MINIMUM.spanDays) {
    notEnoughReason = `The ${lotCount} lots were received within ${describeSpan(spanDays)}; a trend needs them spread over ${TREND_MINIMUM.spanDays} days or more.`;
  }
  if (notEnoughReason !== null) {
    return { points, driftPerDay: null, driftSePerDay: null, spanDays, lotCount, enough: false, notEnoughReason };
  }
  const line = linearRegression(pairs);
  const xMean = mean(pairs.map(([x]) => x));
  const sxx = pairs.reduce((acc, [x]) => acc + (x - xMean) ** 2, 0);
  const ssr = pairs.reduce((acc, [x, y]) => acc + (y - (line.m * x + line.b)) ** 2, 0);
  const driftSePerDay = Math.sqrt(ssr / (lotCount - 2) / sxx);
  return { points, driftPerDay: line.m, driftSePerDay, spanDays, lotCount, enough: true, notEnoughReason: null };
}
