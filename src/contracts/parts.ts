import { z } from 'zod';
import { PART_STATUSES } from '~/core/stock/part-transitions';
import { AuditEntryJson } from './audit';
import { Channel, FigureSource, FitReview, IsoDateTime, PartStatus } from './common';

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

/** Who and where a part is: the fields every response about one part starts with. */
export const PartJson = z.object({
  serial: z.string(),
  channel: Channel,
  status: PartStatus,
  device_type: z.string(),
  /** Lot code. */
  lot: z.string().nullable(),
  bin_code: z.string().nullable(),
  bin_label: z.string().nullable(),
  /** Name of the location the part is at. */
  location: z.string().nullable(),
});
export type PartJson = z.infer<typeof PartJson>;

/** `GET /api/parts`: the query (snake_case, as in the URL). */
export const ListPartsQuery = z.object({
  bin: z.preprocess(blankToUndefined, z.string().trim().max(60).optional()),
  status: z.preprocess(blankToUndefined, z.enum(PART_STATUSES).optional()),
  device_type: z.preprocess(blankToUndefined, z.string().trim().max(40).optional()),
  lot: z.preprocess(blankToUndefined, z.string().trim().max(60).optional()),
  /** Part of a serial, case-insensitive. */
  q: z.preprocess(blankToUndefined, z.string().trim().max(60).optional()),
  page: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).default(1)),
  page_size: z.preprocess(blankToUndefined, z.coerce.number().int().min(1).max(500).default(50)),
});
export type ListPartsQuery = z.infer<typeof ListPartsQuery>;

/** A row of the parts list: the part with its current fit's figures (null without a fit). */
export const PartListRowJson = PartJson.extend({
  vto_v: z.number().nullable(),
  beta_a_per_v2: z.number().nullable(),
  lambda_per_v: z.number().nullable(),
  idss_a: z.number().nullable(),
  idss_vds_v: z.number().nullable(),
  vp_v: z.number().nullable(),
  gfs_s: z.number().nullable(),
  gos_s: z.number().nullable(),
  rms_rel: z.number().nullable(),
  flags: z.array(z.string()),
  fitted_at: IsoDateTime.nullable(),
});
export type PartListRowJson = z.infer<typeof PartListRowJson>;

/** `GET /api/parts`. */
export const PartsPage = z.object({
  page: z.number().int(),
  page_size: z.number().int(),
  total: z.number().int(),
  page_count: z.number().int(),
  parts: z.array(PartListRowJson),
});
export type PartsPage = z.infer<typeof PartsPage>;

export const FlagDetailJson = z.object({
  code: z.string(),
  message: z.string(),
  /** Flat indices of the points the flag left out of the fit. */
  excluded_points: z.array(z.number().int()),
});
export type FlagDetailJson = z.infer<typeof FlagDetailJson>;

/** Standard errors of a fit's parameters and derived figures, same units as the figures. */
export const FitStandardErrorsJson = z.object({
  vto_v: z.number().nullable(),
  beta_a_per_v2: z.number().nullable(),
  lambda_per_v: z.number().nullable(),
  rs_ohm: z.number().nullable(),
  rd_ohm: z.number().nullable(),
  idss_a: z.number().nullable(),
  vp_v: z.number().nullable(),
  gfs_s: z.number().nullable(),
  gos_s: z.number().nullable(),
  rds_on_ohm: z.number().nullable(),
});
export type FitStandardErrorsJson = z.infer<typeof FitStandardErrorsJson>;

/** The figures of one fit in API names (units in the names; VP in datasheet sign). */
export const FitJson = z.object({
  fit_id: z.number().int(),
  model: z.string(),
  engine_version: z.string(),
  vto_v: z.number(),
  beta_a_per_v2: z.number(),
  lambda_per_v: z.number(),
  rs_ohm: z.number(),
  rd_ohm: z.number(),
  idss_a: z.number(),
  idss_measured_a: z.number().nullable(),
  idss_vds_v: z.number(),
  vp_v: z.number(),
  gfs_s: z.number(),
  gos_s: z.number(),
  rds_on_ohm: z.number(),
  rms_rel: z.number().nullable(),
  rms_a: z.number().nullable(),
  r_squared: z.number().nullable(),
  iterations: z.number().int().nullable(),
  points_fitted: z.number().int().nullable(),
  /** The F-test of the extended model (RS, RD) against the plain one. */
  extended_test: z.object({ f_statistic: z.number().nullable(), p_value: z.number().nullable(), kept: z.boolean() }).nullable(),
  flags: z.array(z.string()),
  flag_details: z.array(FlagDetailJson),
  review: FitReview,
  review_note: z.string().nullable(),
  fitted_at: IsoDateTime,
  standard_errors: FitStandardErrorsJson.nullable(),
});
export type FitJson = z.infer<typeof FitJson>;

/** A part without a current fit: every fit field null (flags empty). */
export const NoFitJson = z.object({
  fit_id: z.null(),
  model: z.null(),
  engine_version: z.null(),
  vto_v: z.null(),
  beta_a_per_v2: z.null(),
  lambda_per_v: z.null(),
  rs_ohm: z.null(),
  rd_ohm: z.null(),
  idss_a: z.null(),
  idss_measured_a: z.null(),
  idss_vds_v: z.null(),
  vp_v: z.null(),
  gfs_s: z.null(),
  gos_s: z.null(),
  rds_on_ohm: z.null(),
  rms_rel: z.null(),
  rms_a: z.null(),
  r_squared: z.null(),
  iterations: z.null(),
  points_fitted: z.null(),
  extended_test: z.null(),
  flags: z.array(z.string()).max(0),
  flag_details: z.array(FlagDetailJson).max(0),
  review: z.null(),
  review_note: z.null(),
  fitted_at: z.null(),
  standard_errors: z.null(),
});
export type NoFitJson = z.infer<typeof NoFitJson>;

