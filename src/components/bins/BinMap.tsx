import { useCallback, useContext, useEffect, useMemo, useRef, useState } from 'react';
import { Axis, DataContext, GlyphSeries, Grid, XYChart, buildChartTheme } from '@visx/xychart';
import type { BinMapJson } from '~/contracts/bins';
import { useBinMap } from '../api';
import { Empty, ErrorNotice, Loading } from '../ui/states';
import { gridCells, mapExtent, type GridCell, type MapBin } from './bin-grid';
import BinPartsList from './BinPartsList';

type MapPoint = BinMapJson['points'][number];

const STATUS_COLOUR: Record<string, string> = {
  in_stock: '#14524f',
  accepted: '#a4650a',
  reserved: '#5b5a8f',
  issued: '#6b7c85',
  returned: '#b3352b',
};

const theme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: ['#14524f'],
  gridColor: '#d9d7cc',
  gridColorDark: '#3d4f59',
  tickLength: 4,
  svgLabelSmall: { fill: '#3d4f59', fontSize: 11, fontFamily: '"Source Sans 3", sans-serif' },
  svgLabelBig: { fill: '#15232b', fontSize: 13, fontFamily: '"Source Sans 3", sans-serif' },
});

/** The bin grid under the points: each cell shaded by its on-hand count, clickable. */
function BinGridLayer({ cells, maxOnHand, selected, onSelect }: { cells: GridCell[]; maxOnHand: number; selected: number | null; onSelect: (b: MapBin) => void }) {
  const ctx = useContext(DataContext);
  if (!ctx.xScale || !ctx.yScale) return null;
  const x = ctx.xScale as unknown as (v: number) => number;
  const y = ctx.yScale as unknown as (v: number) => number;
  return (
    <g data-testid="bin-grid">
      {cells.map((c) => {
        const left = x(c.x0 * 1e3);
        const right = x(c.x1 * 1e3);
        const top = y(c.y1);
        const bottom = y(c.y0);
        const share = maxOnHand > 0 ? c.bin.on_hand / maxOnHand : 0;
        const isSel = selected === c.bin.id;
        return (
          <g key={c.bin.id} onClick={() => onSelect(c.bin)} style={{ cursor: 'pointer' }} data-bin-code={c.bin.code}>
            <title>{`${c.bin.code} — ${c.bin.label}\n${c.bin.on_hand} on hand · ${c.bin.reserved} reserved · ${c.bin.issued} issued`}</title>
            <rect
              x={Math.min(left, right)}
              y={Math.min(top, bottom)}
              width={Math.abs(right - left)}
              height={Math.abs(bottom - top)}
              fill={c.bin.low ? '#b3352b' : '#217e7a'}
              fillOpacity={c.bin.on_hand === 0 ? 0.02 : 0.1 + 0.5 * share}
              stroke={isSel ? '#15232b' : '#9fd3cf'}
              strokeWidth={isSel ? 2.5 : 1}
            />
            {Math.abs(right - left) > 24 && Math.abs(bottom - top) > 16 && (
              <text x={Math.min(left, right) + 3} y={Math.min(top, bottom) + 11} fontSize={10} fontWeight={600} fill="#14524f" pointerEvents="none">
                {c.bin.on_hand > 0 ? c.bin.on_hand : ''}
              </text>
            )}
          </g>
        );
      })}
    </g>
  );
}

/** Width of the element the returned callback ref is attached to (it may mount late). */
function useWidth() {
  const [width, setWidth] = useState(800);
  const observer = useRef<ResizeObserver | null>(null);
  const ref = useCallback((el: HTMLDivElement | null) => {
    observer.current?.disconnect();
    if (!el) return;
    const update = () => setWidth(Math.max(300, el.clientWidth));
    update();
    observer.current = new ResizeObserver(update);
    observer.current.observe(el);
  }, []);
  useEffect(() => () => observer.current?.disconnect(), []);
  return { ref, width };
}

