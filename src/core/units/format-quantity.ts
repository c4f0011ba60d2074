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

/**
 * Significant digits of an uncertainty: two when its leading digits read 100–354, else one
 * (the Particle Data Group's rounding rule, from memory), so 0.4746 mV prints "0.5 mV" and
 * 0.1234 mV "0.12 mV". Never more than two: GUM (JCGM 100:2008) 7.2.6, from memory.
 */
export function uncertaintyDigits(uncertainty: number): 1 | 2 {
  const u = Math.abs(uncertainty);
  if (!(u > 0) || !Number.isFinite(u)) return 1;
  const lead3 = Math.floor(Number((u / 10 ** (Math.floor(Math.log10(u)) - 2)).toPrecision(6)));
  return lead3 < 355 ? 2 : 1;
}

/** Decimal exponent of the last significant digit of `x` rounded to `sig` digits. */
function lastDigitExponent(x: number, sig: number): number {
  const rounded = Number(Math.abs(x).toPrecision(sig));
  return Math.floor(Math.log10(rounded)) - sig + 1;
}

export interface MeasuredText {
  /** "−543.4 mV" */
  value: string;
  /** "0.5 mV" (no sign); "" when the uncertainty is unknown. */
  uncertainty: string;
  /** "−543.4 mV ± 0.5 mV", or the value alone. */
  text: string;
}

/**
 * A figure with its standard uncertainty, the value rounded to the uncertainty's last
 * significant digit: (−0.5433969 V, 0.00047 V) → "−543.4 mV ± 0.5 mV"; both in the value's
 * prefix unless the uncertainty would read 0.00… in it (−3.363 V, 0.0017 V) → "−3.3630 V ± 1.7 mV".
 * Without a usable uncertainty the value gets `fallbackSig` significant digits.
 */
export function formatMeasured(
  value: number,
  uncertainty: number | null | undefined,
  unit: QuantityUnit,
  fallbackSig = 4,
): MeasuredText {
  if (!Number.isFinite(value)) return { value: '—', uncertainty: '', text: '—' };
  const u = uncertainty === null || uncertainty === undefined ? NaN : Math.abs(uncertainty);
  if (!(u > 0) || !Number.isFinite(u)) {
    const v = formatSignificant(value, unit, fallbackSig);
    return { value: v, uncertainty: '', text: v };
  }
  const exponent = lastDigitExponent(u, uncertaintyDigits(u));
  const prefix = chooseUnitPrefix(Math.abs(value) >= u ? value : u, unit, 0);
  const digits = Math.max(0, Math.round(Math.log10(prefix.factor)) - exponent);
  const v = `${formatNumber(value / prefix.factor, digits)} ${prefix.symbol}${unit}`;
  // The uncertainty shares the value's prefix unless that would print it as 0.00…: then it
  // takes its own ("−3.3630 V ± 1.7 mV", not "± 0.0017 V").
  // Its own prefix is the one it reads at least 0.1 in ("0.5 mV" rather than "500 µV").
  const uRounded = Number(u.toPrecision(uncertaintyDigits(u)));
  const uPrefix = u / prefix.factor < 0.01 ? chooseUnitPrefix(10 * uRounded, unit, 0) : prefix;
  const uDigits = Math.max(0, Math.round(Math.log10(uPrefix.factor)) - exponent);
  const e = `${formatNumber(u / uPrefix.factor, uDigits)} ${uPrefix.symbol}${unit}`;
  return { value: v, uncertainty: e, text: `${v} ± ${e}` };
}

/**
 * A figure with no stated uncertainty to `sig` significant digits, trailing zeros kept
 * ("680 Ω", "266.1 µS", "2.500 mA").
 */
