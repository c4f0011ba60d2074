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

/**
 * Request bodies of /api/estimates/* (snake_case, SI units in names). These check shape and
 * choices; ranges (IDSS > 0, VP ≤ VGS0 ≤ 0, …) are checked by the core, whose messages are
 * passed on with the field renamed to the request's spelling.
 */

const num = (what: string) => z.number({ error: `expected ${what} as a number` }).refine(Number.isFinite, `expected ${what}, got a non-finite number`);
const serial = z.string({ error: 'expected a part serial as text' }).trim().min(1, 'expected a part serial').max(80, 'expected a serial of at most 80 characters');

export const MixerDriveBody = z.object(
  {
    amplitude_v: num('a peak amplitude in V'),
    terminal: z.enum(['gate', 'source'], { error: "expected 'gate' or 'source'" }),
    frequency_hz: num('a frequency in Hz'),
    leak_v: num('a leak amplitude in V').optional(),
  },
  { error: 'expected a drive { amplitude_v, terminal, frequency_hz, leak_v? }' },
);

/** Which part: a stored one by serial (its current fit), or data-sheet IDSS and VP. */
const PartFields = {
  serial: serial.optional(),
  idss_a: num('IDSS in A').optional(),
  vp_v: num('a pinch-off voltage in V (negative for n-channel, positive for p-channel)').optional(),
};

function refinePart(b: { serial?: string; idss_a?: number; vp_v?: number }, ctx: z.RefinementCtx) {
  if (b.serial !== undefined) {
    for (const f of ['idss_a', 'vp_v'] as const) {
      if (b[f] !== undefined) ctx.addIssue({ code: 'custom', path: [f], message: 'give either serial or idss_a and vp_v, not both' });
    }
    return;
  }
  if (b.idss_a === undefined) ctx.addIssue({ code: 'custom', path: ['idss_a'], message: 'expected IDSS in A (or a serial of a stored part)' });
  if (b.vp_v === undefined) ctx.addIssue({ code: 'custom', path: ['vp_v'], message: 'expected a pinch-off voltage in V (or a serial of a stored part)' });
  else if (b.vp_v === 0) ctx.addIssue({ code: 'custom', path: ['vp_v'], message: 'expected a non-zero pinch-off: negative for an n-channel part, positive for p-channel' });
}

/** The body of `POST /api/estimates/mixer` (and of `…/parts/{serial}/mixer`, the serial taken from the path). */
export const MixerRequest = z
  .object(
    {
      ...PartFields,
      /** Bias: a gate–source voltage, or a self-bias source resistor (gate at 0 V). */
      vgs0_v: num('a gate–source bias in V').optional(),
      source_resistor_ohm: num('a source resistor in Ω').optional(),
      load_ohm: num('a load resistance in Ω'),
      probe_capacitance_f: num('a capacitance in F').optional(),
      lo: MixerDriveBody,
      rf: MixerDriveBody,
    },
    { error: 'expected a JSON object' },
  )
  .superRefine((b, ctx) => {
    refinePart(b, ctx);
    if ((b.vgs0_v === undefined) === (b.source_resistor_ohm === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['vgs0_v'], message: 'give exactly one bias: vgs0_v (V) or source_resistor_ohm (Ω)' });
    }
    if (b.source_resistor_ohm !== undefined && !(b.source_resistor_ohm >= 0)) {
      ctx.addIssue({ code: 'custom', path: ['source_resistor_ohm'], message: `expected a source resistor ≥ 0 Ω, got ${b.source_resistor_ohm}` });
    }
  });
export type MixerRequest = z.infer<typeof MixerRequest>;

/** The body of `POST /api/estimates/self-bias` (and of `…/parts/{serial}/self-bias`, the serial taken from the path). */
export const SelfBiasRequest = z
  .object(
    {
      ...PartFields,
      /** For data-sheet values only: channel-length modulation and the VDS IDSS was stated at. */
      lambda_per_v: num('λ in 1/V').optional(),
      idss_vds_v: num('the VDS of the IDSS figure in V').optional(),
      vds_v: num('the drain–source voltage |VDS| in V'),
      target_drain_current_a: num('a target drain current in A').optional(),
      source_resistor_ohm: num('a source resistor in Ω').optional(),
      drain_load_ohm: num('a drain load in Ω').optional(),
    },
    { error: 'expected a JSON object' },
  )
  .superRefine((b, ctx) => {
    refinePart(b, ctx);
    if (b.serial !== undefined) {
      for (const f of ['lambda_per_v', 'idss_vds_v'] as const) {
        if (b[f] !== undefined) ctx.addIssue({ code: 'custom', path: [f], message: 'comes from the stored fit when a serial is given; leave it out' });
      }
    }
    if (b.target_drain_current_a === undefined && b.source_resistor_ohm === undefined) {
      ctx.addIssue({ code: 'custom', path: ['target_drain_current_a'], message: 'give a target drain current in A, a source resistor in Ω, or both' });
    }
  });
export type SelfBiasRequest = z.infer<typeof SelfBiasRequest>;

/** The body of `POST /api/estimates/set`. */
export const SetRequest = z
  .object(
    {
      reservation_id: z.uuid({ error: 'expected a reservation id (a UUID)' }).optional(),
      serials: z.array(serial, { error: 'expected a list of serials' }).min(2, 'expected at least 2 serials').max(16, 'expected at most 16 serials').optional(),
      target_drain_current_a: num('the operating drain current in A'),
      vds_v: num('the drain–source voltage |VDS| in V'),
      drain_load_ohm: num('a drain load in Ω').optional(),
      lo_amplitude_v: num('an LO peak amplitude in V').optional(),
    },
    { error: 'expected a JSON object' },
  )
  .superRefine((b, ctx) => {
    if ((b.reservation_id === undefined) === (b.serials === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['serials'], message: 'give either a reservation_id or a list of serials' });
    }
    const positive = [
      ['target_drain_current_a', b.target_drain_current_a, 'a drain current > 0 A'],
      ['drain_load_ohm', b.drain_load_ohm, 'a drain load ≥ 0 Ω'],
      ['lo_amplitude_v', b.lo_amplitude_v, 'an LO peak amplitude ≥ 0 V'],
    ] as const;
    for (const [field, v, what] of positive) {
      if (v === undefined) continue;
      if (field === 'target_drain_current_a' ? !(v > 0) : !(v >= 0)) ctx.addIssue({ code: 'custom', path: [field], message: `expected ${what}, got ${v}` });
    }
    if (b.serials && new Set(b.serials).size !== b.serials.length) {
      ctx.addIssue({ code: 'custom', path: ['serials'], message: 'expected each serial once' });
    }
  });
export type SetRequest = z.infer<typeof SetRequest>;
