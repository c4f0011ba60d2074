import { vgsAtCurrentV, type JfetParams } from '../jfet-model';
import type { OperatingTable } from './operating-table';
import { readMeasuredFigures } from './read-measured-figures';

/** Where the fitted model and the measurements are compared: shares of the measured IDSS. */
export const AGREEMENT_FRACTIONS = [0.1, 0.5] as const;

/**
 * The model's VGS may differ from the measured one by this much before the part is flagged:
 * twice the tightest usual matched grade (5 mV, common practice). Beyond it, a SPICE run with the
 * part's `.model` card puts the part more than a whole tight grade away from where it really
 * sits, so a matched set simulated from the cards would not look matched. A disagreement is
 * flagged only when it also exceeds three standard deviations of the measured reading.
 */
export const MODEL_DISAGREEMENT_THRESHOLD_V = 0.01;

export interface AgreementPoint {
  fraction: number;
  idA: number;
  vgsMeasuredV: number;
  vgsModelV: number;
  vgsSigmaV: number;
}

export interface ModelAgreement {
  vdsTestV: number;
  points: AgreementPoint[];
  /** Largest |model − measured| VGS over the points (V). */
  maxDisagreementV: number;
  thresholdV: number;
  flagged: boolean;
}

/**
 * Compares the fitted model's VGS with the measured one at 10 % and 50 % of the measured IDSS,
 * at the IDSS test VDS (N-equivalent). Null when the measurements do not reach those points.
 */
export function compareModelWithMeasurements(
  table: OperatingTable | null,
  params: JfetParams,
  vdsTestV: number,
): ModelAgreement | null {
  const idss = readMeasuredFigures(table, params, { kind: 'idss', vdsV: vdsTestV });
  if (typeof idss === 'string') return null;
  const points: AgreementPoint[] = [];
  let flagged = false;
  let maxDisagreementV = 0;
  for (const fraction of AGREEMENT_FRACTIONS) {
    const idA = fraction * idss.idA;
    const r = readMeasuredFigures(table, params, { kind: 'current', idA, vdsV: vdsTestV });
    if (typeof r === 'string') continue;
    const vgsModelV = vgsAtCurrentV(params, idA, vdsTestV);
    const d = Math.abs(vgsModelV - r.vgsV);
    maxDisagreementV = Math.max(maxDisagreementV, d);
    if (d > MODEL_DISAGREEMENT_THRESHOLD_V && d > 3 * r.vgsSigmaV) flagged = true;
    points.push({ fraction, idA, vgsMeasuredV: r.vgsV, vgsModelV, vgsSigmaV: r.vgsSigmaV });
  }
  if (points.length === 0) return null;
  return { vdsTestV, points, maxDisagreementV, thresholdV: MODEL_DISAGREEMENT_THRESHOLD_V, flagged };
}
