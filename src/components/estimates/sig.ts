import { MINUS_SIGN, chooseUnitPrefix, type QuantityUnit } from '../../core/units/format-quantity';

/**
 * A quantity to `digits` significant figures with an SI prefix: "680 Ω", "266.1 µS", "700 kHz".
 * (formatQuantity fixes the fraction digits instead, which suits bin labels, not results.)
 */
export function sig(value: number, unit: QuantityUnit, digits = 4): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`;
  const prefix = chooseUnitPrefix(Math.abs(value), unit, 2);
  const scaled = Number((value / prefix.factor).toPrecision(Math.max(digits, 1)));
  return `${String(scaled).replace('-', MINUS_SIGN)} ${prefix.symbol}${unit}`;
}
