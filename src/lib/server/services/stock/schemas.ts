import { z } from 'zod';
import { collectScanBatch } from '~/core/stock/scan-batch';

/** Serials as scanned: cleaned, blanks dropped, each once (a repeat scan is not an error). */
export const SerialList = z
  .array(z.string().max(200))
  .max(1000, 'at most 1000 serials in one batch')
  .transform((list) => collectScanBatch(list).serials);

const reason = z.string().trim().max(500);
const locationRef = {
  location_id: z.number().int().positive().optional(),
  location_barcode: z.string().trim().min(1).max(64).optional(),
};

export const ReceiveInput = z
  .object({
    serials: SerialList.optional(),
    /** A lot's code or id: every accepted part of it not yet in stock. */
    lot: z.union([z.string().trim().min(1).max(120), z.number().int().positive()]).optional(),
    ...locationRef,
    reason: reason.optional(),
  })
  .refine((v) => (v.serials?.length ?? 0) > 0 || v.lot !== undefined, 'give serials (scanned) or a lot');
export type ReceiveInput = z.infer<typeof ReceiveInput>;

export const MoveInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  /** Where to; without one, each part goes back to its bin's home location. */
  ...locationRef,
  reason: reason.optional(),
});
export type MoveInput = z.infer<typeof MoveInput>;

export const ScrapInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  reason: reason.min(3, 'say why the parts are scrapped (at least 3 characters)'),
});
export type ScrapInput = z.infer<typeof ScrapInput>;

export const ReturnInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  reason: reason.optional(),
  /** Put the returned parts straight back on the shelf at their bin's home location. */
  restock: z.boolean().default(false),
  ...locationRef,
});
export type ReturnInput = z.infer<typeof ReturnInput>;

export const StockCountInput = z.object({
  location_barcode: z.string().trim().min(1, 'scan the label of the location you are counting').max(64),
  serials: SerialList,
  /** false: only compare (what the screen shows while scanning); true: also correct the records. */
  apply: z.boolean().default(false),
  /** On apply, put parts that are in stock here by the records but were not found on hold (quarantined). */
  hold_missing: z.boolean().default(true),
});
export type StockCountInput = z.infer<typeof StockCountInput>;
