import { z } from 'zod';
import { IsoDateTime } from './common';

/** A storage location with how many active-plan bins call it home and how many parts sit there. */
export const LocationJson = z.object({
  id: z.number().int(),
  name: z.string(),
  barcode: z.string(),
  description: z.string(),
  bin_count: z.number().int(),
  part_count: z.number().int(),
});
export type LocationJson = z.infer<typeof LocationJson>;

/** `GET /api/locations`: by name. */
export const LocationList = z.object({ locations: z.array(LocationJson) });
export type LocationList = z.infer<typeof LocationList>;

/** `POST /api/locations` and `PUT /api/locations/{id}`: the location as stored (createdAt in camelCase, as always answered). */
export const LocationRecord = z.object({
  id: z.number().int(),
  name: z.string(),
  barcode: z.string(),
  description: z.string(),
  createdAt: IsoDateTime,
});
export type LocationRecord = z.infer<typeof LocationRecord>;

/** `DELETE /api/locations/{id}`. */
export const LocationDeleted = z.object({ deleted: z.number().int() });
export type LocationDeleted = z.infer<typeof LocationDeleted>;
