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

const barcode = z
  .string()
  .trim()
  .min(1, 'must not be empty')
  .max(64)
  .regex(/^[A-Za-z0-9._\-/]+$/, 'use letters, digits and . _ - / only, so every scanner types it the same');

/** The body of `POST /api/locations`. */
export const LocationInput = z.object({
  name: z.string().trim().min(1, 'must not be empty').max(120),
  barcode: barcode.optional(),
  description: z.string().trim().max(500).default(''),
});
export type LocationInput = z.infer<typeof LocationInput>;

/** The body of `PUT /api/locations/{id}`: the fields to change. */
export const LocationPatch = z
  .object({
    name: z.string().trim().min(1, 'must not be empty').max(120).optional(),
    barcode: barcode.optional(),
    description: z.string().trim().max(500).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'give at least one of name, barcode, description');
export type LocationPatch = z.infer<typeof LocationPatch>;
