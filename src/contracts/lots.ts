import { z } from 'zod';
import { STORABLE_DATE_RANGE_TEXT, isStorableDate } from '~/core/dates/storable-date';
import { Channel, IsoDateTime } from './common';

/** A lot with its device type, supplier and how many of its parts are in each status. */
export const LotJson = z.object({
  id: z.number().int(),
  code: z.string(),
  device_type: z.string(),
  channel: Channel,
  supplier: z.string(),
  notes: z.string(),
  received_at: IsoDateTime,
  part_count: z.number().int(),
  /** Parts of the lot per status; statuses with no parts are left out. */
  by_status: z.record(z.string(), z.number().int()),
});
export type LotJson = z.infer<typeof LotJson>;

/** `GET /api/lots`: newest received first. */
export const LotList = z.object({ lots: z.array(LotJson) });
export type LotList = z.infer<typeof LotList>;

/** `POST /api/lots`: a new lot of a known device type; received now unless said. */
export const CreateLotInput = z.object({
  code: z.string().trim().min(1, 'must not be empty').max(60, 'must be at most 60 characters'),
  device_type: z.string().trim().min(1, 'name the device type of the lot'),
  supplier: z.string().trim().max(120).default(''),
  notes: z.string().trim().max(1000).default(''),
  received_at: z.coerce
    .date({ error: 'expected a date such as 2025-03-01' })
    .refine(isStorableDate, { error: `expected ${STORABLE_DATE_RANGE_TEXT}` })
    .optional(),
});
export type CreateLotInput = z.infer<typeof CreateLotInput>;

/** `POST /api/lots`: the lot as created. */
export const LotCreated = z.object({
  id: z.number().int(),
  code: z.string(),
  device_type: z.string(),
  supplier: z.string(),
  notes: z.string(),
  received_at: IsoDateTime,
});
export type LotCreated = z.infer<typeof LotCreated>;
