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
