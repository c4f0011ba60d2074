import { useMemo, useState, type CSSProperties, type FormEvent } from 'react';
import type { TypeStatistics } from '~/contracts/statistics';
import { formatDate } from '~/core/units/format-date';
import { binShareGrid, type BinShareGrid } from '~/core/statistics/bin-share-grid';
import { vdsInDatasheetSign } from '~/core/units/datasheet-sign';
import { formatMeasured, formatNumber, formatOpenRange, formatPercent, formatQuantityRange, formatSignificant, type QuantityUnit } from '~/core/units/format-quantity';
import { useStatistics, useStatisticsOptions } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import { ChartCard } from './chart-kit';
import { DISPLAY, HistogramChart, ScatterChart, TrendChart, type DisplayKey } from './charts';

interface Selection {
  device_type: string;
  lot: string;
  from: string;
  to: string;
  date_basis: 'fit' | 'lot';
}

const FIGURE_KEYS: DisplayKey[] = ['idss_a', 'vp_v', 'gos_s', 'gfs_s'];

function toQuery(s: Selection): string {
  const p = new URLSearchParams();
  if (s.device_type) p.set('device_type', s.device_type);
  if (s.lot) p.set('lot', s.lot);
  if (s.from) p.set('from', s.from);
  if (s.to) p.set('to', s.to);
  if ((s.from || s.to) && s.date_basis !== 'fit') p.set('date_basis', s.date_basis);
  return p.toString();
}

/**
 * A figure in its display unit with that unit's fixed number of decimals (one unit and one
 * resolution per column), with the true minus sign.
 */
function shown(v: number | null | undefined, key: DisplayKey, extraDigits = 0): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return formatNumber(v * DISPLAY[key].factor, DISPLAY[key].decimals + extraDigits);
}

const SI_UNIT: Record<DisplayKey, QuantityUnit> = { idss_a: 'A', vp_v: 'V', gos_s: 'S', gfs_s: 'S' };

/** "drift −12 ± 5 mV per 30 days over 96 days (6 lots)", or why there is none. */
function driftText(d: TypeStatistics['trend']['drift'][DisplayKey], key: DisplayKey): string {
  if (!d.enough || d.per_day === null) return d.reason ?? 'Not enough lots for a trend.';
  const [period, periodDays] = d.span_days > 400 ? ['per year', 365] : ['per 30 days', 30];
  const m = formatMeasured(d.per_day * periodDays, d.se_per_day === null ? null : d.se_per_day * periodDays, SI_UNIT[key]);
  const significant = d.se_per_day !== null && Math.abs(d.per_day) > 2 * d.se_per_day;
  return `drift ${m.text} ${period} over ${Math.round(d.span_days)} days (${d.lots} lots, least squares, ± one standard error)${significant ? '' : '; not distinguishable from no drift'}`;
}

function pct(v: number | null): string {
  return v === null ? '—' : `${(v * 100).toFixed(1)} %`;
}

function CsvLink({ table, query, label }: { table: string; query: string; label: string }) {
  return (
    <a className="btn-quiet px-2 py-0.5 text-xs no-underline hover:no-underline" href={`/api/statistics/export?table=${table}${query ? `&${query}` : ''}`} download>
      CSV · {label}
    </a>
  );
}

/** Colour follows the printed value, so a Cpk shown as 1.00 is never marked below 1. */
function CpkTag({ value }: { value: number }) {
  const shownValue = Number(value.toFixed(2));
  return <span className={shownValue < 1 ? 'tag-fault' : shownValue < 1.33 ? 'tag-review' : 'tag-ok'}>{shownValue.toFixed(2).replace('-', '\u2212')}</span>;
}

