import { z } from 'zod';
import type { DeviceTypeJson } from '~/contracts/device-types';

const optionalNumber = z.number().finite().nullable().optional();

/** A device type as the admin edits it. Limits in SI, pinch-off in datasheet sign. */
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

export function toColumns(v: DeviceTypeInput) {
  return {
    name: v.name,
    channel: v.channel,
    description: v.description,
    vdsTestV: v.vds_test_v,
    nominalTemperatureC: v.nominal_temperature_c,
    vtotcVPerC: v.vtotc_v_per_c,
    betatcePctPerC: v.betatce_pct_per_c,
    idssMinA: v.idss_min_a ?? null,
    idssMaxA: v.idss_max_a ?? null,
    vpMinV: v.vp_min_v ?? null,
    vpMaxV: v.vp_max_v ?? null,
  };
}

export function toDeviceTypeRow(r: {
  id: number; name: string; channel: 'n' | 'p'; description: string; vdsTestV: number; nominalTemperatureC: number;
  vtotcVPerC: number; betatcePctPerC: number;
  idssMinA: number | null; idssMaxA: number | null; vpMinV: number | null; vpMaxV: number | null;
}): DeviceTypeJson {
  return {
    id: r.id,
    name: r.name,
    channel: r.channel,
    description: r.description,
    vds_test_v: r.vdsTestV,
    nominal_temperature_c: r.nominalTemperatureC,
    vtotc_v_per_c: r.vtotcVPerC,
    betatce_pct_per_c: r.betatcePctPerC,
    idss_min_a: r.idssMinA,
    idss_max_a: r.idssMaxA,
    vp_min_v: r.vpMinV,
    vp_max_v: r.vpMaxV,
  };
}
