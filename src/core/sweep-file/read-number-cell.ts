/** Why a cell is not a usable number. */
export type NumberCellProblem = 'empty' | 'non_numeric' | 'not_finite';

const PLUS = 43;
const MINUS = 45;
const DOT = 46;
const COMMA = 44;
const ZERO = 48;
const NINE = 57;
const LOWER_E = 101;
const UPPER_E = 69;
const SPACE = 32;
const TAB = 9;

const NON_FINITE_WORDS = new Set(['nan', 'inf', 'infinity', '1.#inf', '1.#ind', '1.#qnan']);
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));
/** Integers up to 15 digits and powers of ten up to 1e22 are exact doubles. */
const MAX_FAST_DIGITS = 15;
const MAX_FAST_POWER = 22;

/**
 * Reads a plain decimal number: optional sign, digits with at most one decimal separator,
 * optional exponent (`-0.5`, `+1.25e-3`, `.5`, `5.`). With `decimalComma` the separator may
 * also be `,` (`-0,5`). Surrounding blanks are ignored. Returns the value times
 * 10^`powerOfTen` rounded once to the nearest double (so `"2.5"` in mA with -3 is exactly
 * the double nearest 0.0025), finite and never -0, or the reason it is not a number;
 * hexadecimal, thousands separators and units are rejected.
 */
export function readNumberCell(
  cell: string,
  decimalComma: boolean,
  powerOfTen = 0,
): number | NumberCellProblem {
  let start = 0;
  let end = cell.length;
  while (start < end && isBlank(cell.charCodeAt(start))) start++;
  while (end > start && isBlank(cell.charCodeAt(end - 1))) end--;
  if (start === end) return 'empty';

  let i = start;
  let c = cell.charCodeAt(i);
  const negative = c === MINUS;
  if (c === PLUS || c === MINUS) i++;
  let digits = 0;
  let significantDigits = 0;
  let fractionDigits = 0;
  let separatorAt = -1;
  let mantissa = 0;
  for (; i < end; i++) {
    c = cell.charCodeAt(i);
    if (c >= ZERO && c <= NINE) {
      digits++;
      if (separatorAt >= 0) fractionDigits++;
      if (mantissa !== 0 || c !== ZERO) significantDigits++;
      mantissa = mantissa * 10 + (c - ZERO);
    } else if (separatorAt < 0 && (c === DOT || (decimalComma && c === COMMA))) separatorAt = i;
    else break;
  }
  if (digits === 0) {
    const text = cell.slice(start, end).toLowerCase();
    const unsigned = text.charCodeAt(0) === PLUS || text.charCodeAt(0) === MINUS ? text.slice(1) : text;
    return NON_FINITE_WORDS.has(unsigned) ? 'not_finite' : 'non_numeric';
  }
  const mantissaEnd = i;
  let exponent = 0;
  if (i < end && (c === LOWER_E || c === UPPER_E)) {
    i++;
    let exponentNegative = false;
    const s = cell.charCodeAt(i);
    if (i < end && (s === PLUS || s === MINUS)) {
      exponentNegative = s === MINUS;
      i++;
    }
    let exponentDigits = 0;
    for (; i < end; i++) {
      c = cell.charCodeAt(i);
      if (c < ZERO || c > NINE) break;
      exponentDigits++;
      if (exponent < 1e6) exponent = exponent * 10 + (c - ZERO);
    }
    if (exponentDigits === 0) return 'non_numeric';
    if (exponentNegative) exponent = -exponent;
  }
  if (i !== end) return 'non_numeric';

  const scale = exponent + powerOfTen - fractionDigits;
  let value: number;
  if (significantDigits <= MAX_FAST_DIGITS && scale >= -MAX_FAST_POWER && scale <= MAX_FAST_POWER) {
    // One correctly rounded operation on exact operands: the nearest double, as Number() gives.
    value = scale >= 0 ? mantissa * POWERS_OF_TEN[scale] : mantissa / POWERS_OF_TEN[-scale];
    if (negative) value = -value;
  } else {
    let text = cell.slice(start, mantissaEnd);
    if (separatorAt >= 0 && cell.charCodeAt(separatorAt) === COMMA) {
      text = cell.slice(start, separatorAt) + '.' + cell.slice(separatorAt + 1, mantissaEnd);
    }
    value = Number(`${text}e${exponent + powerOfTen}`);
    // The number as written must be a double before its unit scales it: 1e309 in mA is an
    // overflow, not 1e306 A.
    if (Number.isFinite(value) && !Number.isFinite(Number(`${text}e${exponent}`))) return 'not_finite';
  }
  if (!Number.isFinite(value)) return 'not_finite';
  return value === 0 ? 0 : value;
}

function isBlank(c: number): boolean {
  return c === SPACE || c === TAB;
}
