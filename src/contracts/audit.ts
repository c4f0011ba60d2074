import { z } from 'zod';
import { IsoDateTime, PageFields } from './common';

/** A field an audit entry changed, in words. */
export const AuditChangeJson = z.object({
  field: z.string(),
  from: z.string().nullable(),
  to: z.string().nullable(),
});
export type AuditChangeJson = z.infer<typeof AuditChangeJson>;

/** One audit-log entry with its action and changes in words. */
export const AuditEntryJson = z.object({
  id: z.number().int(),
  at: IsoDateTime,
  action: z.string(),
  /** The action in words ("moved"). */
  what: z.string(),
  /** The changes in words ("status accepted → in stock, bin I05-P07 → I05-P08"). */
  summary: z.string(),
  changes: z.array(AuditChangeJson),
  /** E-mail of the person, "station NAME", or "system" for jobs. */
  actor: z.string(),
  subject_type: z.string(),
  subject_id: z.string(),
  reason: z.string().nullable(),
  before: z.unknown(),
  after: z.unknown(),
});
export type AuditEntryJson = z.infer<typeof AuditEntryJson>;

/** `GET /api/admin/audit`. */
export const AuditLogPage = z.object({
  entries: z.array(AuditEntryJson),
  ...PageFields,
  /** Every action the services write, for the filter's pick list. */
  actions: z.array(z.string()),
});
export type AuditLogPage = z.infer<typeof AuditLogPage>;

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const day = z.preprocess(blankToUndefined, z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date written YYYY-MM-DD').optional());

/** The query of `GET /api/admin/audit` (blank fields count as absent). */
export const AuditLogQuery = z.object({
  /** Part of a serial (or of any subject id), case-insensitive. */
  serial: z.preprocess(blankToUndefined, z.string().trim().max(80).optional()),
  /** Part of a person's e-mail or name, or of a station's name, case-insensitive. */
  person: z.preprocess(blankToUndefined, z.string().trim().max(120).optional()),
  /** An action ("stock.move") or its first part ("stock"). */
  action: z.preprocess(blankToUndefined, z.string().trim().max(60).regex(/^[a-z_.]+$/, 'must be an action name such as stock.move').optional()),
  /** First and last day, inclusive, in UTC. */
  from: day,
  to: day,
  page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).default(1)),
  page_size: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(200).default(50)),
});
export type AuditLogQuery = z.infer<typeof AuditLogQuery>;
