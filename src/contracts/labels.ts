import { z } from 'zod';

export const SYMBOLOGIES = ['code128', 'datamatrix'] as const;
export const Symbology = z.enum(SYMBOLOGIES);
export type Symbology = z.infer<typeof Symbology>;

/** The query of `GET /api/labels/barcode`. */
export const BarcodeQuery = z.object({
  text: z.string().min(1, 'give the text to encode').max(80, 'at most 80 characters'),
  symbology: Symbology.default('code128'),
  format: z.enum(['svg', 'png']).default('svg'),
});
export type BarcodeQuery = z.infer<typeof BarcodeQuery>;
