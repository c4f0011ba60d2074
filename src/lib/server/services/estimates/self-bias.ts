import { nearestPreferredValue, paramsFromIdssVp, solveSelfBias, sourceResistorForCurrent, type ESeries, type SelfBiasPoint } from '~/core/estimates';
import { SelfBiasRequest, type SelfBiasEstimateJson, type SelfBiasPointJson } from '~/contracts/estimates';
import type { Channel, JfetParams } from '~/core/jfet-model';
import { getDb } from '~/db/client';
import { requirePermission, type Actor } from '~/lib/server/identity';
import { inRequestFieldNames } from './request-field-names';
import { describePartModel, fitReviewWarnings, loadPartModel } from './part-model';

export const SELF_BIAS_MODEL =
  'SPICE level-1 JFET in saturation (with λ and the fitted RS/RD when the part has them), gate returned to ground through a resistor, VGS = −ID·RS solved exactly; low-frequency small-signal gm and gos.';

export function selfBiasPointBody(p: SelfBiasPoint): SelfBiasPointJson {
  return {
    drain_current_a: p.idA,
    vgs_v: p.vgsV,
    source_resistor_ohm: p.rsOhm,
    vds_v: p.vdsV,
    gm_s: p.gmS,
    gos_s: p.gosS,
    /** Where VGS, gm and gos came from: the part's measurements, or its model (extrapolated). */
    source: p.source ?? 'model',
    vgs_sigma_v: p.vgsSigmaV !== undefined && Number.isFinite(p.vgsSigmaV) ? p.vgsSigmaV : null,
    saturated: p.saturated,
    gain: p.gain
      ? { drain_load_ohm: p.gain.drainLoadOhm, bypassed_v_per_v: p.gain.bypassed, unbypassed_v_per_v: p.gain.unbypassed }
      : null,
    warnings: p.warnings,
  };
}

export const SELF_BIAS_RENAMES = {
  idA: 'target_drain_current_a',
  rsOhm: 'source_resistor_ohm',
} as const;

/**
 * The self-bias resistor for a target current and/or the current a given resistor sets, with
 * gm, gos and the common-source gain into an optional drain load.
 */
export async function estimateSelfBias({ actor, input }: { actor: Actor | null; input: unknown }): Promise<SelfBiasEstimateJson> {
  requirePermission(actor, 'estimates:use');
  const body = SelfBiasRequest.parse(input);
  const stored = body.serial !== undefined ? await loadPartModel(getDb(), body.serial) : null;
  let params: JfetParams;
  let channel: Channel;
  if (stored) {
    params = stored.params;
    channel = stored.channel;
  } else {
    channel = body.vp_v! > 0 ? 'p' : 'n';
    params = inRequestFieldNames(() => paramsFromIdssVp(body.idss_a!, body.vp_v!, body.lambda_per_v ?? 0, body.idss_vds_v ?? 0));
  }
  const renames: Record<string, string> = stored
    ? { ...SELF_BIAS_RENAMES, 'params.vtoV': 'serial', 'params.betaAPerV2': 'serial', 'params.lambdaPerV': 'serial', 'params.rsOhm': 'serial', 'params.rdOhm': 'serial' }
    : { ...SELF_BIAS_RENAMES, 'params.vtoV': 'vp_v', 'params.betaAPerV2': 'idss_a', 'params.lambdaPerV': 'lambda_per_v' };
  const options = { drainLoadOhm: body.drain_load_ohm, channel };
  // A stored part's figures come from its measurements where they reach the point (one source for every view).
  const basis = stored ? stored.basis : params;

  const forTarget =
    body.target_drain_current_a === undefined
      ? null
      : inRequestFieldNames(() => sourceResistorForCurrent(basis, body.target_drain_current_a!, body.vds_v, options), renames);
  const forResistor =
    body.source_resistor_ohm === undefined
      ? null
      : inRequestFieldNames(() => solveSelfBias(basis, { rsOhm: body.source_resistor_ohm!, vdsV: body.vds_v, ...options }), renames);

  // The target's resistor rounded to the nearest IEC 60063 E24 and E96 values, solved the same way.
  const preferred = forTarget
    ? (['E24', 'E96'] as ESeries[]).flatMap((series) => {
        const rs = nearestPreferredValue(forTarget.rsOhm, series);
        if (rs === null) return [];
        try {
          return [{ series, ...selfBiasPointBody(solveSelfBias(basis, { rsOhm: rs, vdsV: body.vds_v, ...options })) }];
        } catch {
          return [];
        }
      })
    : [];

  return {
    model: SELF_BIAS_MODEL,
    preferred_resistors: preferred,
    part: stored ? describePartModel(stored) : null,
    channel,
    params: { vto_v: params.vtoV, beta_a_per_v2: params.betaAPerV2, lambda_per_v: params.lambdaPerV, rs_ohm: params.rsOhm, rd_ohm: params.rdOhm },
    for_target_current: forTarget ? selfBiasPointBody(forTarget) : null,
    for_source_resistor: forResistor ? selfBiasPointBody(forResistor) : null,
    warnings: stored ? fitReviewWarnings(stored) : [],
  };
}
