import type { Channel, JfetParams } from '../jfet-model.ts';

export interface ModelCardInput {
  serial: string;
  channel: Channel;
  params: JfetParams;
  /** Measurement temperature; written as TNOM when given. */
  temperatureC?: number | null;
}

/**
 * SPICE model card, e.g. `.model J_A1234 NJF(VTO=-2.1 BETA=0.0013 LAMBDA=0.012 RS=0 RD=0)`.
 * VTO stays negative for PJF cards too (SPICE convention for depletion JFETs). The name is
 * the serial with every character other than a letter, digit or underscore replaced by `_`,
 * prefixed with `J_` so it always starts with a letter.
 */
export function formatModelCard({ serial, channel, params, temperatureC }: ModelCardInput): string {
  const fields = [
    `VTO=${spiceNumber(params.vtoV)}`,
    `BETA=${spiceNumber(params.betaAPerV2)}`,
    `LAMBDA=${spiceNumber(params.lambdaPerV)}`,
    `RS=${spiceNumber(params.rsOhm)}`,
    `RD=${spiceNumber(params.rdOhm)}`,
  ];
  if (temperatureC !== undefined && temperatureC !== null && Number.isFinite(temperatureC)) {
    fields.push(`TNOM=${spiceNumber(temperatureC)}`);
  }
  return `.model ${modelCardName(serial)} ${channel === 'n' ? 'NJF' : 'PJF'}(${fields.join(' ')})`;
}

/** The card name for a serial: `J_` + the serial with non-word characters as `_`. */
export function modelCardName(serial: string): string {
  const cleaned = serial.trim().replace(/[^A-Za-z0-9_]/g, '_');
  return `J_${cleaned || 'UNNAMED'}`;
}

/** 7 significant digits, no trailing zeros, exponent form for very small or large values. */
function spiceNumber(x: number): string {
  if (x === 0 || !Number.isFinite(x)) return '0';
  const abs = Math.abs(x);
  const text = abs >= 1e-3 && abs < 1e6 ? x.toPrecision(7) : x.toExponential(6);
  return text.replace(/(\.\d*?)0+(?=$|e)/, '$1').replace(/\.(?=$|e)/, '');
}
