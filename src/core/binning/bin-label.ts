import { chooseUnitPrefix, formatQuantity, formatQuantityRange } from '../units/format-quantity';
import type { BinAxis } from './bin-plan';

/** Fewest fraction digits (minDigits–4) that print every value exactly at its chosen prefix. */
function labelDigits(values: readonly number[], unit: 'A' | 'V', minDigits = 1): number {
  let digits = minDigits;
  for (const v of values) {
    const scaled = v / chooseUnitPrefix(v, unit, 4).factor;
    let d = minDigits;
    while (d < 4 && Math.abs(Math.round(scaled * 10 ** d) / 10 ** d - scaled) > 1e-9 * Math.max(1, Math.abs(scaled))) d++;
    digits = Math.max(digits, d);
  }
  return digits;
}

function axisName(axis: BinAxis): string {
  if (axis.quantity === 'idss') return 'IDSS';
  if (axis.quantity === 'vp') return 'VP';
  const i = axis.referenceCurrentA ?? Number.NaN;
  return `VGS at ${formatQuantity(i, 'A', labelDigits([i], 'A', 0))}`;
}

/**
 * Plain-unit labels for each range of one axis, e.g. "IDSS 6.0–6.5 mA" or "VP −1.8 to −2.0 V".
 * Ranges wholly at or below zero are printed from the smaller magnitude to the larger, the way
 * pinch-off is spoken of; all others from low to high. Every label on an axis uses the same
 * number of fraction digits, the fewest that print its edges exactly.
 */
export function axisRangeLabels(axis: BinAxis, edges: readonly number[]): string[] {
  const unit = axis.quantity === 'idss' ? 'A' : 'V';
  const digits = labelDigits(edges, unit);
  const name = axisName(axis);
  const labels: string[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const lo = edges[i];
    const hi = edges[i + 1];
    const range = hi <= 0 ? formatQuantityRange(hi, lo, unit, digits) : formatQuantityRange(lo, hi, unit, digits);
    labels.push(`${name} ${range}`);
  }
  return labels;
}
