import type { BinPlanPreview } from '~/contracts/bin-plans';
import { binEdges, type BinPlan } from '~/core/binning';
import { formatNumber } from '~/core/units/format-quantity';
import { useWidth } from '../charts/use-width';

/** A part drawn on the preview's grids. */
export type PreviewPoint = BinPlanPreview['points'][number];

const M = { top: 14, right: 16, bottom: 46, left: 60 };

function edgesOf(plan: BinPlan | null, quantity: 'idss' | 'vp'): number[] {
  const axis = plan?.axes?.find((a) => a.quantity === quantity);
  if (!axis) return [];
  try {
    return binEdges(axis);
  } catch {
    return [];
  }
}

function ticks(lo: number, hi: number, n = 6): number[] {
  const step = 10 ** Math.floor(Math.log10((hi - lo) / n || 1));
  const nice = [1, 2, 5, 10].map((k) => k * step).find((s) => (hi - lo) / s <= n) ?? step * 10;
  const out: number[] = [];
  for (let v = Math.ceil(lo / nice) * nice; v <= hi + 1e-12; v += nice) out.push(Number(v.toPrecision(10)));
  return out;
}

/**
 * The old plan's grid (dashed) and the new one (solid) over the parts' IDSS and VP, with the
 * parts that change bin marked: filled when the part sits in a bag on a shelf (someone must
 * carry it), hollow when only its record changes.
 */
export default function PlanGridPreview({ oldPlan, newPlan, points }: { oldPlan: BinPlan | null; newPlan: BinPlan; points: PreviewPoint[] }) {
  // Drawn at the width it is shown, so its labels stay legible on a phone.
  const { ref, width } = useWidth<HTMLDivElement>(720);
  const W = width;
  const H = Math.round(Math.min(420, Math.max(300, W * 0.6)));
  const oldI = edgesOf(oldPlan, 'idss').map((x) => x * 1e3);
  const oldV = edgesOf(oldPlan, 'vp');
  const newI = edgesOf(newPlan, 'idss').map((x) => x * 1e3);
  const newV = edgesOf(newPlan, 'vp');
  const pts = points.filter((p) => p.idss_a !== null && p.vp_v !== null).map((p) => ({ ...p, x: p.idss_a! * 1e3, y: p.vp_v! }));
  const xs = [...oldI, ...newI, ...pts.map((p) => p.x)];
  const ys = [...oldV, ...newV, ...pts.map((p) => p.y)];
  if (xs.length === 0 || ys.length === 0) return <p className="text-sm text-ink-soft">Neither plan bins on IDSS or VP, so there is no grid to draw.</p>;
  const pad = (lo: number, hi: number): [number, number] => {
    const m = (hi - lo || Math.abs(hi) || 1) * 0.04;
    return [lo - m, hi + m];
  };
  const [x0, x1] = pad(Math.min(...xs), Math.max(...xs));
  const [y0, y1] = pad(Math.min(...ys), Math.max(...ys));
  const sx = (x: number) => M.left + ((x - x0) / (x1 - x0)) * (W - M.left - M.right);
  const sy = (y: number) => H - M.bottom - ((y - y0) / (y1 - y0)) * (H - M.top - M.bottom);
  const vLines = (edges: number[], cls: string, dash?: string) =>
    edges.map((e) => <line key={`${cls}-x${e}`} x1={sx(e)} x2={sx(e)} y1={sy(y0)} y2={sy(y1)} className={cls} strokeDasharray={dash} />);
  const hLines = (edges: number[], cls: string, dash?: string) =>
    edges.map((e) => <line key={`${cls}-y${e}`} x1={sx(x0)} x2={sx(x1)} y1={sy(e)} y2={sy(e)} className={cls} strokeDasharray={dash} />);
  const shelfMoves = pts.filter((p) => p.moves && p.on_shelf).length;
  return (
    <figure className="space-y-2" aria-label="Old and new bin grids over the parts">
      <div ref={ref} />
      <svg viewBox={`0 0 ${W} ${H}`} width={W} height={H} className="max-w-full h-auto rounded border border-paper-line bg-paper-raised" role="img" aria-label={`Old grid dashed, new grid solid; ${shelfMoves} parts on shelves change bin`}>
        <g className="stroke-ink-faint" strokeWidth={1}>
          {vLines(oldI, 'stroke-ink-faint', '5 4')}
          {hLines(oldV, 'stroke-ink-faint', '5 4')}
        </g>
        <g strokeWidth={1.4}>
          {vLines(newI, 'stroke-channel-500')}
          {hLines(newV, 'stroke-channel-500')}
        </g>
        {pts
          .filter((p) => !p.moves)
          .map((p) => (
            <circle key={p.serial} cx={sx(p.x)} cy={sy(p.y)} r={2.2} className="fill-ink-faint" opacity={0.55} />
          ))}
        {pts
          .filter((p) => p.moves)
          .map((p) => (
            <circle key={p.serial} cx={sx(p.x)} cy={sy(p.y)} r={3.4} className={p.on_shelf ? 'fill-state-review stroke-state-review' : 'fill-none stroke-state-review'} strokeWidth={1.3}>
              <title>{p.serial}</title>
            </circle>
          ))}
        <g className="fill-ink-soft text-[11px]">
          {ticks(x0, x1, W < 500 ? 4 : 6).map((t) => (
            <text key={`tx${t}`} x={sx(t)} y={H - M.bottom + 16} textAnchor="middle">
              {formatNumber(t, t % 1 === 0 ? 0 : 1)}
            </text>
          ))}
          {ticks(y0, y1).map((t) => (
            <text key={`ty${t}`} x={M.left - 6} y={sy(t) + 4} textAnchor="end">
              {formatNumber(t, t % 1 === 0 ? 0 : 1)}
            </text>
          ))}
          <text x={(M.left + W - M.right) / 2} y={H - 8} textAnchor="middle" className="fill-ink-soft">
            IDSS (mA)
          </text>
          <text x={14} y={(M.top + H - M.bottom) / 2} textAnchor="middle" transform={`rotate(-90 14 ${(M.top + H - M.bottom) / 2})`}>
            VP (V)
          </text>
        </g>
      </svg>
      <figcaption className="flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft">
        <span>
          <svg width="26" height="8" aria-hidden="true"><line x1="0" x2="26" y1="4" y2="4" className="stroke-ink-faint" strokeDasharray="5 4" /></svg> old grid
        </span>
        <span>
          <svg width="26" height="8" aria-hidden="true"><line x1="0" x2="26" y1="4" y2="4" className="stroke-channel-500" strokeWidth={1.4} /></svg> new grid
        </span>
        <span>
          <svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="3.4" className="fill-state-review" /></svg> changes bin, on a shelf: carry it
        </span>
        <span>
          <svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="3.4" className="fill-none stroke-state-review" strokeWidth={1.3} /></svg> changes bin on record only
        </span>
        <span>
          <svg width="10" height="10" aria-hidden="true"><circle cx="5" cy="5" r="2.2" className="fill-ink-faint" /></svg> stays
        </span>
      </figcaption>
    </figure>
  );
}
