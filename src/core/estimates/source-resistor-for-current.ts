import { vgsAtCurrentV, type Channel, type JfetParams } from '../jfet-model';
import { partOperatingFigures, type PartBasis } from '../operating-point/part-operating-figures';
import { EstimateInputError, throwIfIssues, type EstimateInputIssue } from './estimate-input-error';
import { asPartBasis, paramIssues, selfBiasPoint, selfBiasPointFromFigures, type SelfBiasPoint } from './self-bias-point';

/**
 * The self-bias source resistor that sets drain current `idA` at |VDS| `vdsV`:
 * RS = −VGS(ID)/ID, with VGS(ID) from `partOperatingFigures` (the part's measurements where
 * they reach the point, else the saturation model with the part's own series resistance). Throws EstimateInputError when the target is at or above the
 * part's IDSS at that VDS — a source resistor can only lower the current.
 */
export function sourceResistorForCurrent(
  part: JfetParams | PartBasis,
  idA: number,
  vdsV: number,
  options: { drainLoadOhm?: number; channel?: Channel; compareAtC?: number } = {},
): SelfBiasPoint {
  const basis = asPartBasis(part);
  const params = basis.params;
  const vds = Math.abs(vdsV);
  const issues: EstimateInputIssue[] = paramIssues(params);
  if (!(idA > 0) || !Number.isFinite(idA)) issues.push({ field: 'idA', message: `expected a target drain current > 0 A, got ${idA}` });
  if (!Number.isFinite(vds)) issues.push({ field: 'vdsV', message: `expected a finite VDS in V, got ${vdsV}` });
  if (options.drainLoadOhm !== undefined && !(options.drainLoadOhm >= 0)) {
    issues.push({ field: 'drainLoadOhm', message: `expected a drain load ≥ 0 Ω, got ${options.drainLoadOhm}` });
  }
  throwIfIssues(issues);
  const e = partOperatingFigures(basis, { kind: 'current', idA, vdsV: vds }, options.compareAtC);
  const vgsV = e.usable ? e.figures.vgsV : vgsAtCurrentV(params, idA, vds);
  if (!(vgsV < 0)) {
    throw new EstimateInputError([
      {
        field: 'idA',
        message: `a target of ${idA} A needs VGS = ${vgsV.toFixed(4)} V (at or above 0 V): it is at or above this part's IDSS at ${vds} V, which self-bias cannot reach; choose a lower current`,
      },
    ]);
  }
  if (e.usable) return selfBiasPointFromFigures(basis, e.figures, -vgsV / idA, options.channel ?? 'n', options.drainLoadOhm);
  return selfBiasPoint(params, idA, -vgsV / idA, vds, options.channel ?? 'n', options.drainLoadOhm);
}
