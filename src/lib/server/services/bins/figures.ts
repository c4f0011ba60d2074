import type { BinFigures, BinPlan } from '~/core/binning';
import { vgsAtCurrentV } from '~/core/jfet-model';

export interface FitFigureColumns {
  vtoV: number;
  betaAPerV2: number;
  lambdaPerV: number;
  rsOhm: number;
  rdOhm: number;
  idssA: number;
  vpV: number;
}

/**
 * The figures a plan bins on, from a fit's columns: IDSS and VP as stored (VP in datasheet
 * sign), and, when the plan has a 'vgs_at_current' axis, VGS at its reference current and the
 * type's test VDS from the fitted model, in datasheet sign (negative for N, positive for P).
 */
export function binFiguresOf(
  fit: FitFigureColumns,
  type: { channel: 'n' | 'p'; vdsTestV: number },
  plan: BinPlan,
): BinFigures {
  const ref = plan.axes.find((a) => a.quantity === 'vgs_at_current')?.referenceCurrentA;
  let vgs: number | null = null;
  if (ref) {
    const params = { vtoV: fit.vtoV, betaAPerV2: fit.betaAPerV2, lambdaPerV: fit.lambdaPerV, rsOhm: fit.rsOhm, rdOhm: fit.rdOhm };
    const vgsN = vgsAtCurrentV(params, ref, type.vdsTestV);
    vgs = Number.isFinite(vgsN) ? (type.channel === 'n' ? vgsN : -vgsN) : null;
  }
  return { idssA: fit.idssA, vpV: fit.vpV, vgsAtCurrentV: vgs };
}
