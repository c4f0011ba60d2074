import { z } from 'zod';

const barcode = z
  .string()
  .trim()
  .min(1, 'must not be empty')
  .max(64)
  .regex(/^[A-Za-z0-9._\-/]+$/, 'use letters, digits and . _ - / only, so every scanner types it the same');

export const LocationInput = z.object({
  name: z.string().trim().min(1, 'must not be empty').max(120),
  barcode: barcode.optional(),
  description: z.string().trim().max(500).default(''),
});
export type LocationInput = z.infer<typeof LocationInput>;

export const LocationPatch = z
  .object({
    name: z.string().trim().min(1, 'must not be empty').max(120).optional(),
    barcode: barcode.optional(),
    description: z.string().trim().max(500).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'give at least one of name, barcode, description');
export type LocationPatch = z.infer<typeof LocationPatch>;

/** A barcode made from a name when none is given: "Cabinet A / Drawer 3" → "LOC-CABINET-A-DRAWER-3". */
export function barcodeFromName(name: string): string {
  const slug = name
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toUpperCase()
    .slice(0, 56);
  return `LOC-${slug || 'X'}`;
}
