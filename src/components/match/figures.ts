import { formatDateTime } from '~/core/units/format-date';
import { formatQuantity } from '~/core/units/format-quantity';

/** Display helpers shared by the match, reservation and pick-list islands. */
export const volts = (v: number | null | undefined, digits = 3) => (v === null || v === undefined ? '—' : formatQuantity(v, 'V', digits));
export const amps = (a: number | null | undefined, digits = 2) => (a === null || a === undefined ? '—' : formatQuantity(a, 'A', digits));
export const siemens = (s: number | null | undefined, digits = 2) => (s === null || s === undefined ? '—' : formatQuantity(s, 'S', digits));
export const percent = (x: number | null | undefined, digits = 1) => (x === null || x === undefined ? '—' : `${(x * 100).toFixed(digits)} %`);
export const millivolts = (v: number | null | undefined, digits = 2) => (v === null || v === undefined ? '—' : `${(v * 1e3).toFixed(digits)} mV`);

export const SHAPE_WORDS: Record<string, { one: string; many: string }> = {
  pair: { one: 'matched pair', many: 'matched pairs' },
  quad: { one: 'matched quad', many: 'matched quads' },
  cascode_pair: { one: 'cascode (lower + upper)', many: 'cascodes (lower + upper)' },
  matched_cascode_pairs: { one: 'pair of matched cascodes', many: 'pairs of matched cascodes' },
};

export const ROLE_WORDS: Record<string, string> = {
  a: 'A',
  b: 'B',
  c: 'C',
  d: 'D',
  lower: 'lower',
  upper: 'upper',
};

export function roleLabel(role: string, cascodeIndex?: number): string {
  const base = ROLE_WORDS[role] ?? role;
  return cascodeIndex === undefined ? base : `${base} ${cascodeIndex + 1}`;
}

/** The one date-and-time format (ISO 8601, UTC). */
export function dateTime(iso: string | null | undefined): string {
  return formatDateTime(iso);
}

/** "in 2 days 5 h" / "3 h ago" */
export function relativeTo(iso: string, now = Date.now()): string {
  const ms = new Date(iso).getTime() - now;
  const abs = Math.abs(ms);
  const d = Math.floor(abs / 86_400_000);
  const h = Math.floor((abs % 86_400_000) / 3_600_000);
  const m = Math.floor((abs % 3_600_000) / 60_000);
  const text = d > 0 ? `${d} day${d === 1 ? '' : 's'}${h ? ` ${h} h` : ''}` : h > 0 ? `${h} h ${m} min` : `${m} min`;
  return ms >= 0 ? `in ${text}` : `${text} ago`;
}

export const STATUS_TAG: Record<string, string> = {
  active: 'tag-review',
  open: 'tag-review',
  issued: 'tag-ok',
  complete: 'tag-ok',
  cancelled: 'tag-plain',
  expired: 'tag-held',
  reserved: 'tag-review',
  in_stock: 'tag-plain',
  returned: 'tag-held',
};
