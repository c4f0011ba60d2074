/**
 * The one rule for serials, used wherever a serial is entered (intake, stock receive and
 * count, labels, pick-list scans, part lookup): see `normalizeSerial` and `serialProblem`.
 *
 * Allowed: letters A–Z, digits, `-`, `_` and `.`; 1 to 40 characters; the first a letter or
 * a digit; at least one letter. Why:
 * - a URL path: these are RFC 3986 "unreserved" characters, so `/parts/<serial>` needs no
 *   escaping (a `/`, `+`, `%`, `?` or `#` did make part pages unreachable); a leading letter
 *   or digit rules out `.` and `..`;
 * - a barcode: all are in Code 128 set B (ISO/IEC 15417), and 40 characters still print
 *   at a scannable bar width on a 50 mm label;
 * - a spreadsheet cell: no leading `=`, `+`, `-` or `@` (formula injection, OWASP "CSV
 *   Injection"), and a letter somewhere, since digits alone or with `-`/`.` are read as a
 *   number or a date ("0012" → 12, "1-2" → 2 January) and lose their form.
 * Case: serials are upper-case. A scanned or typed serial is compared after `normalizeSerial`,
 * so "jx-0101 " and "JX-0101" are the same part on every screen.
 */
export const SERIAL_MAX_LENGTH = 40;

/**
 * A serial as entered → the stored form: scanner prefix/suffix control codes removed,
 * surrounding blanks trimmed, letters upper-cased. Inner characters are kept as they are
 * (check them with `serialProblem`).
 */
export function normalizeSerial(raw: string): string {
  // eslint-disable-next-line no-control-regex
  return raw.replace(/[\u0000-\u001f\u007f-\u009f]/g, '').trim().toUpperCase();
}

const ALLOWED = /^[A-Z0-9][A-Z0-9._-]*$/;

/** Why a normalized serial cannot be used, as a phrase ("contains "/""), or null when it can. */
export function serialProblem(serial: string): string | null {
  if (serial.length === 0) return 'is empty';
  if (serial.length > SERIAL_MAX_LENGTH) return `is ${serial.length} characters long, over the limit of ${SERIAL_MAX_LENGTH}`;
  if (!ALLOWED.test(serial)) {
    const first = /^[A-Z0-9]/.test(serial) ? null : serial[0];
    if (first !== null) return `starts with ${describeCharacter(first)}`;
    const bad = [...serial].find((c) => !/[A-Z0-9._-]/.test(c)) ?? '';
    return `contains ${describeCharacter(bad)}`;
  }
  if (!/[A-Z]/.test(serial)) return 'has no letter (a spreadsheet reads digits alone as a number or a date)';
  return null;
}

/** What a serial may hold, for messages. */
export const SERIAL_RULE = `1 to ${SERIAL_MAX_LENGTH} letters, digits, "-", "_" or "." starting with a letter or digit and holding at least one letter, e.g. "JX-0101"`;

function describeCharacter(c: string): string {
  if (c === ' ') return 'a space';
  const code = c.codePointAt(0) ?? 0;
  if (code < 0x20 || (code >= 0x7f && code < 0xa0)) return `the control character \\u${code.toString(16).padStart(4, '0')}`;
  return `"${c}"`;
}