function SummaryTable({ g, query }: { g: TypeStatistics; query: string }) {
  return (
    <section className="card overflow-x-auto" aria-label="Summary of figures">
      <div className="flex flex-wrap items-baseline justify-between gap-2 mb-2">
        <h3>Summary</h3>
        <CsvLink table="summary" query={query} label="summary" />
      </div>
      <table className="table-plain">
        <thead>
          <tr>
            <th>Figure</th>
            <th className="num">n</th>
            <th className="num">mean</th>
            <th className="num">sd</th>
            <th className="num">min</th>
            <th className="num">p5</th>
            <th className="num">p25</th>
            <th className="num">median</th>
            <th className="num">p75</th>
            <th className="num">p95</th>
            <th className="num">max</th>
            <th className="num">spec limits</th>
            <th className="num" title="against the type's spec limits, sample σ of all parts">Cpk</th>
          </tr>
        </thead>
        <tbody>
          {FIGURE_KEYS.map((k) => {
            const f = g.figures[k];
            const limits = f.lsl === null && f.usl === null ? '—' : `${f.lsl === null ? '…' : shown(f.lsl, k)} to ${f.usl === null ? '…' : shown(f.usl, k)}`;
            return (
              <tr key={k}>
                <td className="whitespace-nowrap">
                  {DISPLAY[k].label} <span className="text-ink-faint">({DISPLAY[k].unit})</span>
                </td>
                <td className="num">{f.n}</td>
                <td className="num">{shown(f.mean, k)}</td>
                <td className="num">{shown(f.sd, k)}</td>
                <td className="num">{shown(f.min, k)}</td>
                <td className="num">{shown(f.p5, k)}</td>
                <td className="num">{shown(f.p25, k)}</td>
                <td className="num">{shown(f.median, k)}</td>
                <td className="num">{shown(f.p75, k)}</td>
                <td className="num">{shown(f.p95, k)}</td>
                <td className="num">{shown(f.max, k)}</td>
                <td className="num">{limits}</td>
                <td className="num">
                  {f.cpk === null ? '—' : <CpkTag value={f.cpk} />}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="text-xs text-ink-faint mt-2">
        Percentiles interpolate between sorted values. Cpk = min(USL − mean, mean − LSL) / 3·sd over all parts (no subgroups), against the device type’s limits;
        below 1.00 marked red, below 1.33 amber. IDSS, gfs and gos at the fits’ test VDS: {g.fit_vds_test_v.length ? g.fit_vds_test_v.map((v) => `${v} V`).join(', ') : '—'}.
      </p>
    </section>
  );
}

/** A shade of the channel colour for a share of the busiest cell (0 → paper, 1 → full). */
function cellShade(count: number, maxCount: number): CSSProperties {
  if (count === 0 || maxCount === 0) return {};
  const t = 0.12 + 0.88 * (count / maxCount);
  return { backgroundColor: `rgba(33, 126, 122, ${t.toFixed(3)})`, color: t > 0.55 ? '#fff' : undefined };
}

const rangeText = (r: { lo: number; hi: number } | null, unit: 'A' | 'V') => (r ? formatQuantityRange(r.lo, r.hi, unit, unit === 'A' ? 1 : 2) : 'all');

/** Share per bin drawn over the plan's grid: IDSS across, VP down; shade by count. */
function BinShareGridView({ grid, channel, labelOf }: { grid: BinShareGrid; channel: 'n' | 'p'; labelOf: (code: string) => string }) {
  // Bin plans hold IDSS as a magnitude; headings show it in datasheet sign like every figure.
  const idssText = (r: { lo: number; hi: number } | null) => (r && channel === 'p' ? rangeText({ lo: -r.lo, hi: -r.hi }, 'A') : rangeText(r, 'A'));
  return (
    <div>
      <div className="overflow-x-auto" data-testid="bin-share-grid">
        <table className="border-collapse text-xs" aria-label="Parts per bin over VP and IDSS">
          <thead>
            <tr>
              <th className="px-1 py-1 text-left font-semibold text-ink-soft whitespace-nowrap">VP ↓ · IDSS →</th>
              {grid.idss.map((r, i) => (
                <th key={i} scope="col" className="px-1 py-1 font-normal text-ink-soft whitespace-nowrap [writing-mode:vertical-rl] rotate-180 h-24 align-bottom">
                  {idssText(r)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {grid.vp.map((r, ri) => (
              <tr key={ri}>
                <th scope="row" className="px-1 py-0.5 text-right font-normal text-ink-soft whitespace-nowrap">
                  {rangeText(r, 'V')}
                </th>
                {grid.cells[ri].map((c, ci) => (
                  <td
                    key={ci}
                    className="h-8 min-w-[2.25rem] border border-paper-line text-center tabular-nums"
                    style={c ? cellShade(c.count, grid.maxCount) : { background: 'repeating-linear-gradient(45deg, transparent 0 4px, rgba(0,0,0,0.06) 4px 5px)' }}
                    title={c ? `${c.code} · ${labelOf(c.code)}: ${c.count} parts (${formatPercent(c.share)})` : 'no bin'}
                  >
                    {c && c.count > 0 ? c.count : ''}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-2 text-xs text-ink-soft">
        Each cell is one bin; the number is its parts, darker is more (busiest: {grid.maxCount}). Hover a cell for its code and share.
        {grid.offGrid.map((o) => ` ${o.code}: ${o.count} parts (${formatPercent(o.share)}).`).join('')}
      </p>
    </div>
  );
}

function BinShareList({ g, maxShare }: { g: TypeStatistics; maxShare: number }) {
  return (
    <table className="table-plain">
      <thead>
        <tr>
          <th>Bin</th>
          <th className="num">parts</th>
          <th className="num">share</th>
          <th className="w-2/5">
            <span className="sr-only">bar</span>
          </th>
        </tr>
      </thead>
      <tbody>
        {g.bins.map((b) => (
          <tr key={b.code}>
            <td>
              <span className="font-mono text-xs">{b.code}</span> <span className="text-ink-soft text-xs">{b.label !== b.code ? b.label : ''}</span>
            </td>
            <td className="num">{b.count}</td>
            <td className="num">{pct(b.share)}</td>
            <td>
              <div className="h-3 rounded-sm bg-channel-400" style={{ width: `${((b.share ?? 0) / maxShare) * 100}%` }} aria-hidden="true" />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function YieldAndBins({ g, query }: { g: TypeStatistics; query: string }) {
  const y = g.yield;
  const maxShare = Math.max(0.0001, ...g.bins.map((b) => b.share ?? 0));
  const grid = useMemo(() => binShareGrid(g.bins), [g.bins]);
  return (
    <div className={grid ? 'grid grid-cols-1 gap-4' : 'grid grid-cols-1 gap-4 lg:grid-cols-2'}>
      <section className="card" aria-label="Yield">
        <div className="flex flex-wrap items-baseline justify-between gap-2 mb-2">
          <h3>Yield</h3>
          <CsvLink table="yield" query={query} label="yield" />
        </div>
        <dl className="grid grid-cols-3 gap-3 mb-3 text-center">
          <div className="rounded bg-state-okbg p-2">
            <dt className="text-xs text-ink-soft">accepted</dt>
            <dd className="text-xl font-semibold">{y.accepted}</dd>
          </div>
          <div className="rounded bg-state-reviewbg p-2">
            <dt className="text-xs text-ink-soft">in review</dt>
            <dd className="text-xl font-semibold">{y.in_review}</dd>
          </div>
          <div className="rounded bg-state-faultbg p-2">
            <dt className="text-xs text-ink-soft">rejected / scrapped</dt>
            <dd className="text-xl font-semibold">{y.rejected}</dd>
          </div>
        </dl>
        <p className="text-sm mb-2">
          Yield <strong>{pct(y.yield_share)}</strong> of {y.total} parts (accepted, in stock, reserved, issued or returned).
        </p>
        <table className="table-plain">
          <thead>
            <tr>
              <th>Status</th>
              <th className="num">parts</th>
              <th className="num">share</th>
            </tr>
          </thead>
          <tbody>
            {y.by_status.map((s) => (
              <tr key={s.status}>
                <td>
                  {s.status.replace('_', ' ')} <span className="text-ink-faint text-xs">· {s.group.replace('_', ' ')}</span>
                </td>
                <td className="num">{s.count}</td>
                <td className="num">{pct(s.share)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section className="card" aria-label="Share per bin">
        <div className="flex flex-wrap items-baseline justify-between gap-2 mb-2">
          <h3>Share per bin</h3>
          <CsvLink table="bins" query={query} label="bins" />
        </div>
        {g.bins.length === 0 ? (
          <Empty>No binned parts here{g.unbinned_count ? `: ${g.unbinned_count} parts have no bin yet` : ''}. Bins come from the type’s active bin plan.</Empty>
        ) : grid ? (
          <BinShareGridView grid={grid} channel={g.device_type.channel} labelOf={(code) => g.bins.find((b) => b.code === code)?.label ?? code} />
        ) : (
          <BinShareList g={g} maxShare={maxShare} />
        )}
        {g.bins.length > 0 && <p className="text-xs text-ink-faint mt-2">Shares of the {g.part_count - g.unbinned_count} binned parts; {g.unbinned_count} without a bin.</p>}
      </section>
    </div>
  );
}

function TrendSection({ g, query, fileStem }: { g: TypeStatistics; query: string; fileStem: string }) {
  const [figure, setFigure] = useState<DisplayKey>('idss_a');
  const drift = g.trend.drift[figure];
  const lots = g.trend.lots.map((l) => ({ ...l, mean: l[`${figure}_mean`] }));
  return (
    <section className="grid gap-4 lg:grid-cols-[3fr_2fr]">
      <ChartCard
        title={`Lot means of ${DISPLAY[figure].label} over time`}
        subtitle={
          <>
            {g.trend.lots.length} lots by date received · <span data-testid="trend-drift">{driftText(drift, figure)}</span>
            {g.trend.lots.some((l) => l.selected) && ' · the selected lot in red'}
          </>
        }
        fileName={`${fileStem}-trend-${figure}`}
        height={280}
      >
        {(w) => (lots.filter((l) => l.mean !== null).length === 0 ? <Empty>No lot with fitted parts to plot.</Empty> : <TrendChart width={w} height={280} figure={figure} lots={lots} slopePerDay={drift.enough ? drift.per_day : null} />)}
      </ChartCard>
      <div className="card overflow-hidden flex flex-col">
        <div className="flex flex-wrap items-center justify-between gap-2 mb-2">
          <label className="text-sm font-semibold text-ink-soft flex items-center gap-2">
            Figure
            <select className="input py-0.5 w-auto" value={figure} onChange={(e) => setFigure(e.target.value as DisplayKey)} aria-label="Trend figure">
              {FIGURE_KEYS.map((k) => (
                <option key={k} value={k}>
                  {DISPLAY[k].label} ({DISPLAY[k].unit})
                </option>
              ))}
            </select>
          </label>
          <CsvLink table="trend" query={query} label="trend" />
        </div>
        <div className="overflow-auto max-h-64">
          <table className="table-plain">
            <thead>
              <tr>
                <th>Lot</th>
                <th>Received</th>
                <th className="num">n</th>
                <th className="num">mean</th>
                <th className="num">sd</th>
              </tr>
            </thead>
            <tbody>
              {g.trend.lots.map((l) => (
                <tr key={l.lot_id} className={l.selected ? 'bg-state-faultbg' : undefined}>
                  <td>
                    {l.lot_code}
                    {l.supplier && <span className="block text-xs text-ink-faint">{l.supplier}</span>}
                  </td>
                  <td className="whitespace-nowrap">{formatDate(l.received_at)}</td>
                  <td className="num">{l.n}</td>
                  <td className="num">{shown(l[`${figure}_mean`], figure)}</td>
                  <td className="num">{shown(l[`${figure}_sd`], figure)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
    </section>
  );
}

function TypeGroup({ g, query }: { g: TypeStatistics; query: string }) {
  const t = g.device_type;
  const fileStem = `sluice-${t.name}`.replace(/[^A-Za-z0-9_-]+/g, '-');
  return (
    <section className="space-y-4" aria-label={`Statistics of ${t.name}`}>
      <header className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
        <h2>{t.name}</h2>
        <span className="tag-plain">{t.channel === 'n' ? 'N-channel' : 'P-channel'}</span>
        <span className="text-sm text-ink-soft">
          {g.part_count} parts, {g.fitted_count} with a current fit · spec IDSS {formatOpenRange(t.idss_min_a, t.idss_max_a, 'A', 1)} at VDS{' '}
          {formatSignificant(vdsInDatasheetSign(t.vds_test_v, t.channel), 'V', 3)}, VP {formatOpenRange(t.vp_min_v, t.vp_max_v, 'V', 2)} (datasheet signs)
        </span>
      </header>
      {g.part_count === 0 ? (
        <Empty>No parts of {t.name} in this selection.</Empty>
      ) : (
        <>
          <SummaryTable g={g} query={query} />
          <div className="flex items-baseline justify-between gap-2">
            <h3>Distributions</h3>
            <span className="flex gap-1">
              <CsvLink table="histograms" query={query} label="histograms" />
              <CsvLink table="scatter" query={query} label="points" />
            </span>
          </div>
          <div className="grid gap-4 md:grid-cols-2">
            {FIGURE_KEYS.map((k) => {
              const f = g.figures[k];
              const limits = f.lsl !== null || f.usl !== null ? ` · spec ${f.lsl === null ? '…' : shown(f.lsl, k)} to ${f.usl === null ? '…' : shown(f.usl, k)} ${DISPLAY[k].unit} (dashed)` : '';
              return (
                <ChartCard key={k} title={`${DISPLAY[k].label} (${DISPLAY[k].unit})`} subtitle={`${f.n} parts${limits}`} fileName={`${fileStem}-histogram-${k}`} height={230}>
                  {(w) => (f.n === 0 ? <Empty>No fitted parts.</Empty> : <HistogramChart width={w} height={230} figure={k} bins={f.histogram} lsl={f.lsl} usl={f.usl} />)}
                </ChartCard>
              );
            })}
          </div>
          <ChartCard
            title="VP against IDSS"
            subtitle={`${g.scatter.length} parts${g.scatter_truncated ? ' (the first 5000)' : ''} · dashed box: the type’s spec limits`}
            fileName={`${fileStem}-vp-idss`}
            height={340}
          >
            {(w) => (g.scatter.length === 0 ? <Empty>No fitted parts.</Empty> : <ScatterChart width={w} height={340} points={g.scatter} limits={t} />)}
          </ChartCard>
          <YieldAndBins g={g} query={query} />
          <h3>Trend of lot means</h3>
          <TrendSection g={g} query={query} fileStem={fileStem} />
        </>
      )}
    </section>
  );
}

/** Statistics of a lot, a device type or a date range, with charts, tables and exports. */
export default function StatisticsExplorer({ initial }: { initial: Partial<Selection> }) {
  const start: Selection = { device_type: '', lot: '', from: '', to: '', date_basis: 'fit', ...initial };
  const [draft, setDraft] = useState<Selection>(start);
  const [applied, setApplied] = useState<Selection>(start);
  const options = useStatisticsOptions();
  const query = toQuery(applied);
  const report = useStatistics(query);
  const lots = useMemo(
    () => (options.data?.lots ?? []).filter((l) => !draft.device_type || l.device_type === draft.device_type),
    [options.data, draft.device_type],
  );

  function apply(e: FormEvent) {
    e.preventDefault();
    setApplied(draft);
    const q = toQuery(draft);
    window.history.replaceState(null, '', `${window.location.pathname}${q ? `?${q}` : ''}`);
  }
  const set = (patch: Partial<Selection>) => setDraft((d) => ({ ...d, ...patch }));

  return (
    <div className="space-y-6">
      <form onSubmit={apply} className="card grid gap-4 md:grid-cols-2 lg:grid-cols-[1fr_1.3fr_0.8fr_0.8fr_auto_auto] items-end" aria-label="Choose what to summarize">
        <div>
          <label className="field" htmlFor="stat-type">Device type</label>
          <select id="stat-type" className="input" value={draft.device_type} onChange={(e) => set({ device_type: e.target.value, lot: '' })}>
            <option value="">All types</option>
            {options.data?.device_types.map((t) => (
              <option key={t.id} value={t.name}>
                {t.name} ({t.channel.toUpperCase()})
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="stat-lot">Lot</label>
          <select id="stat-lot" className="input" value={draft.lot} onChange={(e) => set({ lot: e.target.value })}>
            <option value="">All lots</option>
            {lots.map((l) => (
              <option key={l.id} value={l.code}>
                {l.code} · {l.device_type} · {l.part_count} parts · {formatDate(l.received_at)}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label className="field" htmlFor="stat-from">From</label>
          <input id="stat-from" className="input" type="date" value={draft.from} onChange={(e) => set({ from: e.target.value })} />
        </div>
        <div>
          <label className="field" htmlFor="stat-to">To (inclusive)</label>
          <input id="stat-to" className="input" type="date" value={draft.to} onChange={(e) => set({ to: e.target.value })} />
        </div>
        <fieldset className="text-sm">
          <legend className="field">Dates are of</legend>
          <label className="mr-3 whitespace-nowrap">
            <input type="radio" name="basis" checked={draft.date_basis === 'fit'} onChange={() => set({ date_basis: 'fit' })} /> the fit
          </label>
          <label className="whitespace-nowrap">
            <input type="radio" name="basis" checked={draft.date_basis === 'lot'} onChange={() => set({ date_basis: 'lot' })} /> lot receipt
          </label>
        </fieldset>
        <button className="btn-primary justify-center" type="submit">
          Show statistics
        </button>
      </form>
      {options.error && <ErrorNotice error={options.error} retry={options.reload} />}
      {report.loading && <Loading what="statistics" />}
      {report.error && <ErrorNotice error={report.error} retry={report.reload} />}
      {report.data && !report.loading && report.data.groups.length === 0 && (
        <Empty>No parts match this selection. Widen the dates or choose another lot or type.</Empty>
      )}
      {report.data && !report.loading && report.data.groups.map((g) => <TypeGroup key={g.device_type.id} g={g} query={query} />)}
    </div>
  );
}
