import { describePartStatus, PART_STATUSES, type PartStatus } from '../stock/part-transitions';

/**
 * An audit row in words: "status accepted → in stock, bin I05-P07 → I05-P08". The row's
 * `before`/`after` JSON holds ids; `names` turns them into what people read (bin codes,
 * location names, reservation codes), looked up by the caller.
 */
export interface AuditRowInput {
  action: string;
  subjectType: string;
  subjectId: string;
  before: unknown;
  after: unknown;
  reason: string | null;
}

export interface AuditNames {
  bins: ReadonlyMap<number, string>;
  locations: ReadonlyMap<number, string>;
  reservations: ReadonlyMap<string, string>;
}

export interface AuditChange {
  /** "status", "bin", "location"… */
  field: string;
  from: string | null;
  to: string | null;
}

export interface DescribedAuditEntry {
  /** "moved", "fitted from a sweep", "bin plan applied"… */
  what: string;
  changes: AuditChange[];
  /** "status accepted → in stock, bin I05-P07 → I05-P08" (empty when nothing changed field by field). */
  summary: string;
}

/** Words for each action; an action not listed reads as its name with spaces. */
export const AUDIT_ACTION_WORDS: Record<string, string> = {
  'part.sweep': 'new sweep stored',
  'part.fit': 'fitted',
  'part.bin': 'binned',
  'part.refit': 'refitted on review',
  'part.review_accept': 'accepted on review',
  'part.review_retest': 'sent for retest on review',
  'part.reserve': 'reserved',
  'part.unreserve': 'reservation released',
  'part.issue': 'issued',
  'part.return': 'returned',
  'part.restock': 'put back in stock',
  'fit.accept': 'fit accepted',
  'fit.refit': 'refitted',
  'fit.retest': 'retest asked',
  'pick_line.pick': 'picked',
  'stock.receive': 'received into stock',
  'stock.move': 'moved',
  'stock.return': 'returned to stock',
  'stock.scrap': 'scrapped',
  receive: 'received',
  'reservation.create': 'reservation made',
  'reservation.cancel': 'reservation cancelled',
  'reservation.expire': 'reservation expired',
  'reservation.issue': 'reservation issued',
  'bin.update': 'bin changed',
  'bin_plan.activate': 'bin plan activated',
  'device_type.create': 'device type created',
  'device_type.update': 'device type changed',
  'location.create': 'location created',
  'location.update': 'location changed',
  'location.delete': 'location removed',
  'lot.create': 'lot created',
  'station.create': 'station token created',
  'station.revoke': 'station token revoked',
  'upload.receive': 'upload received',
  'upload_file.reject': 'file refused',
  'user.invite': 'person invited',
  'user.set_roles': 'roles changed',
};

