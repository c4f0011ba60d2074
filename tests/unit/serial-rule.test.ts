import { describe, expect, it } from 'vitest';
import { normalizeSerial, serialProblem, SERIAL_MAX_LENGTH } from '~/core/serial/normalize-serial';
import { collectScanBatch } from '~/core/stock/scan-batch';

/**
 * The one serial rule (issue: serials behave the same on every screen). Sources: RFC 3986
 * §2.3 (unreserved characters need no escaping in a URL path), ISO/IEC 15417 (Code 128 set B
 * holds all printable ASCII), OWASP "CSV Injection" (cells starting with = + - @ run as
 * formulas), and common spreadsheet behaviour (digits alone lose leading zeros).
 */
describe('normalizeSerial', () => {
  it.each([
    ['jx-0101', 'JX-0101'],
    ['  JX-0101\t', 'JX-0101'],
    ['\u0002jx-0101\r\n', 'JX-0101'],
    ['Jx_01.a', 'JX_01.A'],
  ])('%j → %s', (raw, normal) => {
    expect(normalizeSerial(raw)).toBe(normal);
  });

  it('is what every scan batch uses, so a lower-case scan finds the upper-case part', () => {
    expect(collectScanBatch(['jx-0101\njx-0102', ' JX-0101 ']).serials).toEqual(['JX-0101', 'JX-0102']);
    expect(collectScanBatch(['jx-0101', 'JX-0101']).repeated).toEqual(['JX-0101']);
  });
});

describe('serialProblem', () => {
  it.each(['JX-0101', 'A', 'LOT7.A_12', '2N5457-01', 'J'.repeat(SERIAL_MAX_LENGTH)])('accepts %s', (serial) => {
    expect(serialProblem(serial)).toBeNull();
  });

  it.each([
    ['', 'is empty'],
    ['J'.repeat(41), 'is 41 characters long, over the limit of 40'],
    ['JX+1', 'contains "+"'],
    ['LOT7/A', 'contains "/"'],
    ['JX 1', 'contains a space'],
    ['JX%2F', 'contains "%"'],
    ['=CMD', 'starts with "="'],
    ['@SUM', 'starts with "@"'],
    ['-JX', 'starts with "-"'],
    ['.JX', 'starts with "."'],
    ['000123', 'has no letter (a spreadsheet reads digits alone as a number or a date)'],
    ['1-2', 'has no letter (a spreadsheet reads digits alone as a number or a date)'],
    ['JX\u20131', 'contains "\u2013"'],
  ])('refuses %j: %s', (serial, why) => {
    expect(serialProblem(serial)).toBe(why);
  });

  it('keeps every accepted serial unchanged through a URL path segment', () => {
    for (const s of ['JX-0101', 'LOT7.A_12', 'A.B-C_D']) expect(encodeURIComponent(s)).toBe(s);
  });
});
