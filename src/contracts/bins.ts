import { z } from 'zod';
import { BinPlan } from '~/core/binning/bin-plan';
import { PART_STATUSES } from '~/core/stock/part-transitions';
import { BinPlanDeviceType } from './bin-plans';
import { PageFields, PartStatus } from './common';
import { PartJson } from './parts';

export const BIN_SORT_KEYS = ['code', 'label', 'location', 'on_hand', 'reserved', 'issued', 'low_stock_threshold', 'device_type'] as const;
export type BinSortKey = (typeof BIN_SORT_KEYS)[number];

const optionalText = z
  .string()
  .trim()
  .max(120)
  .optional()
  .transform((v) => (v ? v : undefined));

/** Query of the bin stock table and `GET /api/bins`; names as in the URL. */
export const BinStockQuery = z.object({
  device_type: optionalText,
  q: optionalText,
  location_id: z.coerce.number().int().positive().optional(),
  low_only: z
    .enum(['1', '0', 'true', 'false'])
    .optional()
    .transform((v) => v === '1' || v === 'true'),
  include_empty: z
    .enum(['1', '0', 'true', 'false'])
    .optional()
    .transform((v) => v !== '0' && v !== 'false'),
  sort: z.enum(BIN_SORT_KEYS).default('code'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).default(1),
  page_size: z.coerce.number().int().min(1).max(1000).default(100),
});
export type BinStockQuery = z.infer<typeof BinStockQuery>;

/** `PUT /api/bins/{id}`: a new home location and/or low-stock threshold. */
export const UpdateBinInput = z
  .object({
    home_location_id: z.number().int().positive().nullable().optional(),
    low_stock_threshold: z.number().int('must be a whole number').min(0).max(100000).optional(),
  })
  .refine((v) => v.home_location_id !== undefined || v.low_stock_threshold !== undefined, 'give home_location_id or low_stock_threshold');
export type UpdateBinInput = z.infer<typeof UpdateBinInput>;

/** A bin as the API gives it: ranges in SI with units in the names, counts computed from part states. */
export const BinJson = z.object({
  id: z.number().int(),
  code: z.string(),
  label: z.string(),
  is_hold: z.boolean(),
  device_type: z.string(),
  device_type_id: z.number().int(),
  plan_id: z.number().int(),
  plan_version: z.number().int(),
  ranges: z.array(z.object({ quantity: z.string(), lo_value: z.number(), hi_value: z.number(), unit: z.enum(['A', 'V']) })),
  idss_lo_a: z.number().nullable(),
  idss_hi_a: z.number().nullable(),
  vp_lo_v: z.number().nullable(),
  vp_hi_v: z.number().nullable(),
  vgs_lo_v: z.number().nullable(),
  vgs_hi_v: z.number().nullable(),
  location: z.object({ id: z.number().int(), name: z.string(), barcode: z.string() }).nullable(),
  on_hand: z.number().int(),
  reserved: z.number().int(),
  issued: z.number().int(),
  low_stock_threshold: z.number().int(),
  low: z.boolean(),
  low_stock_alerted_at: z.string().nullable(),
});
export type BinJson = z.infer<typeof BinJson>;

/** `GET /api/bins`: a page of the bin stock table. */
export const BinStockPage = z.object({
  bins: z.array(BinJson),
  ...PageFields,
  sort: z.enum(BIN_SORT_KEYS),
  dir: z.enum(['asc', 'desc']),
});
export type BinStockPage = z.infer<typeof BinStockPage>;

/** `GET /api/bins/{id}/parts`: the query; `status` is a comma-separated list of part statuses (all when absent). */
export const BinPartsQuery = z.object({
  status: z
    .string()
    .optional()
    .transform((s) => (s ? s.split(',').filter(Boolean) : []))
    .pipe(z.array(z.enum(PART_STATUSES))),
  page: z.coerce.number().int().min(1).default(1),
  page_size: z.coerce.number().int().min(1).max(500).default(100),
});
export type BinPartsQuery = z.infer<typeof BinPartsQuery>;

/** A part in a bin: who and where it is, with its current fit's IDSS, VP and gfs (null without a fit). */
export const BinPartJson = PartJson.extend({
  idss_a: z.number().nullable(),
  vp_v: z.number().nullable(),
  gfs_s: z.number().nullable(),
});
export type BinPartJson = z.infer<typeof BinPartJson>;

/** `GET /api/bins/{id}/parts`: the bin and a page of its parts, by serial. */
export const BinPartsPage = z.object({
  bin: BinJson,
  parts: z.array(BinPartJson),
  ...PageFields,
});
export type BinPartsPage = z.infer<typeof BinPartsPage>;

/** The query of `GET /api/bins/map`: the device type's name or id. */
export const BinMapQuery = z.object({ device_type: z.string().min(1) });
export type BinMapQuery = z.infer<typeof BinMapQuery>;

/** `GET /api/bins/map`: a device type's active plan, its bins with counts and its binned parts' (IDSS, VP) points. */
export const BinMapJson = z.object({
  device_type: BinPlanDeviceType,
  /** Null when the type has no active plan (then no bins and no points). */
  plan: z.object({ id: z.number().int(), version: z.number().int(), name: z.string(), definition: BinPlan }).nullable(),
  bins: z.array(BinJson),
  points: z.array(z.object({ serial: z.string(), idss_a: z.number(), vp_v: z.number(), status: PartStatus, bin_id: z.number().int().nullable() })),
  /** Parts left off the scatter when there are more than the limit. */
  points_left_off: z.number().int(),
});
export type BinMapJson = z.infer<typeof BinMapJson>;
