import { Axis, BarSeries, GlyphSeries, Grid, LineSeries, Tooltip, XYChart } from '@visx/xychart';
import { formatDate } from '~/core/units/format-date';
import { CHART_COLORS, chartTheme } from './chart-kit';

/** Display scale of each figure: SI value × factor, shown in `unit`. */
export const DISPLAY = {
  idss_a: { factor: 1e3, unit: 'mA', label: 'IDSS', decimals: 3 },
  vp_v: { factor: 1, unit: 'V', label: 'VP', decimals: 3 },
  gos_s: { factor: 1e6, unit: 'µS', label: 'gos', decimals: 2 },
  gfs_s: { factor: 1e3, unit: 'mS', label: 'gfs', decimals: 3 },
} as const;
export type DisplayKey = keyof typeof DISPLAY;

const MARGIN = { top: 12, right: 16, bottom: 44, left: 52 };

function fmt(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return '—';
  return Number(v.toPrecision(digits)).toString().replace('-', '\u2212');
}

interface HistBar {
  mid: number;
  lo: number;
  hi: number;
  count: number;
  outside: boolean;
}

const MAX_BARS = 60;

/**
 * Bars in display units, extended with empty ranges of the same width out to the spec limits
 * (up to MAX_BARS in all): the bar series draws every bar the same width, innerWidth / count,
 * so the bars must tile the x domain exactly.
 */
function paddedBars(bins: { lo: number; hi: number; count: number }[], factor: number, lsl: number | null, usl: number | null): HistBar[] {
  if (bins.length === 0) return [];
  const outside = (lo: number, hi: number) => (lsl !== null && hi <= lsl * factor) || (usl !== null && lo >= usl * factor);
  let bars = bins.map((b) => ({ lo: b.lo * factor, hi: b.hi * factor, count: b.count }));
  if (bars.length === 1 && bars[0].lo === bars[0].hi) {
    const half = Math.abs(bars[0].lo) * 0.01 || 0.5;
    bars = [{ lo: bars[0].lo - half, hi: bars[0].hi + half, count: bars[0].count }];
  }
  const w = (bars[bars.length - 1].hi - bars[0].lo) / bars.length;
  const lo = lsl !== null ? lsl * factor : Infinity;
  const hi = usl !== null ? usl * factor : -Infinity;
  while (bars.length < MAX_BARS && bars[0].lo > lo) bars.unshift({ lo: bars[0].lo - w, hi: bars[0].lo, count: 0 });
  while (bars.length < MAX_BARS && bars[bars.length - 1].hi < hi) {
    const last = bars[bars.length - 1].hi;
    bars.push({ lo: last, hi: last + w, count: 0 });
  }
  return bars.map((b) => ({ ...b, mid: (b.lo + b.hi) / 2, outside: outside(b.lo, b.hi) }));
}

