import { binShares, cpk, histogram, lotTrend, summarize, yieldBreakdown, type Summary } from './index';
import { idssInDatasheetSign } from '~/core/units/datasheet-sign';

/** Pure: builds the statistics report from loaded rows. No I/O. */

export const FIGURES = [
  { key: 'idss_a', label: 'IDSS', unit: 'A' },
  { key: 'vp_v', label: 'VP (pinch-off)', unit: 'V' },
  { key: 'gos_s', label: 'gos', unit: 'S' },
  { key: 'gfs_s', label: 'gfs', unit: 'S' },
] as const;
export type FigureKey = (typeof FIGURES)[number]['key'];

/** Part statuses grouped the way inspection reads a yield. */
export const YIELD_GROUPS = {
  accepted: ['accepted', 'in_stock', 'reserved', 'issued', 'returned'],
  in_review: ['measured', 'needs_review', 'retest', 'quarantined'],
  rejected: ['scrapped'],
} as const;
export type YieldGroup = keyof typeof YIELD_GROUPS;

export interface StatisticsPartRow {
  serial: string;
  status: string;
  deviceTypeId: number;
  lotId: number | null;
  lotCode: string | null;
  binCode: string | null;
  /** The part's current fit, or null when it has none. */
  fit: { idssA: number; vpV: number; gosS: number; gfsS: number; idssVdsV: number; review: string } | null;
}

export interface StatisticsTypeInfo {
  id: number;
  name: string;
  channel: 'n' | 'p';
  vdsTestV: number;
  idssMinA: number | null;
  idssMaxA: number | null;
  vpMinV: number | null;
  vpMaxV: number | null;
  /** Bins of the active plan, in plan order; empty when the type has no active plan. */
  bins: { code: string; label: string; ranges: BinRangeJson[] }[];
}

/** A bin's range on one plan axis as stored: SI, datasheet sign, [loValue, hiValue). */
export interface BinRangeJson {
  quantity: string;
  loValue: number;
  hiValue: number;
}

export interface TrendLotInfo {
  id: number;
  code: string;
  supplier: string;
  receivedAt: Date;
}

export interface FigureStatistics {
  label: string;
  unit: string;
  n: number;
  mean: number | null;
  sd: number | null;
  min: number | null;
  p5: number | null;
  p25: number | null;
  median: number | null;
  p75: number | null;
  p95: number | null;
  max: number | null;
  /** Specification limits of the device type (same unit and sign as the figure); null when unset. */
  lsl: number | null;
  usl: number | null;
  /** Cpk against lsl/usl (sample σ of all values, so strictly Ppk); null without limits or spread. */
  cpk: number | null;
  histogram: { lo: number; hi: number; count: number }[];
}

export interface TypeStatistics {
  device_type: {
    id: number;
    name: string;
    channel: 'n' | 'p';
    vds_test_v: number;
    /** Spec limits in datasheet sign: a P-channel type's IDSS limits are negative (min ≤ max). */
    idss_min_a: number | null;
    idss_max_a: number | null;
    vp_min_v: number | null;
    vp_max_v: number | null;
  };
  part_count: number;
  fitted_count: number;
  /** Distinct test VDS of the fits' IDSS and gfs/gos figures. */
  fit_vds_test_v: number[];
  figures: Record<FigureKey, FigureStatistics>;
  scatter: { serial: string; lot_code: string | null; idss_a: number; vp_v: number; status: string }[];
  scatter_truncated: boolean;
  yield: {
    total: number;
    accepted: number;
    in_review: number;
    rejected: number;
    /** accepted / total; null when there are no parts. */
    yield_share: number | null;
    by_status: { status: string; group: YieldGroup | 'other'; count: number; share: number | null }[];
  };
  /** `ranges`: the bin's range per plan axis (empty for the hold bin), for the grid picture. */
  bins: { code: string; label: string; count: number; share: number | null; ranges: BinRangeJson[] }[];
  unbinned_count: number;
  trend: {
    lots: ({
      lot_id: number;
      lot_code: string;
      supplier: string;
      received_at: string;
      selected: boolean;
      n: number;
    } & Record<`${FigureKey}_mean` | `${FigureKey}_sd`, number | null>)[];
    /** Least-squares slope of lot means against receipt date, per day, in the figure's unit; null when there is not enough for a trend. */
    drift_per_day: Record<FigureKey, number | null>;
    /** The same slope with its standard error, and why there is none when there is not enough (see `TREND_MINIMUM`). */
    drift: Record<FigureKey, { per_day: number | null; se_per_day: number | null; span_days: number; lots: number; enough: boolean; reason: string | null }>;
  };
}

