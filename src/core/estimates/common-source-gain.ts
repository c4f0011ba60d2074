/**
 * Small-signal voltage gain of a common-source stage (vout across the drain load, input at the
 * gate), from the model with transconductance gm and output conductance gos (derived):
 *   Av = −gm·RD / (1 + gm·Rs + gos·(RD + Rd + Rs))
 * where Rs is everything between the intrinsic source and AC ground (the unbypassed source
 * resistor plus the part's own RS; just the part's RS when the resistor is bypassed) and Rd the
 * part's own drain series resistance. With Rs = Rd = 0 this is −gm·(RD ∥ 1/gos); with gos = 0,
 * −gm·RD/(1 + gm·Rs).
 */
export function commonSourceGain(args: {
  gmS: number;
  gosS: number;
  drainLoadOhm: number;
  sourceDegenerationOhm?: number;
  drainSeriesOhm?: number;
}): number {
  const { gmS, gosS, drainLoadOhm } = args;
  const rs = args.sourceDegenerationOhm ?? 0;
  const rd = args.drainSeriesOhm ?? 0;
  return (-gmS * drainLoadOhm) / (1 + gmS * rs + gosS * (drainLoadOhm + rd + rs));
}
