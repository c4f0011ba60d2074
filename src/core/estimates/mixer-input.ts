import { z } from 'zod';

const finite = (what: string) =>
  z.number({ error: `expected ${what}` }).refine(Number.isFinite, `expected ${what}, got a non-finite number`);

export const MixerDrive = z.object(
  {
  /** Peak amplitude applied at `terminal` (V). */
  amplitudeV: finite('a peak amplitude in V, ≥ 0').refine((v) => v >= 0, 'expected a peak amplitude in V, ≥ 0'),
  terminal: z.enum(['gate', 'source'], { error: "expected 'gate' or 'source'" }),
  frequencyHz: finite('a frequency in Hz, > 0').refine((v) => v > 0, 'expected a frequency in Hz, > 0'),
  /** Peak of the in-phase copy of this drive that reaches the other terminal (V); 0 when unknown. */
  leakV: finite('a leak amplitude in V, ≥ 0').refine((v) => v >= 0, 'expected a leak amplitude in V, ≥ 0').default(0),
  },
  { error: 'expected a drive { amplitudeV, terminal, frequencyHz, leakV? }' },
);
export type MixerDrive = z.infer<typeof MixerDrive>;

/**
 * Inputs of the square-law mixer estimate, datasheet signs: for an n-channel part VP < 0 and
 * VP ≤ VGS0 ≤ 0; for a p-channel part VP > 0 and 0 ≤ VGS0 ≤ VP.
 */
export const MixerEstimateInput = z
  .object({
    channel: z.enum(['n', 'p'], { error: "expected 'n' or 'p'" }),
    idssA: finite('IDSS in A, > 0').refine((v) => v > 0, 'expected IDSS in A, > 0'),
    vpV: finite('a pinch-off voltage in V'),
    vgs0V: finite('a gate–source bias in V'),
    loadOhm: finite('a load resistance in Ω, > 0').refine((v) => v > 0, 'expected a load resistance in Ω, > 0'),
    probeCapacitanceF: finite('a capacitance in F, ≥ 0').refine((v) => v >= 0, 'expected a capacitance in F, ≥ 0').default(0),
    lo: MixerDrive,
    rf: MixerDrive,
  })
  .superRefine((input, ctx) => {
    const { channel, vpV, vgs0V } = input;
    if (channel === 'n' && !(vpV < 0)) {
      ctx.addIssue({ code: 'custom', path: ['vpV'], message: `expected a negative pinch-off for an n-channel part (datasheet sign), got ${vpV}` });
      return;
    }
    if (channel === 'p' && !(vpV > 0)) {
      ctx.addIssue({ code: 'custom', path: ['vpV'], message: `expected a positive pinch-off for a p-channel part (datasheet sign), got ${vpV}` });
      return;
    }
    const lo = Math.min(vpV, 0);
    const hi = Math.max(vpV, 0);
    if (!(vgs0V >= lo && vgs0V <= hi)) {
      ctx.addIssue({ code: 'custom', path: ['vgs0V'], message: `expected the bias VGS0 between VP (${vpV} V) and 0 V, got ${vgs0V}` });
    }
  });
export type MixerEstimateInput = z.input<typeof MixerEstimateInput>;
