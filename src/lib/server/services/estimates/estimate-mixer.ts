import { estimateMixer, paramsFromIdssVp, solveSelfBias, type MixerEstimateInput } from '~/core/estimates';
import { MixerRequest, type MixerEstimateJson } from '~/contracts/estimates';
import type { Channel } from '~/core/jfet-model';
import { getDb } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { inRequestFieldNames } from './request-field-names';
import { describePartModel, fitReviewWarnings, loadPartModel } from './part-model';

export const MIXER_MODEL =
  'Square law ID = IDSS·(1 − vGS/VP)², saturation only; no capacitances, no transit time, no gate current: a low-frequency estimate.';

/**
 * The square-law mixer's output products for data-sheet IDSS/VP or a stored part's current fit.
 * With a source resistor the bias VGS0 is the self-bias point of the same square law.
 */
export async function estimateMixerProducts({ actor, input }: { actor: Actor | null; input: unknown }): Promise<MixerEstimateJson> {
  requirePermission(actor, 'estimates:use');
  const body = MixerRequest.parse(input);
  const stored = body.serial !== undefined ? await loadPartModel(getDb(), body.serial) : null;
  const idssA = stored ? stored.idssA : body.idss_a!;
  const vpV = stored ? stored.vpV : body.vp_v!;
  const channel: Channel = stored ? stored.channel : vpV > 0 ? 'p' : 'n';

  let vgs0V = body.vgs0_v;
  let selfBiasCurrentA: number | null = null;
  if (vgs0V === undefined) {
    const point = inRequestFieldNames(
      () => solveSelfBias(paramsFromIdssVp(idssA, vpV), { rsOhm: body.source_resistor_ohm!, vdsV: 0, channel }),
      { rsOhm: 'source_resistor_ohm' },
    );
    vgs0V = point.vgsV;
    selfBiasCurrentA = point.idA;
  }

  const coreInput: MixerEstimateInput = {
    channel,
    idssA,
    vpV,
    vgs0V,
    loadOhm: body.load_ohm,
    probeCapacitanceF: body.probe_capacitance_f ?? 0,
    lo: { amplitudeV: body.lo.amplitude_v, terminal: body.lo.terminal, frequencyHz: body.lo.frequency_hz, leakV: body.lo.leak_v ?? 0 },
    rf: { amplitudeV: body.rf.amplitude_v, terminal: body.rf.terminal, frequencyHz: body.rf.frequency_hz, leakV: body.rf.leak_v ?? 0 },
  };
  // With a stored part, IDSS/VP come from its fit: a core complaint about them names the serial.
  const renames: Record<string, string> = stored ? { idssA: 'serial', vpV: 'serial', channel: 'serial' } : { channel: 'vp_v' };
  if (body.source_resistor_ohm !== undefined) renames.vgs0V = 'source_resistor_ohm';
  const result = inRequestFieldNames(() => estimateMixer(coreInput), renames);

  return {
    model: MIXER_MODEL,
    part: stored ? describePartModel(stored) : null,
    channel,
    idss_a: idssA,
    vp_v: vpV,
    bias: { vgs0_v: vgs0V, source_resistor_ohm: body.source_resistor_ohm ?? null, self_bias_current_a: selfBiasCurrentA },
    conversion_transconductance_s: result.conversionTransconductanceS,
    dc_drain_current_a: result.dcDrainCurrentA,
    effective_drive: { rf_v: result.effectiveDrive.rfV, lo_v: result.effectiveDrive.loV },
    load_ohm: body.load_ohm,
    probe_capacitance_f: body.probe_capacitance_f ?? 0,
    products: result.products.map((p) => ({
      name: p.name,
      frequency_hz: p.frequencyHz,
      current_a: p.currentA,
      load_impedance_ohm: p.loadImpedanceOhm,
      output_peak_v: p.outputPeakV,
      dbv: p.dbv,
      dbm: p.dbm,
    })),
    warnings: [...(stored ? fitReviewWarnings(stored) : []), ...result.warnings],
  };
}
