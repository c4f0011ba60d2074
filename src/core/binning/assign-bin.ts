import { binCode } from './bin-code';
import { binEdges, rangeIndex } from './bin-edges';
import { axisRangeLabels } from './bin-label';
import { HOLD_BIN_CODE, HOLD_BIN_LABEL, type BinFigures, type BinPlan, type BinQuantity } from './bin-plan';

export interface BinAssignment {
  code: string;
  label: string;
  isHold: boolean;
  /** Why a part is on hold; absent for a grid bin. */
  holdReason?: 'missing_figure' | 'outside_grid';
}

export function figureFor(figures: BinFigures, quantity: BinQuantity): number | null | undefined {
  if (quantity === 'idss') return figures.idssA;
  if (quantity === 'vp') return figures.vpV;
  return figures.vgsAtCurrentV;
}

/**
 * The bin a part belongs to under `plan`. Each range is half-open [lo, hi): a value exactly on
 * an edge goes to the upper bin, and a value equal to the top edge is outside the grid.
 * A missing or non-finite figure, or one outside any axis, puts the part on hold.
 */
export function assignBin(plan: BinPlan, figures: BinFigures): BinAssignment {
  const indices: number[] = [];
  const labels: string[] = [];
  for (const axis of plan.axes) {
    const value = figureFor(figures, axis.quantity);
    if (value === null || value === undefined || !Number.isFinite(value)) {
      return { code: HOLD_BIN_CODE, label: HOLD_BIN_LABEL, isHold: true, holdReason: 'missing_figure' };
    }
    const edges = binEdges(axis);
    const i = rangeIndex(edges, value);
    if (i < 0) return { code: HOLD_BIN_CODE, label: HOLD_BIN_LABEL, isHold: true, holdReason: 'outside_grid' };
    indices.push(i);
    labels.push(axisRangeLabels(axis, edges)[i]);
  }
  return { code: binCode(plan, indices), label: labels.join(' · '), isHold: false };
}
