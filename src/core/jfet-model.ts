/**
 * SPICE level-1 JFET (Shichman–Hodges) as the ngspice manual gives it (chapter "JFETs",
 * level 1 with the Parker–Skellern modification at B = 1). All values SI: V, A, A/V², 1/V, Ω, S.
 *
 * Equations are written for an N-channel part. A P-channel part uses the same equations on
 * −VGS, −VDS and −ID; VTO stays negative for both (depletion parts). Callers convert between
 * datasheet signs and these "N-equivalent" magnitudes with `toNEquivalent`/`fromNEquivalent`.
 */

export type Channel = 'n' | 'p';

/** Intrinsic level-1 parameters plus optional series resistances (0 when not fitted). */
export interface JfetParams {
  vtoV: number;
  betaAPerV2: number;
  lambdaPerV: number;
  rsOhm: number;
  rdOhm: number;
}

/** Drain current of the intrinsic device (no series resistance), N-equivalent signs. */
export function intrinsicDrainCurrentA(
  p: Pick<JfetParams, 'vtoV' | 'betaAPerV2' | 'lambdaPerV'>,
  vgsV: number,
  vdsV: number,
): number {
  // Reverse VDS: the device is symmetric; swap source and drain.
  if (vdsV < 0) return -intrinsicDrainCurrentA(p, vgsV - vdsV, -vdsV);
  const vov = vgsV - p.vtoV;
  if (vov <= 0) return 0;
  const clm = 1 + p.lambdaPerV * vdsV;
  if (vdsV < vov) return p.betaAPerV2 * vdsV * (2 * vov - vdsV) * clm;
  return p.betaAPerV2 * vov * vov * clm;
}

/** Converts a datasheet-signed bias point to the N-equivalent one the equations use. */
export function toNEquivalent(channel: Channel, vgsV: number, vdsV: number, idA = 0) {
  const s = channel === 'n' ? 1 : -1;
  return { vgsV: s * vgsV, vdsV: s * vdsV, idA: s * idA };
}

/** Converts an N-equivalent current or voltage back to datasheet sign for `channel`. */
export function fromNEquivalent(channel: Channel, value: number): number {
  return channel === 'n' ? value : -value;
}

/** IDSS at a test VDS (magnitude, A). */
export function idssA(p: JfetParams, vdsTestV: number): number {
  return p.betaAPerV2 * p.vtoV * p.vtoV * (1 + p.lambdaPerV * Math.abs(vdsTestV));
}

/** Pinch-off voltage in datasheet sign: negative for N, positive for P. */
export function pinchOffV(p: JfetParams, channel: Channel): number {
  return channel === 'n' ? p.vtoV : -p.vtoV;
}

/** gfs at VGS = 0 and the given |VDS| (S): 2·BETA·|VTO|·(1 + λ·VDS). */
export function gfsAtZeroVgsS(p: JfetParams, vdsV: number): number {
  return 2 * p.betaAPerV2 * Math.abs(p.vtoV) * (1 + p.lambdaPerV * Math.abs(vdsV));
}

/** gm in saturation at drain current magnitude `idA` and |VDS|: 2·sqrt(BETA·ID·(1+λ·VDS)). */
export function gmAtCurrentS(p: JfetParams, idA: number, vdsV: number): number {
  return 2 * Math.sqrt(p.betaAPerV2 * idA * (1 + p.lambdaPerV * Math.abs(vdsV)));
}

/** gos in saturation at drain current magnitude `idA` and |VDS|: λ·ID/(1 + λ·VDS). */
export function gosAtCurrentS(p: JfetParams, idA: number, vdsV: number): number {
  return (p.lambdaPerV * idA) / (1 + p.lambdaPerV * Math.abs(vdsV));
}

/** rDS(on) at VGS = 0 and small VDS (Ω): 1/(2·BETA·|VTO|), plus RS + RD when fitted. */
export function rdsOnOhm(p: JfetParams): number {
  return 1 / (2 * p.betaAPerV2 * Math.abs(p.vtoV)) + p.rsOhm + p.rdOhm;
}

/**
 * N-equivalent external VGS at which the saturated part carries `idA` at external |VDS|:
 * VTO + sqrt(ID/(BETA·(1 + λ·VDS'))) + ID·RS, with VDS' = VDS − ID·(RS + RD). Callers decide
 * whether a result above 0 V (forward-biased gate) is acceptable.
 */
export function vgsAtCurrentV(p: JfetParams, idA: number, vdsV: number): number {
  const vdsInternalV = Math.abs(vdsV) - idA * (p.rsOhm + p.rdOhm);
  return (
    p.vtoV + Math.sqrt(idA / (p.betaAPerV2 * (1 + p.lambdaPerV * vdsInternalV))) + idA * p.rsOhm
  );
}