const SCATTER_LIMIT = 5000;

function autoBinCount(n: number): number {
  // Sturges' rule, kept within a readable range.
  return Math.min(30, Math.max(5, Math.ceil(Math.log2(Math.max(n, 1)) + 1)));
}

/**
 * A figure in datasheet sign for the type's channel: IDSS (stored as a magnitude) is negative
 * for a P-channel type, like its VDS; VP is stored in datasheet sign already.
 */
function figureValue(fit: NonNullable<StatisticsPartRow['fit']>, key: FigureKey, channel: 'n' | 'p'): number {
  switch (key) {
    case 'idss_a':
      return idssInDatasheetSign(fit.idssA, channel);
    case 'vp_v':
      return fit.vpV;
    case 'gos_s':
      return fit.gosS;
    case 'gfs_s':
      return fit.gfsS;
  }
}

function limitsFor(type: StatisticsTypeInfo, key: FigureKey): { lsl: number | null; usl: number | null } {
  if (key === 'idss_a') {
    // Limits are stored as magnitudes; in datasheet sign a P-channel type's lower limit is −max.
    if (type.channel === 'p') return { lsl: type.idssMaxA === null ? null : -type.idssMaxA, usl: type.idssMinA === null ? null : -type.idssMinA };
    return { lsl: type.idssMinA, usl: type.idssMaxA };
  }
  if (key === 'vp_v') {
    // Stored in datasheet sign; whichever is lower is the lower limit.
    const a = type.vpMinV;
    const b = type.vpMaxV;
    if (a !== null && b !== null) return { lsl: Math.min(a, b), usl: Math.max(a, b) };
    return { lsl: a, usl: b };
  }
  return { lsl: null, usl: null };
}

function figureStatistics(values: number[], type: StatisticsTypeInfo, key: FigureKey, bins: number | undefined): FigureStatistics {
  const meta = FIGURES.find((f) => f.key === key)!;
  const s: Summary = summarize(values);
  const { lsl, usl } = limitsFor(type, key);
  let capability: number | null = null;
  const limitsUsable = (lsl !== null || usl !== null) && (lsl === null || usl === null || lsl < usl);
  if (limitsUsable) capability = cpk(values, lsl, usl);
  const h = histogram(values, bins ?? autoBinCount(s.n));
  return {
    label: meta.label,
    unit: meta.unit,
    n: s.n,
    mean: s.mean,
    sd: s.sd,
    min: s.min,
    p5: s.p5,
    p25: s.p25,
    median: s.median,
    p75: s.p75,
    p95: s.p95,
    max: s.max,
    lsl,
    usl,
    cpk: capability,
    histogram: h.bins.map((b) => ({ lo: b.loValue, hi: b.hiValue, count: b.count })),
  };
}

function groupOf(status: string): YieldGroup | 'other' {
  for (const [group, statuses] of Object.entries(YIELD_GROUPS) as [YieldGroup, readonly string[]][]) {
    if (statuses.includes(status)) return group;
  }
  return 'other';
}

/**
 * One device type's figures. `trendRows` are the parts of `trendLots` (which may be more lots
 * than the selection holds, to show the selected lot among its neighbours).
 */