export function auditActionWords(action: string): string {
  return AUDIT_ACTION_WORDS[action] ?? action.replace(/[._]/g, ' ');
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Services write some fields camelCase (`locationId` from a status change's `set`): one spelling. */
function snakeKeys(v: unknown): Record<string, unknown> | null {
  if (!isRecord(v)) return null;
  return Object.fromEntries(Object.entries(v).map(([k, x]) => [k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`), x]));
}
const isStatus = (v: unknown): v is PartStatus => typeof v === 'string' && (PART_STATUSES as readonly string[]).includes(v);

/** Fields a person reads first, in this order; others follow in the order they were written. */
const FIELD_ORDER = ['status', 'bin', 'location', 'reservation', 'fit', 'review'];

function plainValue(v: unknown): string | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'string') return v.replace(/_/g, ' ');
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (Array.isArray(v)) return v.length === 0 ? 'none' : v.every((x) => typeof x !== 'object') ? v.join(', ') : `${v.length} entries`;
  return Object.entries(v as Record<string, unknown>)
    .map(([k, x]) => `${k.replace(/_/g, ' ')} ${plainValue(x) ?? '—'}`)
    .join(', ');
}

/** One field of before/after in words: its name and its value. Null drops the field. */
function wordsFor(key: string, value: unknown, record: Record<string, unknown>, names: AuditNames): { field: string; text: string | null } | null {
  switch (key) {
    case 'status':
      return { field: 'status', text: isStatus(value) ? describePartStatus(value) : plainValue(value) };
    case 'bin_id':
      // A bin code written beside the id wins: the bin row may be gone after a new plan.
      if (typeof record.bin_code === 'string') return null;
      return { field: 'bin', text: value === null || value === undefined ? 'none' : names.bins.get(Number(value)) ?? `bin #${value}` };
    case 'bin_code':
      return { field: 'bin', text: typeof value === 'string' ? value : 'none' };
    case 'location_id':
      return { field: 'location', text: value === null || value === undefined ? 'none' : names.locations.get(Number(value)) ?? `location #${value}` };
    case 'reservation_id':
      return { field: 'reservation', text: value === null || value === undefined ? 'none' : names.reservations.get(String(value)) ?? String(value) };
    case 'fit_id':
      return { field: 'fit', text: value === null || value === undefined ? 'none' : String(value) };
    case 'excluded_points':
      return { field: 'points left out', text: Array.isArray(value) ? String(value.length) : plainValue(value) };
    case 'plan_version':
      return { field: 'plan', text: value === null || value === undefined ? null : `version ${value}` };
    case 'flags':
      return { field: 'flags', text: Array.isArray(value) ? (value.length ? value.map((f) => String(f).replace(/_/g, ' ')).join(', ') : 'none') : plainValue(value) };
    default:
      return { field: key.replace(/_id$/, '').replace(/_/g, ' '), text: plainValue(value) };
  }
}

/**
 * The changes of one audit row: every field written in `after` whose value differs from
 * `before` (fields only in `before` are context, not changes); a row with no `after`
 * lists what `before` held as removed.
 */
export function describeAuditEntry(row: AuditRowInput, names: AuditNames): DescribedAuditEntry {
  const before = snakeKeys(row.before) ?? {};
  const after = snakeKeys(row.after);
  const changes: AuditChange[] = [];
  const seen = new Set<string>();
  const source = after ?? before;
  for (const key of Object.keys(source)) {
    const to = after ? wordsFor(key, after[key], after, names) : null;
    if (after && to === null) continue;
    const from = key in before ? wordsFor(key, before[key], before, names) : null;
    const field = (to ?? from)?.field;
    if (!field || seen.has(field)) continue;
    const fromText = from?.text ?? null;
    const toText = after ? to?.text ?? null : null;
    if (after && fromText === toText) continue;
    seen.add(field);
    changes.push({ field, from: fromText, to: toText });
  }
  // bin_code may sit only in `after`: take the old code from the before's id.
  const bin = changes.find((c) => c.field === 'bin');
  if (bin && bin.from === null && 'bin_id' in before) bin.from = wordsFor('bin_id', before.bin_id, {}, names)?.text ?? null;
  changes.sort((a, b) => rank(a.field) - rank(b.field));
  const summary = changes
    .map((c) => (c.from !== null && c.to !== null ? `${c.field} ${c.from} → ${c.to}` : c.to !== null ? `${c.field} ${c.to}` : `${c.field} ${c.from} removed`))
    .join(', ');
  return { what: auditActionWords(row.action), changes, summary };
}

function rank(field: string): number {
  const i = FIELD_ORDER.indexOf(field);
  return i < 0 ? FIELD_ORDER.length : i;
}

/** Ids an audit row refers to, so the caller can look their names up in one query each. */
export function auditReferencedIds(rows: readonly Pick<AuditRowInput, 'before' | 'after'>[]): { binIds: number[]; locationIds: number[]; reservationIds: string[] } {
  const bins = new Set<number>();
  const locations = new Set<number>();
  const reservations = new Set<string>();
  for (const r of rows) {
    for (const raw of [r.before, r.after]) {
      const side = snakeKeys(raw);
      if (!side) continue;
      if (typeof side.bin_id === 'number') bins.add(side.bin_id);
      if (typeof side.location_id === 'number') locations.add(side.location_id);
      if (typeof side.reservation_id === 'string') reservations.add(side.reservation_id);
    }
  }
  return { binIds: [...bins], locationIds: [...locations], reservationIds: [...reservations] };
}