export function HistogramChart({
  width,
  height,
  figure,
  bins,
  lsl,
  usl,
}: {
  width: number;
  height: number;
  figure: DisplayKey;
  bins: { lo: number; hi: number; count: number }[];
  lsl: number | null;
  usl: number | null;
}) {
  const d = DISPLAY[figure];
  const data = paddedBars(bins, d.factor, lsl, usl);
  const top = Math.max(1, ...data.map((b) => b.count));
  const domain = [data[0]?.lo ?? 0, data[data.length - 1]?.hi ?? 1];
  // Lines beyond the padded range are left out (the subtitle still names the limits).
  const limitLines = [
    ...(lsl !== null ? [{ key: 'lsl', x: lsl * d.factor }] : []),
    ...(usl !== null ? [{ key: 'usl', x: usl * d.factor }] : []),
  ].filter((l) => l.x >= domain[0] && l.x <= domain[1]);
  return (
    <XYChart
      width={width}
      height={height}
      margin={MARGIN}
      theme={chartTheme}
      accessibilityLabel={`Histogram of ${d.label}`}
      xScale={{ type: 'linear', domain: [domain[0], domain[1]], zero: false }}
      yScale={{ type: 'linear', domain: [0, top * 1.08], nice: true }}
    >
      <Grid columns={false} numTicks={4} />
      <BarSeries<any, any, HistBar>
        dataKey="count"
        data={data}
        xAccessor={(b) => b.mid}
        yAccessor={(b) => b.count}
        barPadding={0.06}
        colorAccessor={(b) => (b.outside ? CHART_COLORS.outside : CHART_COLORS.bar)}
      />
      {limitLines.map((l) => (
        <LineSeries<any, any, { x: number; y: number }>
          key={l.key}
          dataKey={l.key}
          data={[{ x: l.x, y: 0 }, { x: l.x, y: top * 1.08 }]}
          xAccessor={(p) => p.x}
          yAccessor={(p) => p.y}
          stroke={CHART_COLORS.limit}
          strokeDasharray="5 3"
          strokeWidth={1.5}
          enableEvents={false}
        />
      ))}
      <Axis orientation="bottom" label={`${d.label} (${d.unit})`} numTicks={6} tickFormat={(v: number) => fmt(v)} />
      <Axis orientation="left" label="parts" numTicks={4} />
      <Tooltip<HistBar>
        snapTooltipToDatumX
        renderTooltip={({ tooltipData }) => {
          const b = tooltipData?.nearestDatum?.key === 'count' ? (tooltipData.nearestDatum.datum as HistBar) : null;
          return b ? (
            <span>
              {fmt(b.lo)} to {fmt(b.hi)} {d.unit}: {b.count} parts
            </span>
          ) : null;
        }}
      />
    </XYChart>
  );
}

interface ScatterPoint {
  serial: string;
  vp: number;
  idss: number;
}

export function ScatterChart({
  width,
  height,
  points,
  limits,
}: {
  width: number;
  height: number;
  points: { serial: string; idss_a: number; vp_v: number }[];
  limits: { idss_min_a: number | null; idss_max_a: number | null; vp_min_v: number | null; vp_max_v: number | null };
}) {
  const data: ScatterPoint[] = points.map((p) => ({ serial: p.serial, vp: p.vp_v, idss: p.idss_a * 1e3 }));
  const hasBox = limits.idss_min_a !== null && limits.idss_max_a !== null && limits.vp_min_v !== null && limits.vp_max_v !== null;
  const box = hasBox
    ? (() => {
        const i0 = limits.idss_min_a! * 1e3;
        const i1 = limits.idss_max_a! * 1e3;
        const v0 = limits.vp_min_v!;
        const v1 = limits.vp_max_v!;
        return [
          { x: v0, y: i0 },
          { x: v1, y: i0 },
          { x: v1, y: i1 },
          { x: v0, y: i1 },
          { x: v0, y: i0 },
        ];
      })()
    : [];
  return (
    <XYChart
      width={width}
      height={height}
      margin={MARGIN}
      theme={chartTheme}
      accessibilityLabel="VP against IDSS, one point per part"
      xScale={{ type: 'linear', nice: true, zero: false }}
      yScale={{ type: 'linear', nice: true, zero: false }}
    >
      <Grid numTicks={5} />
      {hasBox && (
        <LineSeries<any, any, { x: number; y: number }>
          dataKey="spec"
          data={box}
          xAccessor={(p) => p.x}
          yAccessor={(p) => p.y}
          stroke={CHART_COLORS.limit}
          strokeDasharray="5 3"
          strokeWidth={1.5}
          enableEvents={false}
        />
      )}
      <GlyphSeries<any, any, ScatterPoint>
        dataKey="parts"
        data={data}
        xAccessor={(p) => p.vp}
        yAccessor={(p) => p.idss}
        size={5}
        colorAccessor={() => CHART_COLORS.point}
      />
      <Axis orientation="bottom" label="VP (V)" numTicks={6} tickFormat={(v: number) => fmt(v)} />
      <Axis orientation="left" label="IDSS (mA)" numTicks={5} tickFormat={(v: number) => fmt(v)} />
      <Tooltip<ScatterPoint>
        renderTooltip={({ tooltipData }) => {
          const p = tooltipData?.nearestDatum?.key === 'parts' ? (tooltipData.nearestDatum.datum as ScatterPoint) : null;
          return p ? (
            <span>
              {p.serial}: VP {fmt(p.vp, 4)} V, IDSS {fmt(p.idss, 4)} mA
            </span>
          ) : null;
        }}
      />
    </XYChart>
  );
}