export default function BinMap({ deviceTypes, initialType }: { deviceTypes: { id: number; name: string }[]; initialType?: string }) {
  const [type, setType] = useState(initialType ?? deviceTypes[0]?.name ?? '');
  const { data, error, loading, reload } = useBinMap(type);
  const [selected, setSelected] = useState<MapBin | null>(null);
  const { ref, width } = useWidth();
  useEffect(() => setSelected(null), [type]);

  const extent = useMemo(() => (data ? mapExtent(data.bins, data.points) : null), [data]);
  const cells = useMemo(() => (data && extent ? gridCells(data.bins, extent) : []), [data, extent]);
  const maxOnHand = useMemo(() => Math.max(0, ...(data?.bins.map((b) => b.on_hand) ?? [0])), [data]);
  const hold = data?.bins.find((b) => b.is_hold);
  const totals = useMemo(() => {
    const t = { onHand: 0, reserved: 0, issued: 0 };
    for (const b of data?.bins ?? []) {
      t.onHand += b.on_hand;
      t.reserved += b.reserved;
      t.issued += b.issued;
    }
    return t;
  }, [data]);

  if (deviceTypes.length === 0) return <Empty>No device types yet. An admin adds them under Device types.</Empty>;

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end gap-4">
        <div>
          <label className="field" htmlFor="map-type">Device type</label>
          <select id="map-type" className="input w-48" value={type} onChange={(e) => setType(e.target.value)}>
            {deviceTypes.map((t) => (
              <option key={t.id} value={t.name}>{t.name}</option>
            ))}
          </select>
        </div>
        {data?.plan && (
          <p className="text-sm text-ink-soft pb-1.5">
            Plan version {data.plan.version}{data.plan.name ? ` (${data.plan.name})` : ''} · {data.bins.length - 1} bins + hold ·{' '}
            <span className="num">{totals.onHand}</span> on hand, <span className="num">{totals.reserved}</span> reserved, <span className="num">{totals.issued}</span> issued
          </p>
        )}
      </div>
      {loading && !data && <Loading what="the bin map" />}
      {error && <ErrorNotice error={error} retry={reload} />}
      {data && !data.plan && <Empty>{data.device_type.name} has no active bin plan yet. An admin sets one up under Bin plans.</Empty>}
      {data?.plan && extent && (
        <div className="grid grid-cols-1 gap-4 xl:grid-cols-[minmax(0,1fr)_26rem]">
          <div className="card p-3 min-w-0" ref={ref}>
            {data.points.length === 0 && (
              <p className="notice-info mb-2">No binned parts of {data.device_type.name} yet; the grid shows the plan's bins.</p>
            )}
            <XYChart
              width={width - 24}
              height={Math.round(Math.min(620, Math.max(320, (width - 24) * 0.62)))}
              margin={{ top: 16, right: 20, bottom: 48, left: 64 }}
              theme={theme}
              captureEvents={false}
              xScale={{ type: 'linear', domain: [extent.x[0] * 1e3, extent.x[1] * 1e3], zero: false, nice: false }}
              yScale={{ type: 'linear', domain: extent.y, zero: false, nice: false }}
            >
              <Grid columns rows numTicks={8} strokeDasharray="2 4" />
              <BinGridLayer cells={cells} maxOnHand={maxOnHand} selected={selected?.id ?? null} onSelect={setSelected} />
              <GlyphSeries
                dataKey="parts"
                data={data.points}
                xAccessor={(p: MapPoint) => p.idss_a * 1e3}
                yAccessor={(p: MapPoint) => p.vp_v}
                enableEvents={false}
                renderGlyph={({ x, y, datum }) => (
                  <circle cx={x} cy={y} r={2.6} fill={STATUS_COLOUR[datum.status] ?? '#15232b'} fillOpacity={0.8} pointerEvents="none" />
                )}
              />
              <Axis orientation="bottom" label={`IDSS at VDS = ${data.device_type.vds_test_v} V (mA)`} numTicks={8} />
              <Axis orientation="left" label="VP (V)" numTicks={8} tickFormat={(v) => Number(v).toFixed(1).replace('-', '\u2212')} />
            </XYChart>
            <ul className="mt-2 flex flex-wrap gap-4 text-xs text-ink-soft" aria-label="Legend">
              {Object.entries(STATUS_COLOUR).map(([s, c]) => (
                <li key={s} className="flex items-center gap-1">
                  <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: c }} /> {s.replace('_', ' ')}
                </li>
              ))}
              <li className="flex items-center gap-1"><span className="inline-block h-3 w-4 border border-channel-200" style={{ background: 'rgba(33,126,122,0.45)' }} /> darker bin = more on hand</li>
              <li className="flex items-center gap-1"><span className="inline-block h-3 w-4" style={{ background: 'rgba(179,53,43,0.35)' }} /> below low-stock threshold</li>
            </ul>
            {data.points_left_off > 0 && <p className="text-xs text-ink-faint mt-1">{data.points_left_off} more parts are not drawn.</p>}
          </div>
          <div className="space-y-3">
            {hold && (
              <button type="button" className="btn-quiet w-full justify-between" onClick={() => setSelected(hold)}>
                <span>Hold bin (outside the plan)</span>
                <span className="num">{hold.on_hand} on hand · {hold.reserved + hold.issued} out</span>
              </button>
            )}
            {selected ? (
              <BinPartsList bin={selected} />
            ) : (
              <p className="notice-info">Click a bin on the map to list its parts. Each cell shows its on-hand count; hover for its range.</p>
            )}
          </div>
        </div>
      )}
    </div>
  );
}

