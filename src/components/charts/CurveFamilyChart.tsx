import { Axis, GlyphSeries, Grid, LineSeries, Tooltip, XYChart, buildChartTheme } from '@visx/xychart';
import type { JfetParams } from '../../core/jfet-model';
import { curveColour, measuredPoints, modelLines, vgsLabel, type ApiCurve, type MeasuredPoint } from './chart-data';
import { useWidth } from './use-width';

const theme = buildChartTheme({
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
  height?: number;
}

/**
 * The measured curve family (dots) with the fitted model over it (lines). P-channel parts are
 * drawn as magnitudes; the legend gives each gate step in datasheet sign. Left-out points are
 * drawn hollow.
 */
export default function CurveFamilyChart({ curves, channel, params, excluded, onTogglePoint, height = 380 }: Props) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const points = measuredPoints(curves, excluded);
  const lines = params ? modelLines(curves, params) : [];
  const vdsMax = Math.max(...curves.flatMap((c) => c.vds_v), 1);
  const idMax = Math.max(...points.flat().map((p) => p.idMa), ...lines.flat().map((p) => p.idMa), 1e-3);
  const prefix = channel === 'p' ? '|' : '';
  const suffix = channel === 'p' ? '|' : '';
  return (
    <figure ref={ref} className="w-full" aria-label="Measured curve family with the fitted model">
      <XYChart
        width={width}
        height={height}
        theme={theme}
        margin={{ top: 12, right: 16, bottom: 46, left: 58 }}
        xScale={{ type: 'linear', domain: [0, vdsMax], nice: true }}
        yScale={{ type: 'linear', domain: [0, idMax * 1.06], nice: true }}
        onPointerUp={
          onTogglePoint
            ? ({ datum, key }) => {
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
            renderGlyph={({ x, y, datum }) =>
              datum.excluded ? (
                <circle cx={x} cy={y} r={3.6} fill="#ffffff" stroke="#b3352b" strokeWidth={1.4} />
              ) : (
                <circle cx={x} cy={y} r={2.6} fill={curveColour(i)} opacity={0.85} />
              )
            }
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