export function formatSignificant(value: number, unit: QuantityUnit, sig = 4): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${chooseUnitPrefix(0, unit).symbol}${unit}`;
  const rounded = Number(value.toPrecision(sig));
  const prefix = chooseUnitPrefix(rounded, unit, 0);
  const exponent = lastDigitExponent(rounded, sig);
  const digits = Math.max(0, Math.round(Math.log10(prefix.factor)) - exponent);
  return `${formatNumber(rounded / prefix.factor, digits)} ${prefix.symbol}${unit}`;
}

export interface ColumnFormat {
  /** The column's unit with its one prefix, for the heading: "mV". */
  unit: string;
  /** A value of the column as a bare number in that unit: "−646.2". */
  number: (value: number | null | undefined) => string;
  /** A value with the column's unit: "−646.2 mV". */
  text: (value: number | null | undefined) => string;
}

/**
 * One prefix and one number of fraction digits for every value of a table column, so
 * −0.64623 V and −2.24 V read "−0.646 V" and "−2.240 V", never "−646.23 mV" beside "−2.24 V".
 * The prefix suits the largest magnitude; the fraction digits give it `sig` significant digits
 * (more when `resolution` — the finest step worth showing, e.g. the typical uncertainty — asks).
 */
export function columnFormat(values: readonly (number | null | undefined)[], unit: QuantityUnit, sig = 4, resolution?: number): ColumnFormat {
  const finite = values.filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
  const largest = finite.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
  const prefix = chooseUnitPrefix(largest, unit, 0);
  const scaledLargest = largest / prefix.factor;
  let digits = scaledLargest > 0 ? Math.max(0, sig - 1 - Math.floor(Math.log10(scaledLargest))) : 0;
  if (resolution !== undefined && resolution > 0 && Number.isFinite(resolution)) {
    const exponent = lastDigitExponent(resolution, uncertaintyDigits(resolution));
    digits = Math.max(0, Math.round(Math.log10(prefix.factor)) - exponent);
  }
  const number = (v: number | null | undefined) => (typeof v === 'number' && Number.isFinite(v) ? formatNumber(v / prefix.factor, digits) : '—');
  const symbol = `${prefix.symbol}${unit}`;
  return { unit: symbol, number, text: (v) => (typeof v === 'number' && Number.isFinite(v) ? `${number(v)} ${symbol}` : '—') };
}

/**
 * A range whose ends may be open ("…"): both ends in one unit, as `formatQuantityRange`;
 * one end alone as "≥ 6.0 mA" / "≤ −0.5 V"; neither as "—".
 */
export function formatOpenRange(lo: number | null | undefined, hi: number | null | undefined, unit: QuantityUnit, digits = 2): string {
  const has = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
  if (has(lo) && has(hi)) return formatQuantityRange(lo, hi, unit, digits);
  if (has(lo)) return `≥ ${formatQuantity(lo, unit, digits)}`;
  if (has(hi)) return `≤ ${formatQuantity(hi, unit, digits)}`;
  return '—';
}

/** A plain ratio or count-like number with the true minus sign: formatRatio(0.9512, 3) → "0.951". */
export function formatPlain(value: number | null | undefined, digits: number): string {
  return typeof value === 'number' && Number.isFinite(value) ? formatNumber(value, digits) : '—';
}

/** A share as a percentage: formatPercent(0.279, 1) → "27.9 %". */
export function formatPercent(share: number | null | undefined, digits = 1): string {
  return typeof share === 'number' && Number.isFinite(share) ? `${formatNumber(share * 100, digits)} %` : '—';
}

/**
 * A bare number and its uncertainty for units without SI prefixes here (mA/V², /V), both
 * rounded to the uncertainty's last significant digit: (0.0123456, 0.00021) → ["0.01235", "0.00021"].
 */
export function formatMeasuredNumber(value: number, uncertainty: number | null | undefined, fallbackSig = 4): [string, string] {
  if (!Number.isFinite(value)) return ['—', ''];
  const u = uncertainty === null || uncertainty === undefined ? NaN : Math.abs(uncertainty);
  if (!(u > 0) || !Number.isFinite(u)) {
    if (value === 0) return ['0', ''];
    const digits = Math.max(0, -lastDigitExponent(value, fallbackSig));
    return [formatNumber(Number(value.toPrecision(fallbackSig)), digits), ''];
  }
  const digits = Math.max(0, -lastDigitExponent(u, uncertaintyDigits(u)));
  return [formatNumber(value, digits), formatNumber(u, digits)];
}
