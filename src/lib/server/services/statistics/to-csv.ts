import { FIGURES } from '~/core/statistics/type-report';
import type { StatisticsReport, StatisticsTable } from '~/contracts/statistics';
import { writeCsv as csv } from '~/core/csv/write-csv';

/** Pure: one table of a statistics report as CSV (the shared writer; SI units named in headers). */

export function statisticsTableCsv(report: StatisticsReport, table: StatisticsTable): string {
  const g = report.groups;
  switch (table) {
    case 'summary':
      return csv(
        ['device_type', 'figure', 'unit', 'n', 'mean', 'sd', 'min', 'p5', 'p25', 'median', 'p75', 'p95', 'max', 'lsl', 'usl', 'cpk'],
        g.flatMap((t) =>
          FIGURES.map((f) => {
            const s = t.figures[f.key];
            return [t.device_type.name, f.key, f.unit, s.n, s.mean, s.sd, s.min, s.p5, s.p25, s.median, s.p75, s.p95, s.max, s.lsl, s.usl, s.cpk];
          }),
        ),
      );
    case 'histograms':
      return csv(
        ['device_type', 'figure', 'unit', 'range_lo', 'range_hi', 'count'],
        g.flatMap((t) => FIGURES.flatMap((f) => t.figures[f.key].histogram.map((b) => [t.device_type.name, f.key, f.unit, b.lo, b.hi, b.count]))),
      );
    case 'scatter':
      return csv(
        ['device_type', 'serial', 'lot', 'status', 'idss_a', 'vp_v'],
        g.flatMap((t) => t.scatter.map((p) => [t.device_type.name, p.serial, p.lot_code, p.status, p.idss_a, p.vp_v])),
      );
    case 'yield':
      return csv(
        ['device_type', 'status', 'group', 'count', 'share'],
        g.flatMap((t) => t.yield.by_status.map((s) => [t.device_type.name, s.status, s.group, s.count, s.share])),
      );
    case 'bins':
      return csv(
        ['device_type', 'bin', 'label', 'count', 'share_of_binned'],
        g.flatMap((t) => [...t.bins.map((b) => [t.device_type.name, b.code, b.label, b.count, b.share]), [t.device_type.name, '(no bin)', 'parts without a bin', t.unbinned_count, '']]),
      );
    case 'trend':
      return csv(
        ['device_type', 'lot', 'supplier', 'received_at', 'n', ...FIGURES.flatMap((f) => [`${f.key}_mean`, `${f.key}_sd`])],
        g.flatMap((t) =>
          t.trend.lots.map((l) => [t.device_type.name, l.lot_code, l.supplier, l.received_at, l.n, ...FIGURES.flatMap((f) => [l[`${f.key}_mean`], l[`${f.key}_sd`]])]),
        ),
      );
  }
}

/** A file name that says what the table holds. */
export function statisticsCsvFileName(report: StatisticsReport, table: StatisticsTable): string {
  const s = report.selection;
  const parts = ['sluice', table, s.device_type, s.lot ? `lot-${s.lot}` : null, s.from?.slice(0, 10), s.to?.slice(0, 10)].filter(Boolean);
  return `${parts.join('_').replace(/[^A-Za-z0-9._-]+/g, '-')}.csv`;
}
