import { describe, expect, it } from 'vitest';
import { formatQuantity, formatQuantityRange } from '~/core/units/format-quantity';

// Prefix symbols and the space between number and unit: SI Brochure, 9th edition (BIPM), from memory.
// Minus sign U+2212 rather than the hyphen: ISO 80000-1 typesetting, from memory.
describe('formatQuantity', () => {
  it.each([
    [6.5e-3, 'A', 2, '6.50 mA'],
    [150e-6, 'A', 0, '150 µA'],
    [2.5e-9, 'A', 1, '2.5 nA'],
    [-1.8, 'V', 1, '\u22121.8 V'],
    [-0.35, 'V', 0, '\u2212350 mV'],
    [2.5e-3, 'S', 2, '2.50 mS'],
    [40e-6, 'S', 1, '40.0 µS'],
    [4700, 'Ω', 1, '4.7 kΩ'],
    [48, 'Ω', 0, '48 Ω'],
    [100e-12, 'F', 0, '100 pF'],
    [10.7e6, 'Hz', 1, '10.7 MHz'],
    [0, 'A', 1, '0.0 A'],
  ] as const)('%d %s (%d digits) → %s', (value, unit, digits, text) => {
    expect(formatQuantity(value, unit, digits)).toBe(text);
  });

  it('moves up a prefix when rounding reaches 1000 (0.99996 mA → 1.0 mA, not 1000.0 µA)', () => {
    expect(formatQuantity(0.99996e-3, 'A', 1)).toBe('1.0 mA');
    expect(formatQuantity(999.4e-6, 'A', 0)).toBe('999 µA');
  });

  it('never prints a negative zero and prints non-finite values as a dash', () => {
    expect(formatQuantity(-0.00001, 'V', 1)).toBe('\u221210.0 µV');
    expect(formatQuantity(-1e-12, 'V', 1)).toBe('0.0 µV');
    expect(formatQuantity(Number.NaN, 'V', 1)).toBe('—');
  });
});

describe('formatQuantityRange', () => {
  it('shares one prefix and picks the joiner by sign', () => {
    expect(formatQuantityRange(6.0e-3, 6.5e-3, 'A', 1)).toBe('6.0–6.5 mA');
    expect(formatQuantityRange(900e-6, 1.1e-3, 'A', 1)).toBe('0.9–1.1 mA');
    expect(formatQuantityRange(-1.8, -2.0, 'V', 1)).toBe('\u22121.8 to \u22122.0 V');
    expect(formatQuantityRange(-0.1, 0.1, 'V', 0)).toBe('\u2212100 to 100 mV');
  });
});

describe('formatQuantityRange near zero', () => {
  // Common practice: bin labels are written "VP −0.4 to −0.8 V", not in millivolts.
  it('keeps the base unit while the larger end reads at least 0.1', () => {
    expect(formatQuantityRange(-0.4, -0.8, 'V', 1)).toBe('−0.4 to −0.8 V');
    expect(formatQuantityRange(0.5e-3, 1e-3, 'A', 1)).toBe('0.5–1.0 mA');
  });
  it('falls back to the finer prefix rather than rounding the ends away', () => {
    expect(formatQuantityRange(-0.04, -0.08, 'V', 0)).toBe('−40 to −80 mV');
  });
});
