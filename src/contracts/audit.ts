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
