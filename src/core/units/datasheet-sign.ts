/**
 * Figures in datasheet signs, as a part's data sheet prints them: an N-channel part has IDSS
 * positive and VP negative; a P-channel part has IDSS negative and VP positive (VDS and ID
 * negative, VGS positive). Sluice stores IDSS as a magnitude and VP already in datasheet
 * sign; every view that prints IDSS goes through `idssInDatasheetSign`.
 */
export type Channel = 'n' | 'p';

/** IDSS (stored as a magnitude) in datasheet sign for the channel. */
export function idssInDatasheetSign(idssA: number, channel: Channel): number {
  return channel === 'p' ? -Math.abs(idssA) : Math.abs(idssA);
}

/** VP in datasheet sign for the channel, whatever sign it came with. */
export function vpInDatasheetSign(vpV: number, channel: Channel): number {
  return channel === 'p' ? Math.abs(vpV) : -Math.abs(vpV);
}

/** A test VDS in datasheet sign (negative for P). */
export function vdsInDatasheetSign(vdsV: number, channel: Channel): number {
  return channel === 'p' ? -Math.abs(vdsV) : Math.abs(vdsV);
}
