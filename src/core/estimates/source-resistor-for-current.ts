import { vgsAtCurrentV, type Channel, type JfetParams } from '../jfet-model';
import { EstimateInputError, throwIfIssues, type EstimateInputIssue } from './estimate-input-error';
import { paramIssues, selfBiasPoint, type SelfBiasPoint } from './self-bias-point';

/**
 * The self-bias source resistor that sets drain current `idA` at |VDS| `vdsV`:
 * RS = −VGS(ID)/ID, with VGS(ID) the saturation VGS at that current (N-equivalent, including the
 * part's own series resistance). Throws EstimateInputError when the target is at or above the
 * part's IDSS at that VDS — a source resistor can only lower the current.
 */
export function sourceResistorForCurrent(
  params: JfetParams,
  idA: number,
  vdsV: number,
  options: { drainLoadOhm?: number; channel?: Channel } = {},
): SelfBiasPoint {
  const vds = Math.abs(vdsV);
  const issues: EstimateInputIssue[] = paramIssues(params);
  if (!(idA > 0) || !Number.isFinite(idA)) issues.push({ field: 'idA', message: `expected a target drain current > 0 A, got ${idA}` });
  if (!Number.isFinite(vds)) issues.push({ field: 'vdsV', message: `expected a finite VDS in V, got ${vdsV}` });
  if (options.drainLoadOhm !== undefined && !(options.drainLoadOhm >= 0)) {
    issues.push({ field: 'drainLoadOhm', message: `expected a drain load ≥ 0 Ω, got ${options.drainLoadOhm}` });
  }
  throwIfIssues(issues);
  const vgsV = vgsAtCurrentV(params, idA, vds);
  if (!(vgsV < 0)) {
    throw new EstimateInputError([
      {
        field: 'idA',
        message: `a target of ${idA} A needs VGS = ${vgsV.toFixed(4)} V (at or above 0 V): it is at or above this part's IDSS at ${vds} V, which self-bias cannot reach; choose a lower current`,
      },
    ]);
  }
  return selfBiasPoint(params, idA, -vgsV / idA, vds, options.channel ?? 'n', options.drainLoadOhm);
}
