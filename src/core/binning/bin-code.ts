import { BIN_AXIS_LETTER, type BinPlan } from './bin-plan';

/**
 * Code of the grid cell at 0-based range `indices` (one per axis), e.g. [6, 2] → "I07-P03",
 * or the code the plan's `codes` gives that cell instead.
 */
export function binCode(plan: BinPlan, indices: readonly number[]): string {
  const positional = positionalBinCode(plan, indices);
  return plan.codes?.[positional] ?? positional;
}

/** The cell's code from its position alone, before any `codes` of the plan. */
export function positionalBinCode(plan: BinPlan, indices: readonly number[]): string {
  return plan.axes
    .map((axis, k) => {
      const count = axis.edges.kind === 'uniform' ? axis.edges.count : axis.edges.edges.length - 1;
      const width = Math.max(2, String(count).length);
      return BIN_AXIS_LETTER[axis.quantity] + String(indices[k] + 1).padStart(width, '0');
    })
    .join('-');
}
