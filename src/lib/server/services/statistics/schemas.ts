import { z } from 'zod';
import { STORABLE_DATE_RANGE_TEXT, isStorableDate } from '~/core/dates/storable-date';

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

export const StatisticsExportQuery = z.object({
  table: z.enum(STATISTICS_TABLES, { error: `expected one of ${STATISTICS_TABLES.join(', ')}` }),
});

/** URLSearchParams → plain object for zod (empty strings count as absent). */
export function queryObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) if (v !== '') out[k] = v;
  return out;
}
