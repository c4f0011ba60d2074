import { z } from 'zod';
import { Channel, FigureSource } from './common';

/** The stored part an estimate used: its current fit's figures (VP in datasheet sign). */
export const EstimatePartJson = z.object({
  serial: z.string(),
  device_type: z.string(),
  channel: Channel,
  lot: z.string().nullable(),
  status: z.string(),
  fit_id: z.number().int(),
  fit_review: z.string(),
  idss_a: z.number(),
  idss_vds_v: z.number(),
  vp_v: z.number(),
  vto_v: z.number(),
  beta_a_per_v2: z.number(),
  lambda_per_v: z.number(),
  rs_ohm: z.number(),
  rd_ohm: z.number(),
});
export type EstimatePartJson = z.infer<typeof EstimatePartJson>;

/** `POST /api/estimates/mixer` (and per part): the square-law mixer's output products. */
export const MixerEstimateJson = z.object({
  model: z.string(),
  part: EstimatePartJson.nullable(),
  channel: Channel,
  idss_a: z.number(),
  vp_v: z.number(),
  bias: z.object({ vgs0_v: z.number(), source_resistor_ohm: z.number().nullable(), self_bias_current_a: z.number().nullable() }),
  conversion_transconductance_s: z.number(),
  dc_drain_current_a: z.number(),
  effective_drive: z.object({ rf_v: z.number(), lo_v: z.number() }),
  load_ohm: z.number(),
  probe_capacitance_f: z.number(),
  products: z.array(
    z.object({
      name: z.enum(['rf', 'lo', 'lo_minus_rf', 'lo_plus_rf', 'two_lo', 'two_rf']),
      frequency_hz: z.number(),
      current_a: z.number(),
      load_impedance_ohm: z.number(),
      output_peak_v: z.number(),
      /** RMS output in dBV; null when the product is zero. */
      dbv: z.number().nullable(),
      /** Power into the load resistance in dBm; null when zero. */
      dbm: z.number().nullable(),
    }),
  ),
  warnings: z.array(z.string()),
});
export type MixerEstimateJson = z.infer<typeof MixerEstimateJson>;

/** A self-bias operating point: current, VGS (datasheet sign), gm, gos and the stage gain. */
export const SelfBiasPointJson = z.object({
  drain_current_a: z.number(),
  vgs_v: z.number(),
  source_resistor_ohm: z.number(),
  vds_v: z.number(),
  gm_s: z.number(),
  gos_s: z.number(),
  /** Where VGS, gm and gos came from: the part's measurements, or its model (extrapolated). */
  source: FigureSource,
  vgs_sigma_v: z.number().nullable(),
  saturated: z.boolean(),
  gain: z.object({ drain_load_ohm: z.number(), bypassed_v_per_v: z.number(), unbypassed_v_per_v: z.number() }).nullable(),
  warnings: z.array(z.string()),
});
export type SelfBiasPointJson = z.infer<typeof SelfBiasPointJson>;

/** `POST /api/estimates/self-bias` (and per part): the resistor for a target current and/or the current a resistor sets. */
export const SelfBiasEstimateJson = z.object({
  model: z.string(),
  /** The target's resistor rounded to the nearest E24 and E96 values, solved the same way. */
  preferred_resistors: z.array(SelfBiasPointJson.extend({ series: z.enum(['E24', 'E96']) })),
  part: EstimatePartJson.nullable(),
  channel: Channel,
  params: z.object({ vto_v: z.number(), beta_a_per_v2: z.number(), lambda_per_v: z.number(), rs_ohm: z.number(), rd_ohm: z.number() }),
  for_target_current: SelfBiasPointJson.nullable(),
  for_source_resistor: SelfBiasPointJson.nullable(),
  warnings: z.array(z.string()),
});
export type SelfBiasEstimateJson = z.infer<typeof SelfBiasEstimateJson>;

/** `POST /api/estimates/set`: every part of a set at one operating point, and what the spread means, pair by pair. */
export const MatchedSetEstimateJson = z.object({
  model: z.string(),
  operating_point: z.object({ drain_current_a: z.number(), vds_v: z.number(), drain_load_ohm: z.number().nullable(), lo_amplitude_v: z.number().nullable() }),
  sets: z.array(
    z.object({
      set_index: z.number().int(),
      parts: z.array(
        z.object({
          serial: z.string(),
          role: z.string(),
          device_type: z.string().nullable(),
          idss_a: z.number().nullable(),
          /** The figures the set was matched on (reservations), else null. */
          matched: z.object({ vgs_v: z.number(), gm_s: z.number(), idss_a: z.number() }).nullable(),
          operating_point: SelfBiasPointJson.nullable(),
          warnings: z.array(z.string()),
          /** Why this part could not be estimated; null when it was. */
          error: z.string().nullable(),
        }),
      ),
      pairs: z.array(
        z.object({
          a: z.string(),
          b: z.string(),
          dvgs_v: z.number(),
          gm_mismatch: z.number(),
          gm_mean_s: z.number(),
          idss_ratio: z.number(),
          input_offset_v: z.number(),
          drain_current_imbalance_a: z.number(),
          output_offset_v: z.number().nullable(),
          lo_leakage_relative_db: z.number().nullable(),
          lo_leakage_current_a: z.number().nullable(),
        }),
      ),
    }),
  ),
});
export type MatchedSetEstimateJson = z.infer<typeof MatchedSetEstimateJson>;
