import { Axis, GlyphSeries, Grid, LineSeries, XYChart, buildChartTheme } from '@visx/xychart';
import type { JfetParams } from '~/core/jfet-model';
import { curveColour, residualPoints, type ApiCurve } from './chart-data';
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

/** Measured minus model for every point, in % of the fitted IDSS, against VDS. */
export default function ResidualsChart({
  curves, channel, params, idssA, excluded, height = 200,
}: { curves: ApiCurve[]; channel: 'n' | 'p'; params: JfetParams; idssA: number; excluded: ReadonlySet<string>; height?: number }) {
  const { ref, width } = useWidth<HTMLDivElement>();
  const pts = residualPoints(curves, params, idssA, excluded);
  const included = pts.flat().filter((p) => !p.excluded && Number.isFinite(p.residualPct));
  const span = Math.max(0.5, ...included.map((p) => Math.abs(p.residualPct))) * 1.15;
  const vdsMax = Math.max(...curves.flatMap((c) => c.vds_v), 1);
  const bar = channel === 'p' ? '|' : '';
  return (
    <figure ref={ref} className="w-full" aria-label="Residuals of the fit">
      <XYChart
        width={width}
        height={height}
        theme={theme}
        margin={{ top: 8, right: 16, bottom: 42, left: 58 }}
        xScale={{ type: 'linear', domain: [0, vdsMax], nice: true }}
        yScale={{ type: 'linear', domain: [-span, span], nice: true, clamp: true }}
      >
        <Grid columns={false} numTicks={4} />
        <Axis orientation="bottom" label={`${bar}VDS${bar} (V)`} numTicks={8} />
        <Axis orientation="left" label="residual (% of IDSS)" numTicks={4} />
        <LineSeries dataKey="zero" data={[{ x: 0 }, { x: vdsMax }]} xAccessor={(d) => d.x} yAccessor={() => 0} stroke="#6b7c85" strokeWidth={1} enableEvents={false} />
        {pts.map((p, i) => (
          <GlyphSeries
            key={i}
            dataKey={`res-${i}`}
            data={p.filter((x) => !x.excluded)}
            xAccessor={(d) => d.vdsV}
            yAccessor={(d) => d.residualPct}
            enableEvents={false}
            renderGlyph={({ x, y }) => <circle cx={x} cy={y} r={2.3} fill={curveColour(i)} opacity={0.85} />}
          />
        ))}
      </XYChart>
    </figure>
  );
}
