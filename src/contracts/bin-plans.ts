import { z } from 'zod';
import { BIN_QUANTITIES, BinPlan } from '~/core/binning/bin-plan';
import { Channel, IsoDateTime } from './common';

/** `POST /api/bin-plans/preview` and `POST /api/bin-plans`: a plan to preview or to save and activate. */
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

/** One version of a device type's bin plan. */
export const BinPlanJson = z.object({
  id: z.number().int(),
  device_type: z.string(),
  device_type_id: z.number().int(),
  version: z.number().int(),
  name: z.string(),
  is_active: z.boolean(),
  definition: BinPlan,
  bin_count: z.number().int(),
  created_at: IsoDateTime,
  /** E-mail of the person who saved it. */
  created_by: z.string().nullable(),
});
export type BinPlanJson = z.infer<typeof BinPlanJson>;

export const BinPlanDeviceType = z.object({ id: z.number().int(), name: z.string(), channel: Channel, vds_test_v: z.number() });
export type BinPlanDeviceType = z.infer<typeof BinPlanDeviceType>;

/** The query of `GET /api/bin-plans`: one device type's plans (name or id); every type's without it. */
export const BinPlanListQuery = z.object({ device_type: z.string().optional() });
export type BinPlanListQuery = z.infer<typeof BinPlanListQuery>;

/** `GET /api/bin-plans`: every version of every plan (or of one type), newest first within each type. */
export const BinPlanList = z.object({
  plans: z.array(BinPlanJson),
  device_types: z.array(BinPlanDeviceType),
});
export type BinPlanList = z.infer<typeof BinPlanList>;

/** A range of a stored bin, as the plan's core writes it (SI, datasheet signs). */
export const StoredBinRange = z.object({
  quantity: z.enum(BIN_QUANTITIES),
  /** Included. */
  loValue: z.number(),
  /** Excluded. */
  hiValue: z.number(),
});
export type StoredBinRange = z.infer<typeof StoredBinRange>;

/** `GET /api/bin-plans/{id}`: one version with its bins. */
export const BinPlanDetail = z.object({
  plan: BinPlanJson,
  bins: z.array(
    z.object({
      id: z.number().int(),
      code: z.string(),
      label: z.string(),
      is_hold: z.boolean(),
      ranges: z.array(StoredBinRange),
      location: z.string().nullable(),
      low_stock_threshold: z.number().int(),
    }),
  ),
});
export type BinPlanDetail = z.infer<typeof BinPlanDetail>;

const BinMove = z.object({ serial: z.string(), from: z.string(), to: z.string() });
const MoveCount = z.object({ from: z.string(), to: z.string(), count: z.number().int() });
const Relabelled = z.object({ code: z.string(), oldLabel: z.string(), newLabel: z.string() });

/** `POST /api/bin-plans/preview`: what saving a plan would do; nothing is saved. */
export const BinPlanPreview = z.object({
  device_type: z.object({ id: z.number().int(), name: z.string(), channel: Channel }),
  based_on_plan_id: z.number().int().nullable(),
  based_on_version: z.number().int().nullable(),
  next_version: z.number().int(),
  /** The plan as it would be saved, with the codes that keep every code to one range. */
  definition: BinPlan,
  old_definition: BinPlan.nullable(),
  bin_count: z.number().int(),
  bins: z.array(z.object({ code: z.string(), label: z.string(), is_hold: z.boolean(), parts: z.number().int() })),
  parts_considered: z.number().int(),
  moved_count: z.number().int(),
  /** Of the parts that change bin, those in a bag on a shelf (in stock, reserved, returned): the ones someone must carry. */
  physical_move_count: z.number().int(),
  points: z.array(z.object({ serial: z.string(), idss_a: z.number().nullable(), vp_v: z.number().nullable(), moves: z.boolean(), on_shelf: z.boolean() })),
  points_left_off: z.number().int(),
  unchanged_count: z.number().int(),
  newly_binned_count: z.number().int(),
  move_counts: z.array(MoveCount),
  moves: z.array(BinMove),
  newly_binned: z.array(z.object({ serial: z.string(), to: z.string() })),
  moves_left_off: z.number().int(),
  relabelled: z.array(Relabelled),
  /** Parts whose recorded bin differs from what the old plan gives for their figures. */
  discrepancies: z.array(z.object({ serial: z.string(), currentCode: z.string(), oldPlanCode: z.string() })),
});
export type BinPlanPreview = z.infer<typeof BinPlanPreview>;

/** `POST /api/bin-plans` (201): the saved, active version and what moved. */
export const BinPlanActivated = z.object({
  plan: z.object({ id: z.number().int(), version: z.number().int(), device_type: z.string(), name: z.string(), is_active: z.boolean() }),
  bin_count: z.number().int(),
  moved_count: z.number().int(),
  newly_binned_count: z.number().int(),
  unchanged_count: z.number().int(),
  moves: z.array(BinMove),
  move_counts: z.array(MoveCount),
  relabelled: z.array(Relabelled),
});
export type BinPlanActivated = z.infer<typeof BinPlanActivated>;
