import type { DeviceTypeInput, DeviceTypeJson } from '~/contracts/device-types';

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
