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

export interface LotTrend {
  /** Lots in order of receipt (ties by lot id). */
  points: LotTrendPoint[];
  /** Least-squares slope of lot means against receipt time, per day; null with < 2 distinct dates. */
  driftPerDay: number | null;
}

const DAY_MS = 86_400_000;

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
  const distinctDays = new Set(pairs.map(([d]) => d)).size;
  const driftPerDay = distinctDays >= 2 ? linearRegression(pairs).m : null;
  return { points, driftPerDay };
}
