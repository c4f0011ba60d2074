import { describe, expect, it } from 'vitest';
import { columnFormat, formatMeasured, formatOpenRange, formatPercent, formatSignificant, uncertaintyDigits } from '~/core/units/format-quantity';
import { formatDate, formatDateTime } from '~/core/units/format-date';

const M = '\u2212';

// Rounding an uncertainty to one or two significant digits and the value to the same decimal
// place: GUM (JCGM 100:2008) 7.2.6 and the Particle Data Group's rule, from memory.
describe('formatMeasured', () => {
  it.each([
    [-0.5433969, 0.00047, 'V', `${M}543.4 mV ± 0.5 mV`],
    [-1.234567, 0.0004746841, 'V', `${M}1.2346 V ± 0.5 mV`],
    [-3.363027, 0.0017, 'V', `${M}3.3630 V ± 1.7 mV`],
    [6.51234e-3, 1.234e-6, 'A', '6.5123 mA ± 1.2 µA'],
    [2.5e-3, 0.31e-3, 'S', '2.50 mS ± 0.31 mS'],
    [4.3e-6, 12e-6, 'S', '4 µS ± 12 µS'],
    [1234.5, 87, 'Ω', '1.23 kΩ ± 0.09 kΩ'],
  ] as const)('%d ± %d %s → %s', (value, u, unit, text) => {
    expect(formatMeasured(value, u, unit).text).toBe(text);
  });

  it('keeps the digits of the uncertainty and splits value and uncertainty for table cells', () => {
    const m = formatMeasured(-0.5433969, 0.00013, 'V');
    expect(m.value).toBe(`${M}543.40 mV`);
    expect(m.uncertainty).toBe('0.13 mV');
  });

  it('falls back to significant digits without an uncertainty', () => {
    expect(formatMeasured(-0.5433969, null, 'V').text).toBe(`${M}543.4 mV`);
    expect(formatMeasured(Number.NaN, 1, 'V').text).toBe('—');
  });

  it('uses two digits for leading 100–354, one above', () => {
    expect(uncertaintyDigits(0.00354)).toBe(2);
    expect(uncertaintyDigits(0.000355)).toBe(1);
    expect(uncertaintyDigits(9.9)).toBe(1);
    expect(uncertaintyDigits(1.0)).toBe(2);
  });
});

describe('formatSignificant', () => {
  it.each([
    [680, 'Ω', 3, '680 Ω'],
    [266.1e-6, 'S', 4, '266.1 µS'],
    [2.5e-3, 'A', 4, '2.500 mA'],
    [-1.78, 'V', 3, `${M}1.78 V`],
    [0.9999e-3, 'A', 3, '1.00 mA'],
  ] as const)('%d %s to %d → %s', (value, unit, sig, text) => {
    expect(formatSignificant(value, unit, sig)).toBe(text);
  });
});

describe('columnFormat', () => {
  it('puts a whole column in one unit (not −646.23 mV beside −2.24 V)', () => {
    const c = columnFormat([-0.64623, -2.24, -1.1], 'V', 4);
    expect(c.unit).toBe('V');
    expect([c.number(-0.64623), c.number(-2.24)]).toEqual([`${M}0.646`, `${M}2.240`]);
    expect(c.text(null)).toBe('—');
  });
  it('follows a resolution when one is given', () => {
    const c = columnFormat([6.5e-3, 0.9e-3], 'A', 4, 0.004e-3);
    expect(c.unit).toBe('mA');
    expect(c.number(0.9e-3)).toBe('0.900');
  });
});

describe('formatOpenRange and formatPercent', () => {
  it('writes ranges in one unit', () => {
    expect(formatOpenRange(-4, -0.6, 'V', 2)).toBe(`${M}4.00 to ${M}0.60 V`);
    expect(formatOpenRange(null, -0.6, 'V', 2)).toBe(`≤ ${M}600.00 mV`);
    expect(formatOpenRange(null, null, 'V', 2)).toBe('—');
    expect(formatPercent(0.279, 1)).toBe('27.9 %');
  });
});

// ISO 8601 calendar date and time, UTC: one format on every screen.
describe('formatDate', () => {
  it('writes ISO dates in UTC', () => {
    expect(formatDate('2026-12-02T07:46:27.123Z')).toBe('2026-12-02');
    expect(formatDateTime(new Date('2026-12-02T23:59:59Z'))).toBe('2026-12-02 23:59 UTC');
    expect(formatDateTime(null)).toBe('—');
    expect(formatDate('not a date')).toBe('—');
  });
});
