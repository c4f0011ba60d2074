import { z } from 'zod';

export const BinPlanDraft = z.object({
  device_type: z.union([z.string().trim().min(1).max(120), z.number().int().positive()]),
  name: z.string().trim().max(120).default(''),
  /** The plan's axes and edges, as src/core/binning's BinPlan; checked with parseBinPlan. */
  definition: z.unknown(),
  /**
   * The active plan the preview was made against (null when the type had none). Activation is
   * refused when another version became active in between, so nobody confirms stale moves.
   */
  based_on_plan_id: z.number().int().positive().nullable().optional(),
});
export type BinPlanDraft = z.infer<typeof BinPlanDraft>;

/** Parts re-binned when a plan changes: every binned part still in the building or out on issue. */
export const REBIN_STATUSES = ['accepted', 'in_stock', 'reserved', 'issued', 'returned'] as const;