interface TrendPoint {
  t: Date;
  mean: number;
  code: string;
  n: number;
  selected: boolean;
}

export function TrendChart({
  width,
  height,
  figure,
  lots,
  slopePerDay,
}: {
  width: number;
  height: number;
  figure: DisplayKey;
  lots: { lot_code: string; received_at: string; n: number; selected: boolean; mean: number | null }[];
  /** Least-squares slope in SI per day; null draws the lot means alone. */
  slopePerDay: number | null;
}) {
  const d = DISPLAY[figure];
  const data: TrendPoint[] = lots
    .filter((l) => l.mean !== null)
    .map((l) => ({ t: new Date(l.received_at), mean: l.mean! * d.factor, code: l.lot_code, n: l.n, selected: l.selected }));
  const dateFmt = { format: (d: Date) => formatDate(d) };
  // The least-squares line goes through the centroid of the lot means; drawn only when the
  // server found enough lots over a long enough span for a trend.
  const line: TrendPoint[] = [];
  if (slopePerDay !== null && data.length >= 2) {
    const t0 = Math.min(...data.map((p) => p.t.getTime()));
    const days = data.map((p) => (p.t.getTime() - t0) / 86_400_000);
    const xMean = days.reduce((a, b) => a + b, 0) / days.length;
    const yMean = data.reduce((a, p) => a + p.mean, 0) / data.length;
    const at = (day: number): TrendPoint => ({ t: new Date(t0 + day * 86_400_000), mean: yMean + slopePerDay * d.factor * (day - xMean), code: '', n: 0, selected: false });
    line.push(at(Math.min(...days)), at(Math.max(...days)));
  }
  // Room either side so the first and last lots are not drawn on the axes.
  const times = data.map((p) => p.t.getTime());
  const span = times.length ? Math.max(...times) - Math.min(...times) : 0;
  const pad = Math.max(span * 0.06, 3 * 86_400_000);
  const xDomain = times.length ? [new Date(Math.min(...times) - pad), new Date(Math.max(...times) + pad)] : undefined;
  return (
    <XYChart
      width={width}
      height={height}
      margin={MARGIN}
      theme={chartTheme}
      accessibilityLabel={`Lot means of ${d.label} by date received`}
      xScale={{ type: 'time', domain: xDomain }}
      yScale={{ type: 'linear', nice: true, zero: false }}
    >
      <Grid numTicks={4} />
      {line.length > 0 && <LineSeries<any, any, TrendPoint> dataKey="trend" data={line} xAccessor={(p) => p.t} yAccessor={(p) => p.mean} stroke={CHART_COLORS.line} enableEvents={false} />}
      <GlyphSeries<any, any, TrendPoint>
        dataKey="lots"
        data={data}
        xAccessor={(p) => p.t}
        yAccessor={(p) => p.mean}
        size={(p) => (p.selected ? 11 : 7)}
        colorAccessor={(p) => (p.selected ? CHART_COLORS.selected : CHART_COLORS.point)}
      />
      <Axis orientation="bottom" label="lot received" numTicks={Math.max(2, Math.min(6, Math.floor(width / 110)))} tickFormat={(v: Date) => dateFmt.format(v)} />
      <Axis orientation="left" label={`mean ${d.label} (${d.unit})`} numTicks={4} tickFormat={(v: number) => fmt(v)} />
      <Tooltip<TrendPoint>
        renderTooltip={({ tooltipData }) => {
          const p = tooltipData?.nearestDatum?.key === 'lots' ? (tooltipData.nearestDatum.datum as TrendPoint) : null;
          return p ? (
            <span>
              Lot {p.code} ({dateFmt.format(p.t)}, {p.n} parts): {fmt(p.mean, 4)} {d.unit}
            </span>
          ) : null;
        }}
      />
    </XYChart>
  );
}
