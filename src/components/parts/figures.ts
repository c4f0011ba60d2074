import { formatQuantity, MINUS_SIGN, type QuantityUnit } from '../../core/units/format-quantity';

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

export function when(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  return d.toLocaleString('en-GB', { year: 'numeric', month: 'short', day: '2-digit', hour: '2-digit', minute: '2-digit' });
}
