import { binCode } from './bin-code';
import { binEdges } from './bin-edges';
import { axisRangeLabels } from './bin-label';
import { HOLD_BIN_CODE, HOLD_BIN_LABEL, type BinPlan, type BinQuantity } from './bin-plan';

export interface BinRange {
  quantity: BinQuantity;
  /** Included. */
  loValue: number;
  /** Excluded. */
  hiValue: number;
}

export interface BinCatalogueEntry {
  code: string;
  label: string;
  isHold: boolean;
  /** One half-open range per axis; empty for the hold bin. */
  ranges: BinRange[];
}

/**
 * Every bin of the plan: grid cells with the first axis varying slowest, then the hold bin last.
 * Throws BinPlanError on an invalid plan.
 */
export function binCatalogue(plan: BinPlan): BinCatalogueEntry[] {
  const perAxis = plan.axes.map((axis) => {
    const edges = binEdges(axis);
    return { axis, edges, labels: axisRangeLabels(axis, edges) };
  });
  const entries: BinCatalogueEntry[] = [];
  const walk = (k: number, indices: number[]) => {
    if (k === perAxis.length) {
      entries.push({
        code: binCode(plan, indices),
        label: indices.map((i, a) => perAxis[a].labels[i]).join(' · '),
        isHold: false,
        ranges: indices.map((i, a) => ({
          quantity: perAxis[a].axis.quantity,
          loValue: perAxis[a].edges[i],
          hiValue: perAxis[a].edges[i + 1],
        })),
      });
      return;
    }
    for (let i = 0; i + 1 < perAxis[k].edges.length; i++) walk(k + 1, [...indices, i]);
  };
  walk(0, []);
  entries.push({ code: HOLD_BIN_CODE, label: HOLD_BIN_LABEL, isHold: true, ranges: [] });
  return entries;
}
