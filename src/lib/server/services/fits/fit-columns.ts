import type { FittedResult } from '~/core/fit/definitions';
import type { Channel } from '~/core/jfet-model';
import { operatingTableToBytes } from '~/core/operating-point/operating-table';

/**
 * The columns of a fit row from the fitter's result. Parameters stay N-equivalent (VTO
 * negative for NJF and PJF alike); VP is stored in datasheet sign (negative for N, positive
 * for P). The full result, standard errors included, goes into `detail`; the measurements'
 * operating table into its own column (packed).
 */
export function fitColumns(
  result: FittedResult,
  channel: Channel,
  ids: { sweepId: number; partId: number },
  review: 'auto_accepted' | 'needs_review',
) {
  const { parameters: p, derived: d, quality: q } = result;
  const { operatingTable, ...detail } = result;
  return {
    sweepId: ids.sweepId,
    partId: ids.partId,
    model: result.model,
    engineVersion: result.engineVersion,
    vtoV: p.vtoV.value,
    betaAPerV2: p.betaAPerV2.value,
    lambdaPerV: p.lambdaPerV.value,
    rsOhm: p.rsOhm.value,
    rdOhm: p.rdOhm.value,
    idssA: d.idssA.value,
    idssVdsV: d.vdsTestV,
    vpV: channel === 'n' ? d.vpV.value : -d.vpV.value,
    gfsS: d.gfsS.value,
    gosS: d.gosS.value,
    rdsOnOhm: d.rdsOnOhm.value,
    rmsRel: q.rmsResidualRelative,
    detail,
    operatingTable: operatingTable ? operatingTableToBytes(operatingTable) : null,
    modelVgsSigmaV: Number.isFinite(result.modelVgsSigmaV) ? result.modelVgsSigmaV : null,
    flags: result.flags.map((f) => f.code),
    review,
  };
}
