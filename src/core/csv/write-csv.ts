/**
 * The one CSV writer of every export (RFC 4180: comma, CRLF, `"` doubled inside quotes),
 * safe to open in a spreadsheet.
 *
 * Text cells are neutralised as OWASP's CSV-injection guidance asks: a text cell that begins
 * with `=`, `+`, `-`, `@`, a tab or a carriage return gets a leading `'` (spreadsheets then show
 * it as text instead of evaluating it) and is quoted. Numbers are written as numbers, so a
 * negative figure (`-0.85` V) stays a number a spreadsheet can compute with; only JavaScript
 * `number` values count as numbers, never text that looks like one.
 */
export type CsvValue = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

/** One cell: empty for null, undefined and non-finite numbers. */
export function csvCell(value: CsvValue): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  const neutral = FORMULA_START.test(value) ? `'${value}` : value;
  return neutral !== value || /[",\r\n]/.test(neutral) ? `"${neutral.replace(/"/g, '""')}"` : neutral;
}

/** A whole file: the header line, then one line per row, each ending in CRLF. */
export function writeCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
