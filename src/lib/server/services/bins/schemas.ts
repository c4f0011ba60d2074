import { z } from 'zod';

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

export const UpdateBinInput = z
  .object({
    home_location_id: z.number().int().positive().nullable().optional(),
    low_stock_threshold: z.number().int('must be a whole number').min(0).max(100000).optional(),
  })
  .refine((v) => v.home_location_id !== undefined || v.low_stock_threshold !== undefined, 'give home_location_id or low_stock_threshold');
export type UpdateBinInput = z.infer<typeof UpdateBinInput>;

/** Turns URLSearchParams into a plain object for a zod query schema. */
export function searchParamsObject(params: URLSearchParams): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of params) out[k] = v;
  return out;
}
