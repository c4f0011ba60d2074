/**
 * Plain-unit formatting shared by bin labels and the UI: SI value in, "6.50 mA" out.
 * Negative numbers use the true minus sign (U+2212); number and unit are separated by a space.
 */

export type QuantityUnit = 'A' | 'V' | 'S' | 'Ω' | 'F' | 'Hz';

export const MINUS_SIGN = '\u2212';

interface Prefix {
  symbol: string;
  factor: number;
}

/** Prefixes offered per unit, largest first. */
const PREFIXES: Record<QuantityUnit, readonly Prefix[]> = {
  A: [
    { symbol: '', factor: 1 },
    { symbol: 'm', factor: 1e-3 },
    { symbol: 'µ', factor: 1e-6 },
    { symbol: 'n', factor: 1e-9 },
    { symbol: 'p', factor: 1e-12 },
  ],
  V: [
    { symbol: '', factor: 1 },
    { symbol: 'm', factor: 1e-3 },
    { symbol: 'µ', factor: 1e-6 },
  ],
  S: [
    { symbol: '', factor: 1 },
    { symbol: 'm', factor: 1e-3 },
    { symbol: 'µ', factor: 1e-6 },
    { symbol: 'n', factor: 1e-9 },
  ],
  'Ω': [
    { symbol: 'M', factor: 1e6 },
    { symbol: 'k', factor: 1e3 },
    { symbol: '', factor: 1 },
  ],
  F: [
    { symbol: 'µ', factor: 1e-6 },
    { symbol: 'n', factor: 1e-9 },
    { symbol: 'p', factor: 1e-12 },
    { symbol: 'f', factor: 1e-15 },
  ],
  Hz: [
    { symbol: 'G', factor: 1e9 },
    { symbol: 'M', factor: 1e6 },
    { symbol: 'k', factor: 1e3 },
    { symbol: '', factor: 1 },
  ],
};

/**
 * The prefix for a magnitude: the largest one that keeps the scaled value at or above 1, moved
 * up one step when rounding to `digits` fraction digits would print 1000 (so 0.99996 mA with
 * 1 digit becomes "1.0 mA", not "1000.0 µA"). Zero uses the base unit (the smallest prefix
 * for units without one); magnitudes below the smallest prefix use the smallest.
 */
export function chooseUnitPrefix(magnitude: number, unit: QuantityUnit, digits = 2): Prefix {
  const prefixes = PREFIXES[unit];
  const m = Math.abs(magnitude);
  if (m === 0 || !Number.isFinite(m)) {
    return prefixes.find((p) => p.factor === 1) ?? prefixes[prefixes.length - 1];
  }
  let i = prefixes.findIndex((p) => m / p.factor >= 1);
  if (i < 0) i = prefixes.length - 1;
  if (i > 0 && roundTo(m / prefixes[i].factor, digits) >= 1000) i--;
  return prefixes[i];
}

function roundTo(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

/** A scaled number with `digits` fraction digits and the true minus sign; never "−0.0". */
export function formatNumber(scaled: number, digits: number): string {
  const text = Math.abs(scaled).toFixed(digits);
  const isZero = Number(text) === 0;
  return scaled < 0 && !isZero ? MINUS_SIGN + text : text;
}

/**
 * Formats an SI value with a unit prefix, e.g. formatQuantity(6.5e-3, 'A', 2) → "6.50 mA",
 * formatQuantity(-1.8, 'V', 1) → "−1.8 V". `digits` is the number of fraction digits after
 * scaling. Non-finite values format as "—".
 */
export function formatQuantity(value: number, unit: QuantityUnit, digits = 2): string {
  if (!Number.isFinite(value)) return '—';
  const prefix = chooseUnitPrefix(value, unit, digits);
  return `${formatNumber(value / prefix.factor, digits)} ${prefix.symbol}${unit}`;
}

/**
 * Formats a range with one shared prefix, chosen so the larger end reads at least 0.1
 * ("−0.4 to −0.8 V", not "−400 to −800 mV", as bin labels are usually written):
 * "6.0–6.5 mA" when both ends are ≥ 0; "−1.8 to −2.0 V" when either end is negative, since an
 * en dash next to a minus sign reads badly. The ends are printed in the order given.
 */
export function formatQuantityRange(
  fromValue: number,
  toValue: number,
  unit: QuantityUnit,
  digits = 2,
): string {
  if (!Number.isFinite(fromValue) || !Number.isFinite(toValue)) return '—';
  const largest = Math.max(Math.abs(fromValue), Math.abs(toValue));
  let prefix = chooseUnitPrefix(10 * largest, unit, digits);
  let a = formatNumber(fromValue / prefix.factor, digits);
  let b = formatNumber(toValue / prefix.factor, digits);
  const lost = (text: string, value: number) => value !== 0 && Number(text.replace(MINUS_SIGN, '-')) === 0;
  if (a === b || lost(a, fromValue) || lost(b, toValue)) {
    // The larger prefix would round the ends together or to zero: keep the finer one.
    prefix = chooseUnitPrefix(largest, unit, digits);
    a = formatNumber(fromValue / prefix.factor, digits);
    b = formatNumber(toValue / prefix.factor, digits);
  }
  const joiner = a.startsWith(MINUS_SIGN) || b.startsWith(MINUS_SIGN) ? ' to ' : '–';
  return `${a}${joiner}${b} ${prefix.symbol}${unit}`;
}
