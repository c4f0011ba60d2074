import { z } from 'zod';

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
