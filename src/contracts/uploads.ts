import { z } from 'zod';
import { IsoDateTime } from './common';

export const UPLOAD_FILE_STATES = ['queued', 'fitted', 'needs_review', 'rejected'] as const;
export const UploadFileState = z.enum(UPLOAD_FILE_STATES);
export type UploadFileState = z.infer<typeof UploadFileState>;

/** `POST /api/sweeps`: each file as received (refused at once when over-size or not text); answered before any fitting. */
export const UploadReceived = z.object({
  upload_id: z.string(),
  files: z.array(
    z.object({
      id: z.number().int(),
      name: z.string(),
      state: UploadFileState,
      reason: z.string().nullable(),
      /** The earlier file with the same bytes. */
      duplicate_of: z.number().int().nullable(),
    }),
  ),
});
export type UploadReceived = z.infer<typeof UploadReceived>;

/** A queued file whose fitting failed before and is being tried again. */
export const FitRetryJson = z.object({
  /** The attempt under way or next (2 for the first retry). */
  attempt: z.number().int(),
  attempts: z.number().int(),
  /** When the next attempt may start; null while one is running. */
  next_at: IsoDateTime.nullable(),
});
export type FitRetryJson = z.infer<typeof FitRetryJson>;

/** What the intake did to a part of the file that the uploader should know (a gate-leak point left out, a short curve). */
export const UploadFileNote = z.object({
  serial: z.string(),
  code: z.string(),
  vgs_v: z.number().nullable(),
  lines: z.array(z.number().int()),
  message: z.string(),
});
export type UploadFileNote = z.infer<typeof UploadFileNote>;

export const UploadFileStatus = z.object({
  id: z.number().int(),
  name: z.string(),
  size_bytes: z.number().int(),
  sha256: z.string(),
  state: UploadFileState,
  reason: z.string().nullable(),
  error_code: z.string().nullable(),
  serials: z.array(z.string()),
  /** The earlier file with the same bytes; state, reason and serials are that file's. */
  duplicate_of: z.object({ file_id: z.number().int(), upload_id: z.string(), name: z.string() }).nullable(),
  finished_at: IsoDateTime.nullable(),
  notes: z.array(UploadFileNote),
  /** Set while a queued file is being tried again; else null. */
  retry: FitRetryJson.nullable(),
});
export type UploadFileStatus = z.infer<typeof UploadFileStatus>;

/** `GET /api/uploads/{id}`: an upload and the state of each of its files. */
export const UploadStatus = z.object({
  upload_id: z.string(),
  created_at: IsoDateTime,
  /** The tags sent with the files (lot, device_type, temperature_c, station, operator, channel). */
  tags: z.record(z.string(), z.union([z.string(), z.number()])),
  /** No file is queued any more. */
  done: z.boolean(),
  counts: z.record(UploadFileState, z.number().int()),
  files: z.array(UploadFileStatus),
});
export type UploadStatus = z.infer<typeof UploadStatus>;

/** Refused files of a lot grouped by reason, with one file's own message as an example. */
export const RefusalGroupJson = z.object({
  code: z.string(),
  words: z.string(),
  files: z.number().int(),
  example: z.string(),
});
export type RefusalGroupJson = z.infer<typeof RefusalGroupJson>;

/** One lot's part of an upload, with the supplier to mail it to. */
export const LotSummaryJson = z.object({
  lot: z.string().nullable(),
  files: z.number().int(),
  parts: z.object({ fitted: z.number().int(), needs_review: z.number().int() }),
  fitted: z.number().int(),
  needs_review: z.number().int(),
  rejected: z.number().int(),
  queued: z.number().int(),
  refusals: z.array(RefusalGroupJson),
  device_type: z.string().nullable(),
  supplier: z.string(),
  supplier_email: z.string(),
});
export type LotSummaryJson = z.infer<typeof LotSummaryJson>;

/** `GET /api/uploads/{id}/summary`: the upload per lot. */
export const UploadSummaryJson = z.object({
  upload_id: z.string(),
  created_at: IsoDateTime,
  /** The person's name, or "a test station". */
  uploaded_by: z.string(),
  done: z.boolean(),
  lots: z.array(LotSummaryJson),
});
export type UploadSummaryJson = z.infer<typeof UploadSummaryJson>;

/** `POST /api/uploads/{id}/summary-mail`: which lot's summary to mail, and to whom. */
export const LotSummaryMailRequest = z.object({
  lot: z.string().trim().min(1, 'name the lot whose summary is mailed'),
  to: z.email('give the supplier contact’s e-mail address, e.g. quality@supplier.example'),
});
export type LotSummaryMailRequest = z.infer<typeof LotSummaryMailRequest>;

/** `POST /api/uploads/{id}/summary-mail`: the mail sent. */
export const LotSummaryMailed = z.object({ sent_to: z.string(), subject: z.string(), lot: z.string() });
export type LotSummaryMailed = z.infer<typeof LotSummaryMailed>;

const text = (max: number) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), z.string().trim().max(max).optional());

/** The tag fields of `POST /api/sweeps` (multipart, beside the `file` fields): tags an uploader gives for files that do not say: each applies only where the file is silent. */
export const UploadTags = z.object({
  lot: text(60),
  device_type: text(40),
  temperature_c: z.preprocess(
    (v) => (v === undefined || v === null || (typeof v === 'string' && v.trim() === '') ? undefined : typeof v === 'string' ? Number(v.replace(',', '.')) : v),
    z.number({ message: 'must be a number of °C' }).min(-60, 'must be at least −60 °C').max(200, 'must be at most 200 °C').optional(),
  ),
  station: text(80),
  operator: text(80),
  channel: z.preprocess((v) => (typeof v === 'string' ? (v.trim() === '' ? undefined : v.trim().toLowerCase()) : v), z.enum(['n', 'p']).optional()),
});
export type UploadTags = z.infer<typeof UploadTags>;

export const UPLOAD_TAG_FIELDS = ['lot', 'device_type', 'temperature_c', 'station', 'operator', 'channel'] as const;
