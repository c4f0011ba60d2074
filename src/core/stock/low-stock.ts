/**
 * Low-stock alerting as a two-state machine per bin: armed (no alert out) and alerted.
 * A bin alerts when its on-hand count drops below its threshold while armed, and re-arms when
 * on-hand rises back to the threshold or above. A threshold of 0 never alerts.
 */
export type LowStockStep = 'alert' | 're_arm' | 'none';

export interface LowStockState {
  onHand: number;
  threshold: number;
  /** Whether an alert for the current crossing has already gone out. */
  alerted: boolean;
  /**
   * Whether the change being checked can lower on-hand (scrap, reserve, re-bin, a raised
   * threshold). A receipt cannot, so a bin still short after one stays quiet rather than alert.
   */
  mayDrop?: boolean;
}

export function lowStockStep({ onHand, threshold, alerted, mayDrop = true }: LowStockState): LowStockStep {
  const below = threshold > 0 && onHand < threshold;
  if (below && !alerted) return mayDrop ? 'alert' : 'none';
  if (!below && alerted) return 're_arm';
  return 'none';
}
