import { Axis, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import { useRef, useState, type KeyboardEvent, type PointerEvent } from 'react';
import type { JfetParams } from '~/core/jfet-model';
import { curveColour, measuredPoints, modelLines, vgsLabel, type ApiCurve, type MeasuredPoint } from './chart-data';
import { useWidth } from './use-width';

/** The charts' look, shared by every xychart on the part page. */
export const chartTheme = buildChartTheme({
  backgroundColor: '#ffffff',
  colors: ['#217e7a'],
  gridColor: '#d9d7cc',
  gridColorDark: '#6b7c85',
  tickLength: 4,
  svgLabelSmall: { fill: '#3d4f59', fontSize: 11, fontFamily: '"Source Sans 3", system-ui, sans-serif' },
  svgLabelBig: { fill: '#15232b', fontSize: 12, fontFamily: '"Source Sans 3", system-ui, sans-serif' },
});

interface Props {
  curves: ApiCurve[];
  channel: 'n' | 'p';
  params: JfetParams | null;
  /** "curve:point" keys of points left out of the fit (by a person or by a flag). */
  excluded: ReadonlySet<string>;
  /** When given, clicking a measured point calls it (to leave the point out or put it back). */
  onTogglePoint?: (curve: number, point: number) => void;
  /**
   * When given, points can also be chosen by dragging a box (all inside it are left out, or
   * put back when all were out already) and from the keyboard (arrows move, Space toggles).
   */
  onSetPoints?: (points: [number, number][], leaveOut: boolean) => void;
  height?: number;
}

/**
 * The measured curve family (dots) with the fitted model over it (lines). P-channel parts are
 * drawn as magnitudes; the legend gives each gate step in datasheet sign. Left-out points are
 * drawn hollow.
 */
export default function CurveFamilyChart({ curves, channel, params, excluded, onTogglePoint, onSetPoints, height = 380 }: Props) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const drag = useRef<{ x: number; y: number; moved: boolean } | null>(null);
  const [box, setBox] = useState<{ left: number; top: number; width: number; height: number } | null>(null);
  const [cursor, setCursor] = useState<{ curve: number; point: number } | null>(null);
  const selectable = Boolean(onSetPoints);

  function onPointerDown(e: PointerEvent<HTMLElement>) {
    if (!selectable || e.button !== 0) return;
    drag.current = { x: e.clientX, y: e.clientY, moved: false };
  }
  function onPointerMove(e: PointerEvent<HTMLElement>) {
    const d = drag.current;
    if (!d) return;
    if (!d.moved && Math.hypot(e.clientX - d.x, e.clientY - d.y) < 6) return;
    d.moved = true;
    const origin = e.currentTarget.getBoundingClientRect();
    setBox({ left: Math.min(d.x, e.clientX) - origin.left, top: Math.min(d.y, e.clientY) - origin.top, width: Math.abs(e.clientX - d.x), height: Math.abs(e.clientY - d.y) });
  }
  function onPointerUp(e: PointerEvent<HTMLElement>) {
    const d = drag.current;
    drag.current = null;
    setBox(null);
    if (!d?.moved || !onSetPoints) return;
    const [x0, x1] = [Math.min(d.x, e.clientX), Math.max(d.x, e.clientX)];
    const [y0, y1] = [Math.min(d.y, e.clientY), Math.max(d.y, e.clientY)];
    const inside: [number, number][] = [];
    for (const el of e.currentTarget.querySelectorAll<SVGCircleElement>('circle[data-point]')) {
      const r = el.getBoundingClientRect();
      const cx = r.left + r.width / 2;
      const cy = r.top + r.height / 2;
      if (cx >= x0 && cx <= x1 && cy >= y0 && cy <= y1) inside.push(el.dataset.point!.split(':').map(Number) as [number, number]);
    }
    if (inside.length) onSetPoints(inside, !inside.every(([c, p]) => excluded.has(`${c}:${p}`)));
  }
  function onKeyDown(e: KeyboardEvent<HTMLElement>) {
    if (!selectable || curves.length === 0) return;
    const cur = cursor ?? { curve: 0, point: 0 };
    const last = (c: number) => Math.max(0, curves[c]!.vds_v.length - 1);
    let next = cur;
    if (e.key === 'ArrowRight') next = { ...cur, point: Math.min(last(cur.curve), cur.point + 1) };
    else if (e.key === 'ArrowLeft') next = { ...cur, point: Math.max(0, cur.point - 1) };
    else if (e.key === 'ArrowUp') next = { curve: Math.min(curves.length - 1, cur.curve + 1), point: Math.min(cur.point, last(Math.min(curves.length - 1, cur.curve + 1))) };
    else if (e.key === 'ArrowDown') next = { curve: Math.max(0, cur.curve - 1), point: Math.min(cur.point, last(Math.max(0, cur.curve - 1))) };
    else if (e.key === ' ' || e.key === 'Enter') {
      e.preventDefault();
      setCursor(cur);
      onSetPoints!([[cur.curve, cur.point]], !excluded.has(`${cur.curve}:${cur.point}`));
      return;
    } else return;
    e.preventDefault();
    setCursor(next);
  }
  const cursorText = cursor
    ? `VGS ${vgsLabel(curves[cursor.curve]!.vgs_v, channel)}, point ${cursor.point + 1} of ${curves[cursor.curve]!.vds_v.length}: VDS ${Math.abs(curves[cursor.curve]!.vds_v[cursor.point]!).toFixed(3)} V, ID ${(Math.abs(curves[cursor.curve]!.id_a[cursor.point]!) * 1e3).toFixed(4)} mA, ${excluded.has(`${cursor.curve}:${cursor.point}`) ? 'left out of the fit' : 'in the fit'}`
    : '';
  const points = measuredPoints(curves, excluded);
  const lines = params ? modelLines(curves, params) : [];
  const vdsMax = Math.max(...curves.flatMap((c) => c.vds_v), 1);
  const idMax = Math.max(...points.flat().map((p) => p.idMa), ...lines.flat().map((p) => p.idMa), 1e-3);
  const prefix = channel === 'p' ? '|' : '';
  const suffix = channel === 'p' ? '|' : '';
  return (
    <figure
      ref={ref}
      className={`relative w-full ${selectable ? 'select-none focus-visible:outline focus-visible:outline-2 focus-visible:outline-channel-500' : ''}`}
      aria-label="Measured curve family with the fitted model"
      tabIndex={selectable ? 0 : undefined}
      aria-describedby={selectable ? 'curve-keys-help' : undefined}
      onPointerDown={selectable ? onPointerDown : undefined}
      onPointerMove={selectable ? onPointerMove : undefined}
      onPointerUp={selectable ? onPointerUp : undefined}
      onKeyDown={selectable ? onKeyDown : undefined}
    >
      <XYChart
        width={width}
        height={height}
        theme={chartTheme}
        margin={{ top: 12, right: 16, bottom: 46, left: 58 }}
        xScale={{ type: 'linear', domain: [0, vdsMax], nice: true }}
        yScale={{ type: 'linear', domain: [0, idMax * 1.06], nice: true }}
        onPointerUp={
          onTogglePoint
            ? ({ datum, key }) => {
                // The end of a box drag is not a click on a point.
                if (drag.current?.moved) return;
                if (key.startsWith('measured-') && datum) {
                  const d = datum as MeasuredPoint;
                  onTogglePoint(d.curve, d.point);
                }
              }
            : undefined
        }
      >
        <Grid columns={false} numTicks={6} />
        <Axis orientation="bottom" label={`${prefix}VDS${suffix} (V)`} numTicks={8} />
        <Axis orientation="left" label={`${prefix}ID${suffix} (mA)`} numTicks={6} />
        {lines.map((line, i) => (
          <LineSeries
            key={`model-${i}`}
            dataKey={`model-${i}`}
            data={line}
            xAccessor={(d) => d.vdsV}
            yAccessor={(d) => d.idMa}
            stroke={curveColour(i)}
            strokeWidth={1.6}
            enableEvents={false}
          />
        ))}
        {points.map((pts, i) => (
          <GlyphSeries
            key={`measured-${i}`}
            dataKey={`measured-${i}`}
            data={pts}
            xAccessor={(d) => d.vdsV}
            yAccessor={(d) => d.idMa}
            size={5}
            renderGlyph={({ x, y, datum }) => {
              const at = cursor?.curve === datum.curve && cursor.point === datum.point;
              const dot = datum.excluded ? (
                <circle cx={x} cy={y} r={3.6} fill="#ffffff" stroke="#b3352b" strokeWidth={1.4} data-point={`${datum.curve}:${datum.point}`} data-excluded="true" />
              ) : (
                <circle cx={x} cy={y} r={2.6} fill={curveColour(i)} opacity={0.85} data-point={`${datum.curve}:${datum.point}`} />
              );
              return at ? (
                <g>
                  {dot}
                  <circle cx={x} cy={y} r={7} fill="none" stroke="#15232b" strokeWidth={1.6} data-testid="point-cursor" />
                </g>
              ) : (
                dot
              );
            }}
          />
        ))}
        <Tooltip<MeasuredPoint | { vdsV: number; idMa: number }>
          snapTooltipToDatumX
          snapTooltipToDatumY
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => {
            const n = tooltipData?.nearestDatum;
            if (!n || !n.key.startsWith('measured-')) return null;
            const d = n.datum as MeasuredPoint;
            return (
              <div className="text-xs">
                <div className="font-semibold">VGS {vgsLabel(curves[d.curve].vgs_v, channel)}</div>
                <div>
                  {prefix}VDS{suffix} {d.vdsV.toFixed(3)} V · {prefix}ID{suffix} {d.idMa.toFixed(4)} mA
                </div>
                {d.excluded && <div className="text-state-fault">left out of the fit</div>}
                {onTogglePoint && <div className="text-ink-faint">click to {d.excluded ? 'put it back' : 'leave it out'}</div>}
              </div>
            );
          }}
        />
      </XYChart>
      {box && <div className="pointer-events-none absolute border border-channel-600 bg-channel-100/40" style={box} aria-hidden="true" />}
      {selectable && (
        <>
          <p id="curve-keys-help" className="sr-only">
            Drag a box to leave out every point inside it (or put them back). From the keyboard: arrow keys move between points and curves, Space leaves the point out or puts it back.
          </p>
          <p className="sr-only" aria-live="polite" data-testid="point-cursor-text">{cursorText}</p>
        </>
      )}
      <figcaption className="mt-1 flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-soft">
        {curves.map((c, i) => (
          <span key={i} className="inline-flex items-center gap-1">
            <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ background: curveColour(i) }} />
            VGS {vgsLabel(c.vgs_v, channel)}
          </span>
        ))}
        <span>· dots measured, lines fitted model{excluded.size ? ', hollow red dots left out' : ''}</span>
      </figcaption>
    </figure>
  );
}