export function buildTypeStatistics(args: {
  type: StatisticsTypeInfo;
  rows: readonly StatisticsPartRow[];
  trendLots: readonly TrendLotInfo[];
  trendRows: readonly StatisticsPartRow[];
  selectedLotId: number | null;
  histogramBins?: number;
}): TypeStatistics {
  const { type, rows, trendLots, trendRows, selectedLotId, histogramBins } = args;
  const fitted = rows.filter((r) => r.fit !== null) as (StatisticsPartRow & { fit: NonNullable<StatisticsPartRow['fit']> })[];

  const figures = Object.fromEntries(
    FIGURES.map((f) => [f.key, figureStatistics(fitted.map((r) => figureValue(r.fit, f.key, type.channel)), type, f.key, histogramBins)]),
  ) as Record<FigureKey, FigureStatistics>;

  const statusCounts: Record<string, number> = {};
  for (const r of rows) statusCounts[r.status] = (statusCounts[r.status] ?? 0) + 1;
  const passing = [...YIELD_GROUPS.accepted];
  const y = yieldBreakdown(statusCounts, passing);
  const count = (g: YieldGroup) => y.entries.filter((e) => groupOf(e.status) === g).reduce((s, e) => s + e.count, 0);

  const binned = rows.filter((r) => r.binCode !== null).map((r) => r.binCode as string);
  const labelByCode = new Map(type.bins.map((b) => [b.code, b.label]));
  const rangesByCode = new Map(type.bins.map((b) => [b.code, b.ranges]));
  const shares = binShares(binned, type.bins.map((b) => b.code));

  const valuesByLot = new Map<number, StatisticsPartRow[]>();
  for (const r of trendRows) {
    if (r.lotId === null || r.fit === null) continue;
    const list = valuesByLot.get(r.lotId) ?? [];
    list.push(r);
    valuesByLot.set(r.lotId, list);
  }
  const trends = Object.fromEntries(
    FIGURES.map((f) => [
      f.key,
      lotTrend(
        trendLots.map((lot) => ({
          lotId: String(lot.id),
          receivedAt: lot.receivedAt,
          values: (valuesByLot.get(lot.id) ?? []).map((r) => figureValue(r.fit!, f.key, type.channel)),
        })),
      ),
    ]),
  ) as Record<FigureKey, ReturnType<typeof lotTrend>>;
  const lotById = new Map(trendLots.map((l) => [String(l.id), l]));
  const trendLotsOut = trends.idss_a.points.map((p, i) => {
    const lot = lotById.get(p.lotId)!;
    const entry: Record<string, unknown> = {
      lot_id: lot.id,
      lot_code: lot.code,
      supplier: lot.supplier,
      received_at: lot.receivedAt.toISOString(),
      selected: lot.id === selectedLotId,
      n: p.n,
    };
    for (const f of FIGURES) {
      const point = trends[f.key].points[i];
      entry[`${f.key}_mean`] = point.mean;
      entry[`${f.key}_sd`] = point.sd;
    }
    return entry as TypeStatistics['trend']['lots'][number];
  });

  return {
    device_type: {
      id: type.id,
      name: type.name,
      channel: type.channel,
      vds_test_v: type.vdsTestV,
      idss_min_a: limitsFor(type, 'idss_a').lsl,
      idss_max_a: limitsFor(type, 'idss_a').usl,
      vp_min_v: type.vpMinV,
      vp_max_v: type.vpMaxV,
    },
    part_count: rows.length,
    fitted_count: fitted.length,
    fit_vds_test_v: [...new Set(fitted.map((r) => r.fit.idssVdsV))].sort((a, b) => a - b),
    figures,
    scatter: fitted.slice(0, SCATTER_LIMIT).map((r) => ({
      serial: r.serial,
      lot_code: r.lotCode,
      idss_a: idssInDatasheetSign(r.fit.idssA, type.channel),
      vp_v: r.fit.vpV,
      status: r.status,
    })),
    scatter_truncated: fitted.length > SCATTER_LIMIT,
    yield: {
      total: y.total,
      accepted: count('accepted'),
      in_review: count('in_review'),
      rejected: count('rejected'),
      yield_share: y.yieldShare,
      by_status: y.entries.map((e) => ({ status: e.status, group: groupOf(e.status), count: e.count, share: e.share })),
    },
    bins: shares.map((s) => ({ code: s.code, label: labelByCode.get(s.code) ?? s.code, count: s.count, share: s.share, ranges: rangesByCode.get(s.code) ?? [] })),
    unbinned_count: rows.length - binned.length,
    trend: {
      lots: trendLotsOut,
      drift_per_day: Object.fromEntries(FIGURES.map((f) => [f.key, trends[f.key].driftPerDay])) as Record<FigureKey, number | null>,
      drift: Object.fromEntries(
        FIGURES.map((f) => {
          const t = trends[f.key];
          return [f.key, { per_day: t.driftPerDay, se_per_day: t.driftSePerDay, span_days: t.spanDays, lots: t.lotCount, enough: t.enough, reason: t.notEnoughReason }];
        }),
      ) as TypeStatistics['trend']['drift'],
    },
  };
}
