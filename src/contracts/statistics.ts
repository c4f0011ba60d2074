import { z } from 'zod';
import { STORABLE_DATE_RANGE_TEXT, isStorableDate } from '~/core/dates/storable-date';
import { Channel, IsoDateTime } from './common';

/** The figures the statistics report summarises, by their JSON key. */
export const STATISTICS_FIGURE_KEYS = ['idss_a', 'vp_v', 'gos_s', 'gfs_s'] as const;
export const StatisticsFigureKey = z.enum(STATISTICS_FIGURE_KEYS);
export type StatisticsFigureKey = z.infer<typeof StatisticsFigureKey>;

const perFigure = <T extends z.ZodType>(value: T) => z.object({ idss_a: value, vp_v: value, gos_s: value, gfs_s: value });

/** `GET /api/statistics/options`: what the statistics page offers to choose from. */
export const StatisticsOptions = z.object({
  device_types: z.array(z.object({ id: z.number().int(), name: z.string(), channel: Channel })),
  lots: z.array(
    z.object({
      id: z.number().int(),
      code: z.string(),
      device_type: z.string(),
      supplier: z.string(),
      received_at: IsoDateTime,
      part_count: z.number().int(),
    }),
  ),
});
export type StatisticsOptions = z.infer<typeof StatisticsOptions>;

/** A bin's range on one plan axis as stored: SI, datasheet sign, [loValue, hiValue). */
export const StatisticsBinRange = z.object({ quantity: z.string(), loValue: z.number(), hiValue: z.number() });

/** One figure over the selection: summary, specification limits, Cpk and histogram. */
export const FigureStatistics = z.object({
  label: z.string(),
  unit: z.string(),
  n: z.number().int(),
  mean: z.number().nullable(),
  sd: z.number().nullable(),
  min: z.number().nullable(),
  p5: z.number().nullable(),
  p25: z.number().nullable(),
  median: z.number().nullable(),
  p75: z.number().nullable(),
  p95: z.number().nullable(),
  max: z.number().nullable(),
  /** Specification limits of the device type (same unit and sign as the figure); null when unset. */
  lsl: z.number().nullable(),
  usl: z.number().nullable(),
  /** Cpk against lsl/usl (sample σ of all values, so strictly Ppk); null without limits or spread. */
  cpk: z.number().nullable(),
  histogram: z.array(z.object({ lo: z.number(), hi: z.number(), count: z.number().int() })),
});
export type FigureStatistics = z.infer<typeof FigureStatistics>;

const meanSd = z.number().nullable();

/** A lot on the trend: its means and standard deviations of each figure. */
const TrendLot = z.object({
  lot_id: z.number().int(),
  lot_code: z.string(),
  supplier: z.string(),
  received_at: IsoDateTime,
  selected: z.boolean(),
  n: z.number().int(),
  idss_a_mean: meanSd,
  idss_a_sd: meanSd,
  vp_v_mean: meanSd,
  vp_v_sd: meanSd,
  gos_s_mean: meanSd,
  gos_s_sd: meanSd,
  gfs_s_mean: meanSd,
  gfs_s_sd: meanSd,
});

/** The statistics of one device type (figures of different types are never pooled). */
export const TypeStatistics = z.object({
  device_type: z.object({
    id: z.number().int(),
    name: z.string(),
    channel: Channel,
    vds_test_v: z.number(),
    /** Spec limits in datasheet sign: a P-channel type's IDSS limits are negative (min ≤ max). */
    idss_min_a: z.number().nullable(),
    idss_max_a: z.number().nullable(),
    vp_min_v: z.number().nullable(),
    vp_max_v: z.number().nullable(),
  }),
  part_count: z.number().int(),
  fitted_count: z.number().int(),
  /** Distinct test VDS of the fits' IDSS and gfs/gos figures. */
  fit_vds_test_v: z.array(z.number()),
  figures: perFigure(FigureStatistics),
  scatter: z.array(z.object({ serial: z.string(), lot_code: z.string().nullable(), idss_a: z.number(), vp_v: z.number(), status: z.string() })),
  scatter_truncated: z.boolean(),
  yield: z.object({
    total: z.number().int(),
    accepted: z.number().int(),
    in_review: z.number().int(),
    rejected: z.number().int(),
    /** accepted / total; null when there are no parts. */
    yield_share: z.number().nullable(),
    by_status: z.array(z.object({ status: z.string(), group: z.enum(['accepted', 'in_review', 'rejected', 'other']), count: z.number().int(), share: z.number().nullable() })),
  }),
  /** `ranges`: the bin's range per plan axis (empty for the hold bin), for the grid picture. */
  bins: z.array(z.object({ code: z.string(), label: z.string(), count: z.number().int(), share: z.number().nullable(), ranges: z.array(StatisticsBinRange) })),
  unbinned_count: z.number().int(),
  trend: z.object({
    lots: z.array(TrendLot),
    /** Least-squares slope of lot means against receipt date, per day, in the figure's unit; null when there is not enough for a trend. */
    drift_per_day: perFigure(z.number().nullable()),
    /** The same slope with its standard error, and why there is none when there is not enough. */
    drift: perFigure(
      z.object({
        per_day: z.number().nullable(),
        se_per_day: z.number().nullable(),
        span_days: z.number(),
        lots: z.number().int(),
        enough: z.boolean(),
        reason: z.string().nullable(),
      }),
    ),
  }),
});
export type TypeStatistics = z.infer<typeof TypeStatistics>;

