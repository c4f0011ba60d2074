import { describe, expect, it } from 'vitest';
import { csvCell, writeCsv } from '~/core/csv/write-csv';
import { safeNextPath } from '~/lib/safe-next-path';

// OWASP "CSV Injection" guidance: cells beginning with = + - @ TAB CR are prefixed with a
// single quote and the cell is quoted, with embedded double quotes doubled (RFC 4180).
describe('csvCell (OWASP CSV-injection guidance, RFC 4180 quoting)', () => {
  it.each([
    ['=1+2', `"'=1+2"`],
    ['+41 22', `"'+41 22"`],
    ['-2+3', `"'-2+3"`],
    ['@SUM(A1)', `"'@SUM(A1)"`],
    ['\t=cmd', `"'\t=cmd"`],
    ['\r=cmd', `"'\r=cmd"`],
    ['=HYPERLINK("http://x.test","y")', `"'=HYPERLINK(""http://x.test"",""y"")"`],
    ['-5', `"'-5"`],
  ])('neutralises the text %j', (text, cell) => {
    expect(csvCell(text)).toBe(cell);
  });
  it.each([
    ['JX-0101', 'JX-0101'],
    ['a,b', '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ['two\nlines', '"two\nlines"'],
    ['', ''],
  ])('writes the plain text %j as %j', (text, cell) => {
    expect(csvCell(text)).toBe(cell);
  });
  it('keeps numbers as numbers, negative ones too (they cannot carry a formula)', () => {
    expect(csvCell(-0.85)).toBe('-0.85');
    expect(csvCell(-1.5e-7)).toBe('-1.5e-7');
    expect(csvCell(0)).toBe('0');
    expect(csvCell(Number.NaN)).toBe('');
    expect(csvCell(Number.POSITIVE_INFINITY)).toBe('');
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
  });
  it('writes a header and CRLF-terminated rows', () => {
    expect(writeCsv(['lot', 'vp_v'], [['=cmd', -1.2], ['L-1', 0.5]])).toBe(`lot,vp_v\r\n"'=cmd",-1.2\r\nL-1,0.5\r\n`);
  });
});

// Derived from how browsers resolve a Location or location.assign() target (WHATWG URL: `\`
// is `/` in special schemes; tabs and newlines are removed; `//` starts an authority).
describe('safeNextPath: only same-origin paths', () => {
  it.each(['/home', '/parts?bin=A&q=JX%200101', '/parts/JX-0101', '/reservations/3f2a#sets', '/'])('keeps %j', (p) => {
    expect(safeNextPath(p)).toBe(p);
  });
  it.each([
    '//evil.test/phish',
    '/\\evil.test/phish',
    '/%5Cevil.test/phish',
    '/%5cevil.test',
    '/%2F%2Fevil.test',
    '/%2Fevil.test',
    '/%252F%252Fevil.test',
    '/%255Cevil.test',
    '/\t/evil.test',
    '/%09/evil.test',
    '/\n/evil.test',
    'https://evil.test/',
    'javascript:alert(1)',
    'evil.test',
    '%2F%2Fevil.test',
    '/%E0%A4%A',
    '',
  ])('refuses %j', (p) => {
    expect(safeNextPath(p)).toBe('/home');
  });
  it('uses the given fallback', () => {
    expect(safeNextPath(null, '/parts')).toBe('/parts');
  });
});
