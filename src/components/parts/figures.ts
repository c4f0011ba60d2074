import { formatDateTime } from '~/core/units/format-date';
import { formatMeasured, formatQuantity, MINUS_SIGN, type QuantityUnit } from '~/core/units/format-quantity';

export function q(value: number | null | undefined, unit: QuantityUnit, digits = 2): string {
  return value === null || value === undefined ? '—' : formatQuantity(value, unit, digits);
}

export function pm(se: number | null | undefined, unit: QuantityUnit, digits = 2): string {
  return se === null || se === undefined || !Number.isFinite(se) ? '' : `± ${formatQuantity(se, unit, digits)}`;
}

/** A plain number with the true minus sign, for units formatQuantity does not cover. */
export function plain(value: number | null | undefined, digits: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const t = value.toFixed(digits);
  return value < 0 && Number(t) !== 0 ? MINUS_SIGN + t.slice(1) : t.replace(/^-/, '');
}

export function percent(value: number | null | undefined, digits = 2): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : `${(value * 100).toFixed(digits)} %`;
}

/** The one date-and-time format (ISO 8601, UTC). */
export const when = (iso: string | null | undefined): string => formatDateTime(iso);

/**
 * A figure and its standard error as two table cells, both rounded to the error's last
 * significant digit ("−543.4 mV", "± 0.5 mV").
 */
export function measured(value: number | null | undefined, se: number | null | undefined, unit: QuantityUnit): [string, string] {
  if (value === null || value === undefined) return ['—', ''];
  const m = formatMeasured(value, se, unit);
  return [m.value, m.uncertainty ? `± ${m.uncertainty}` : ''];
}