/** `GET /api/statistics`: one group per device type in the selection. */
export const StatisticsReport = z.object({
  selection: z.object({
    device_type: z.string().nullable(),
    lot: z.string().nullable(),
    from: IsoDateTime.nullable(),
    to: IsoDateTime.nullable(),
    date_basis: z.enum(['fit', 'lot']),
  }),
  groups: z.array(TypeStatistics),
});
export type StatisticsReport = z.infer<typeof StatisticsReport>;

const optionalText = z
  .string()
  .trim()
  .max(120, 'expected at most 120 characters')
  .optional()
  .transform((v) => (v ? v : undefined));

/** A date "2025-03-01" (the whole day, UTC) or a full ISO timestamp. */
const optionalDate = (bound: 'from' | 'to') =>
  z
    .string()
    .trim()
    .optional()
    .transform((v, ctx) => {
      if (!v) return undefined;
      const dayOnly = /^\d{4}-\d{2}-\d{2}$/.test(v);
      const d = new Date(dayOnly ? `${v}T00:00:00.000Z` : v);
      if (Number.isNaN(d.getTime())) {
        ctx.addIssue({ code: 'custom', message: `expected a date such as 2025-03-01 or an ISO timestamp, got '${v}'` });
        return z.NEVER;
      }
      if (!isStorableDate(d)) {
        ctx.addIssue({ code: 'custom', message: `expected ${STORABLE_DATE_RANGE_TEXT}, got '${v}'; leave it out for no ${bound === 'from' ? 'start' : 'end'}` });
        return z.NEVER;
      }
      // A bare end date includes that whole day.
      return dayOnly && bound === 'to' ? new Date(d.getTime() + 86_400_000 - 1) : d;
    });

/** The query of GET /api/statistics and its CSV export (snake_case, as in the URL). */
export const StatisticsQuery = z
  .object({
    /** Device type name (or numeric id). */
    device_type: optionalText,
    /** Lot code (or numeric id). */
    lot: optionalText,
    from: optionalDate('from'),
    to: optionalDate('to'),
    /** Which date `from`/`to` apply to: the part's current fit, or its lot's receipt. */
    date_basis: z.enum(['fit', 'lot'], { error: "expected 'fit' (fit created) or 'lot' (lot received)" }).default('fit'),
    /** Histogram ranges per figure; automatic when absent. */
    histogram_bins: z.coerce
      .number({ error: 'expected a whole number of ranges from 3 to 60' })
      .int('expected a whole number of ranges from 3 to 60')
      .min(3, 'expected a whole number of ranges from 3 to 60')
      .max(60, 'expected a whole number of ranges from 3 to 60')
      .optional(),
  })
  .superRefine((q, ctx) => {
    if (q.from && q.to && q.from > q.to) {
      ctx.addIssue({ code: 'custom', path: ['to'], message: 'expected the end date on or after the start date' });
    }
  });
export type StatisticsQuery = z.infer<typeof StatisticsQuery>;

export const STATISTICS_TABLES = ['summary', 'histograms', 'scatter', 'yield', 'bins', 'trend'] as const;
export type StatisticsTable = (typeof STATISTICS_TABLES)[number];

/** The query of `GET /api/statistics/export` (besides the report's own query). */
export const StatisticsExportQuery = z.object({
  table: z.enum(STATISTICS_TABLES, { error: `expected one of ${STATISTICS_TABLES.join(', ')}` }),
});
export type StatisticsExportQuery = z.infer<typeof StatisticsExportQuery>;
