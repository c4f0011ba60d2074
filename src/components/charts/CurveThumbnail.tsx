import { curveColour, type ApiCurve } from './chart-data';

/**
 * A small picture of a measured curve family: one line per gate step, ID against VDS, no
 * axes. Enough to see at a glance that a file held sensible curves; the part page has the
 * full chart.
 */
export default function CurveThumbnail({ curves, width = 120, height = 64, label }: { curves: readonly ApiCurve[]; width?: number; height?: number; label: string }) {
  const vdsMax = Math.max(1e-12, ...curves.flatMap((c) => c.vds_v.map(Math.abs)));
  const idMax = Math.max(1e-15, ...curves.flatMap((c) => c.id_a.map(Math.abs)));
  const pad = 3;
  const x = (v: number) => pad + (Math.abs(v) / vdsMax) * (width - 2 * pad);
  const y = (i: number) => height - pad - (Math.abs(i) / idMax) * (height - 2 * pad);
  return (
    <svg width={width} height={height} viewBox={`0 0 ${width} ${height}`} role="img" aria-label={label} className="rounded border border-paper-line bg-white">
      {curves.map((c, k) => (
        <polyline
          key={k}
          fill="none"
          stroke={curveColour(k)}
          strokeWidth={1.3}
          points={c.vds_v.map((v, i) => `${x(v).toFixed(1)},${y(c.id_a[i] ?? 0).toFixed(1)}`).join(' ')}
        />
      ))}
    </svg>
  );
}
