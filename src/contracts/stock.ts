import { z } from 'zod';
import { collectScanBatch } from '~/core/stock/scan-batch';
import { PartStatus } from './common';

/** A bin that fell to or below its low-stock threshold with this change (stores are e-mailed). */
export const LowStockAlertJson = z.object({
  bin_code: z.string(),
  device_type: z.string(),
  on_hand: z.number().int(),
  threshold: z.number().int(),
});
export type LowStockAlertJson = z.infer<typeof LowStockAlertJson>;

/** `POST /api/stock/{receive,move,scrap,return}`: each changed part with its bin and where it now is. */
export const StockActionResult = z.object({
  action: z.enum(['receive', 'move', 'scrap', 'return']),
  count: z.number().int(),
  parts: z.array(
    z.object({
      serial: z.string(),
      from: PartStatus,
      to: PartStatus,
      bin_code: z.string().nullable(),
      /** Name of the location the part is at now. */
      location: z.string().nullable(),
    }),
  ),
  low_stock_alerts: z.array(LowStockAlertJson),
});
export type StockActionResult = z.infer<typeof StockActionResult>;

/** A part a stock count names, with where the records put it. */
export const StockCountPart = z.object({
  serial: z.string(),
  status: PartStatus,
  status_words: z.string(),
  /** Name of the location the records put the part at. */
  recorded_at: z.string().nullable(),
});
export type StockCountPart = z.infer<typeof StockCountPart>;

/** `POST /api/stores/count`: a location's scanned parts against the records, and what `apply` corrected. */
export const StockCountJson = z.object({
  location: z.object({ id: z.number().int(), name: z.string(), barcode: z.string() }),
  /** How many parts the records put here. */
  recorded: z.number().int(),
  found: z.array(z.string()),
  missing: z.array(StockCountPart),
  misplaced: z.array(StockCountPart),
  unexpected: z.array(StockCountPart),
  unknown: z.array(z.string()),
  /** What apply changed: parts moved here, parts put on hold. Null when only comparing. */
  applied: z.object({ moved_here: z.array(z.string()), held: z.array(z.string()), left_reserved: z.array(z.string()) }).nullable(),
  low_stock_alerts: z.array(LowStockAlertJson),
});
export type StockCountJson = z.infer<typeof StockCountJson>;

/** `GET /api/stock/lookup`: the query. */
export const StockLookupQuery = z.object({ serial: z.string() });
export type StockLookupQuery = z.infer<typeof StockLookupQuery>;

/** `GET /api/stock/lookup`: what a scanned part is, and what stores may do with it now. */
export const PartLookup = z.object({
  serial: z.string(),
  status: PartStatus,
  status_words: z.string(),
  device_type: z.string(),
  /** Lot code. */
  lot: z.string().nullable(),
  bin_code: z.string().nullable(),
  bin_label: z.string().nullable(),
  bin_in_active_plan: z.boolean(),
  /** Name of the location the part is at. */
  location: z.string().nullable(),
  /** Name of its bin's home location. */
  home_location: z.string().nullable(),
  idss_a: z.number().nullable(),
  vp_v: z.number().nullable(),
  can: z.object({ receive: z.boolean(), move: z.boolean(), scrap: z.boolean(), return: z.boolean() }),
});
export type PartLookup = z.infer<typeof PartLookup>;

/** A lot with accepted parts not yet received into stock (unbinned: no bin in the active plan yet). */
export const AwaitingLot = z.object({
  lot_id: z.number().int().nullable(),
  lot: z.string().nullable(),
  device_type: z.string(),
  accepted: z.number().int(),
  unbinned: z.number().int(),
});
export type AwaitingLot = z.infer<typeof AwaitingLot>;

/** `GET /api/stock/awaiting`: the stores' work waiting, by type and lot. */
export const AwaitingLotList = z.object({ lots: z.array(AwaitingLot) });
export type AwaitingLotList = z.infer<typeof AwaitingLotList>;

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

/** The body of `POST /api/stock/receive`. */
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

/** The body of `POST /api/stock/move`. */
export const MoveInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  /** Where to; without one, each part goes back to its bin's home location. */
  ...locationRef,
  reason: reason.optional(),
});
export type MoveInput = z.infer<typeof MoveInput>;

/** The body of `POST /api/stock/scrap`. */
export const ScrapInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  reason: reason.min(3, 'say why the parts are scrapped (at least 3 characters)'),
});
export type ScrapInput = z.infer<typeof ScrapInput>;

/** The body of `POST /api/stock/return`. */
export const ReturnInput = z.object({
  serials: SerialList.refine((s) => s.length > 0, 'scan at least one serial'),
  reason: reason.optional(),
  /** Put the returned parts straight back on the shelf at their bin's home location. */
  restock: z.boolean().default(false),
  ...locationRef,
});
export type ReturnInput = z.infer<typeof ReturnInput>;

/** The body of `POST /api/stores/count`. */
export const StockCountInput = z.object({
  location_barcode: z.string().trim().min(1, 'scan the label of the location you are counting').max(64),
  serials: SerialList,
  /** false: only compare (what the screen shows while scanning); true: also correct the records. */
  apply: z.boolean().default(false),
  /** On apply, put parts that are in stock here by the records but were not found on hold (quarantined). */
  hold_missing: z.boolean().default(true),
});
export type StockCountInput = z.infer<typeof StockCountInput>;
