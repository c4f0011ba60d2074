import { AppError } from '../errors';
export interface YieldBreakdown {
  total: number;
  /** Sum of counts whose status is in `passingStatuses`. */
  passing: number;
  /** passing / total; null when total is 0. */
  yieldShare: number | null;
  /** One row per status, largest count first (ties by status name). */
  entries: { status: string; count: number; share: number | null }[];
}

/**
 * Shares of parts per status (e.g. binned, hold, review, rejected) and the yield: the share
 * whose status is one of `passingStatuses` (default: 'binned').
 */
export function yieldBreakdown(
  statusCounts: Readonly<Record<string, number>>,
  passingStatuses: readonly string[] = ['binned'],
): YieldBreakdown {
  const rows = Object.entries(statusCounts);
  for (const [status, count] of rows) {
    if (!Number.isInteger(count) || count < 0) {
      throw new AppError('yield_count_invalid', { status, count });
    }
  }
  const total = rows.reduce((s, [, c]) => s + c, 0);
  const passing = rows.filter(([s]) => passingStatuses.includes(s)).reduce((s, [, c]) => s + c, 0);
  return {
    total,
    passing,
    yieldShare: total > 0 ? passing / total : null,
    entries: rows
      .map(([status, count]) => ({ status, count, share: total > 0 ? count / total : null }))
      .sort((a, b) => b.count - a.count || a.status.localeCompare(b.status)),
  };
}
