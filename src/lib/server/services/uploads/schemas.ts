import { z } from 'zod';

const text = (max: number) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), z.string().trim().max(max).optional());

/** Tags an uploader gives for files that do not say: each applies only where the file is silent. */
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

/** Most files one request may carry, and most bytes one request may send. */
export const MAX_FILES_PER_UPLOAD = 500;
export const MAX_UPLOAD_REQUEST_BYTES = 256 * 1024 * 1024;