/** One curve of a sweep as stored: VDS and ID points at one VGS (SI, N-equivalent signs as measured). */
export const StoredCurveJson = z.object({
  vgs_v: z.number(),
  vds_v: z.array(z.number()),
  id_a: z.array(z.number()),
  /** Line of the file the curve starts on. */
  first_line: z.number().int(),
});
export type StoredCurveJson = z.infer<typeof StoredCurveJson>;

export const SweepNoteJson = z.object({
  code: z.string(),
  vgs_v: z.number().nullable(),
  message: z.string(),
});
export type SweepNoteJson = z.infer<typeof SweepNoteJson>;

/** The part page's operating-point section: IDSS at the test VDS and the model against the measurements. */
export const PartOperatingJson = z.object({
  /** IDSS at the test VDS, compared at 25 °C: the same figure every set view shows at this VDS. */
  idss_a: z.number().nullable(),
  idss_source: FigureSource.nullable(),
  idss_vds_v: z.number(),
  temperature_c: z.number(),
  measured_at_c: z.number().nullable(),
  model_agreement: z
    .object({
      vds_v: z.number(),
      threshold_v: z.number(),
      max_disagreement_v: z.number(),
      flagged: z.boolean(),
      points: z.array(
        z.object({
          fraction: z.number(),
          id_a: z.number(),
          vgs_measured_v: z.number(),
          vgs_model_v: z.number(),
          vgs_sigma_v: z.number(),
        }),
      ),
    })
    .nullable(),
  transfer: z.object({
    measured: z.array(z.object({ vgs_v: z.number(), id_a: z.number() })),
    model: z.array(z.object({ vgs_v: z.number(), id_a: z.number() })),
  }),
});
export type PartOperatingJson = z.infer<typeof PartOperatingJson>;

const PartDetailRest = z.object({
  test_conditions: z
    .object({
      temperature_c: z.number().nullable(),
      station: z.string().nullable(),
      operator: z.string().nullable(),
      vds_test_v: z.number(),
      measured_at: IsoDateTime,
    })
    .nullable(),
  /** A SPICE .model card of the current fit. */
  model_card: z.string().nullable(),
  current_sweep: z
    .object({
      sweep_id: z.number().int(),
      curves: z.array(StoredCurveJson),
      /** [curve index, point index] pairs left out of the fit. */
      excluded_points: z.array(z.tuple([z.number().int(), z.number().int()])),
      /** What the intake left out or kept short, and why (gate leakage, short curves). */
      notes: z.array(SweepNoteJson),
    })
    .nullable(),
  sweeps: z.array(
    z.object({
      sweep_id: z.number().int(),
      measured_at: IsoDateTime,
      file_name: z.string().nullable(),
      upload_id: z.string().nullable(),
      temperature_c: z.number().nullable(),
      station: z.string().nullable(),
      operator: z.string().nullable(),
      point_count: z.number().int(),
      vgs_steps_v: z.array(z.number()),
      is_current: z.boolean(),
      fits: z.array(
        z.object({
          fit_id: z.number().int(),
          fitted_at: IsoDateTime,
          idss_a: z.number(),
          vp_v: z.number(),
          rms_rel: z.number().nullable(),
          flags: z.array(z.string()),
          review: FitReview,
          is_current: z.boolean(),
        }),
      ),
    }),
  ),
  operating: PartOperatingJson.nullable(),
  /** The part's audit trail; null for people who may not read the audit log. */
  audit: z.array(AuditEntryJson).nullable(),
});

/** `GET /api/parts/{serial}`: the part, its current fit (or nulls), conditions, sweeps and model card. */
export const PartDetailJson = z.union([PartJson.extend(FitJson.shape).extend(PartDetailRest.shape), PartJson.extend(NoFitJson.shape).extend(PartDetailRest.shape)]);
export type PartDetailJson = z.infer<typeof PartDetailJson>;

/** `GET /api/parts/{serial}/operating-point`: the query. Magnitudes or datasheet signs; 25 °C when absent. */
const magnitude = (what: string, max: number) =>
  z.coerce
    .number({ error: `${what} must be a number` })
    .refine((v) => Number.isFinite(v) && v !== 0 && Math.abs(v) <= max, `${what} must be non-zero and at most ${max} in magnitude`)
    .transform(Math.abs);

export const OperatingPointQuery = z.object({
  id_a: magnitude('id_a (drain current, A)', 1),
  vds_v: magnitude('vds_v (drain-source voltage, V)', 200),
  temperature_c: z.coerce.number({ error: 'temperature_c must be a number' }).min(-60).max(200).default(25),
});
export type OperatingPointQuery = z.infer<typeof OperatingPointQuery>;

/**
 * `GET /api/parts/{serial}/operating-point`: VGS (datasheet sign), gm and gos at a drain current
 * and VDS; `uncertainty_v` is one standard deviation of VGS (null when the fit states none).
 */
export const OperatingPointJson = z.object({
  serial: z.string(),
  channel: Channel,
  id_a: z.number(),
  vds_v: z.number(),
  vgs_v: z.number(),
  gm_s: z.number(),
  gos_s: z.number().nullable(),
  source: FigureSource,
  /** Why the model was used: the point lies outside what was measured. */
  model_reason: z.enum(['vds_outside', 'current_outside', 'no_table']).nullable(),
  uncertainty_v: z.number().nullable(),
  temperature_c: z.number(),
  measured_at_c: z.number().nullable(),
  temperature_shift_v: z.number(),
  /** The fitted model's VGS at the same point and the sweep's temperature, for comparison. */
  model_vgs_v: z.number(),
});
export type OperatingPointJson = z.infer<typeof OperatingPointJson>;
