import { z } from 'zod';
import { IsoDateTime } from './common';

/** A test station's token as listed: never the token, only the prefix it is recognised by. */
export const StationJson = z.object({
  id: z.string(),
  name: z.string(),
  token_prefix: z.string(),
  created_at: IsoDateTime,
  last_used_at: IsoDateTime.nullable(),
  revoked_at: IsoDateTime.nullable(),
});
export type StationJson = z.infer<typeof StationJson>;

/** `GET /api/admin/stations`: newest first. */
export const StationList = z.object({ stations: z.array(StationJson) });
export type StationList = z.infer<typeof StationList>;

/** `POST /api/admin/stations`: a name for the new station. */
export const CreateStationInput = z.object({
  name: z.string().trim().min(1, 'must not be empty').max(80, 'must be at most 80 characters'),
});
export type CreateStationInput = z.infer<typeof CreateStationInput>;

/** `POST /api/admin/stations`: the token, shown this once and never stored. */
export const StationCreated = z.object({
  id: z.string(),
  name: z.string(),
  token: z.string(),
  token_prefix: z.string(),
  created_at: IsoDateTime,
});
export type StationCreated = z.infer<typeof StationCreated>;

/** `DELETE /api/admin/stations/{id}`: when the token stopped working (the earlier time if it already had). */
export const StationRevoked = z.object({ id: z.string(), revoked_at: IsoDateTime });
export type StationRevoked = z.infer<typeof StationRevoked>;
