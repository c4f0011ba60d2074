import { z } from 'zod';
import { Channel } from './common';

/** A device type with its test conditions, temperature coefficients and specification limits (SI; VP in datasheet sign). */
export const DeviceTypeJson = z.object({
  id: z.number().int(),
  name: z.string(),
  channel: Channel,
  description: z.string(),
  vds_test_v: z.number(),
  nominal_temperature_c: z.number(),
  /** ngspice's VTOTC (V/°C) on the N-equivalent VTO. */
  vtotc_v_per_c: z.number(),
  /** ngspice's BETATCE (%/°C). */
  betatce_pct_per_c: z.number(),
  idss_min_a: z.number().nullable(),
  idss_max_a: z.number().nullable(),
  vp_min_v: z.number().nullable(),
  vp_max_v: z.number().nullable(),
});
export type DeviceTypeJson = z.infer<typeof DeviceTypeJson>;

/** `GET /api/admin/device-types`: by name. */
export const DeviceTypeList = z.object({ device_types: z.array(DeviceTypeJson) });
export type DeviceTypeList = z.infer<typeof DeviceTypeList>;

const optionalNumber = z.number().finite().nullable().optional();

/** The body of `POST /api/admin/device-types` and `PUT /api/admin/device-types/{id}`: a type as the admin edits it. Limits in SI, pinch-off in datasheet sign. */
export const DeviceTypeInput = z
  .object({
    name: z.string().trim().min(1, 'must not be empty').max(40, 'must be at most 40 characters'),
    channel: z.enum(['n', 'p']),
    description: z.string().trim().max(400).default(''),
    vds_test_v: z.number().positive('must be a positive |VDS| in volts').max(100, 'must be at most 100 V'),
    nominal_temperature_c: z.number().min(-60).max(200).default(25),
    /** ngspice's VTOTC (V/°C) on the N-equivalent VTO: negative when |VP| grows with temperature. */
    vtotc_v_per_c: z.number().min(-0.05, 'must be between −50 and 50 mV/°C').max(0.05, 'must be between −50 and 50 mV/°C').default(-0.0022),
    /** ngspice's BETATCE (%/°C): BETA(T) = BETA·1.01^(BETATCE·ΔT). */
    betatce_pct_per_c: z.number().min(-5, 'must be between −5 and 5 %/°C').max(5, 'must be between −5 and 5 %/°C').default(-0.7),
    idss_min_a: optionalNumber,
    idss_max_a: optionalNumber,
    vp_min_v: optionalNumber,
    vp_max_v: optionalNumber,
  })
  .superRefine((v, ctx) => {
    if (v.idss_min_a != null && v.idss_max_a != null && v.idss_min_a > v.idss_max_a) {
      ctx.addIssue({ code: 'custom', path: ['idss_max_a'], message: 'must not be below the IDSS minimum' });
    }
    if (v.vp_min_v != null && v.vp_max_v != null && v.vp_min_v > v.vp_max_v) {
      ctx.addIssue({ code: 'custom', path: ['vp_max_v'], message: 'must not be below the VP minimum' });
    }
    const sign = v.channel === 'n' ? -1 : 1;
    for (const key of ['vp_min_v', 'vp_max_v'] as const) {
      const x = v[key];
      if (x != null && Math.sign(x) !== sign) {
        ctx.addIssue({ code: 'custom', path: [key], message: `must be ${sign < 0 ? 'negative' : 'positive'} for a ${v.channel.toUpperCase()}-channel type (datasheet sign)` });
      }
    }
  });
export type DeviceTypeInput = z.infer<typeof DeviceTypeInput>;
