import { formatSignificant, type QuantityUnit } from '~/core/units/format-quantity';

/** A result to `digits` significant figures with an SI prefix ("680 Ω", "266.1 µS"): the one formatter's `formatSignificant`. */
export function sig(value: number, unit: QuantityUnit, digits = 4): string {
  return formatSignificant(value, unit, digits);
}
