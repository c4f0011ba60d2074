/**
 * Starting values of the stage estimates taken from the part, and the checks that explain an
 * input the part cannot take. Square law, datasheet signs: ID = IDSS·(1 − VGS/VP)².
 *
 * - Bias at a quarter of IDSS, which is VGS = VP/2 (derived: (1 − 1/2)² = 1/4). It leaves
 *   |VP|/2 of swing on either side before cut-off or forward gate bias (derived), and sits in
 *   the middle of the square-law region, where a mixer's products follow the formulas.
 * - LO 0.3·|VP| and RF 0.1·|VP| peak: together 0.4·|VP| < |VP|/2, so the gate never leaves
 *   that region at the peaks (derived).
 */
import { formatSignificant } from '../units/format-quantity';

export interface PartFigures {
  /** IDSS magnitude (A). */
  idssA: number;
  /** Pinch-off in datasheet sign (V): negative for N, positive for P. */
  vpV: number;
}

export interface EstimateDefaults {
  targetCurrentA: number;
  vgs0V: number;
  loAmplitudeV: number;
  rfAmplitudeV: number;
}

export const DEFAULT_BIAS_FRACTION_OF_IDSS = 0.25;

const round = (x: number, sig: number) => Number(x.toPrecision(sig));

export function estimateDefaultsForPart(p: PartFigures): EstimateDefaults {
  const vp = p.vpV;
  return {
    targetCurrentA: round(p.idssA * DEFAULT_BIAS_FRACTION_OF_IDSS, 2),
    vgs0V: Math.round((vp / 2) * 100) / 100,
    loAmplitudeV: Math.round(Math.abs(vp) * 0.3 * 1000) / 1000,
    rfAmplitudeV: Math.round(Math.abs(vp) * 0.1 * 1000) / 1000,
  };
}

export interface EstimateInputs {
  targetCurrentA?: number;
  vgs0V?: number;
  loAmplitudeV?: number;
  rfAmplitudeV?: number;
}

export interface InputProblem {
  field: keyof EstimateInputs;
  /** 'error': the part cannot take it (the server would refuse); 'caution': the figures stop holding. */
  severity: 'error' | 'caution';
  message: string;
}

const v = (x: number) => formatSignificant(x, 'V', 3);
const a = (x: number) => formatSignificant(x, 'A', 3);

/** What the part cannot take among the inputs, each explained in words with a value it can take. */
export function checkInputsAgainstPart(p: PartFigures, inputs: EstimateInputs): InputProblem[] {
  const out: InputProblem[] = [];
  const d = estimateDefaultsForPart(p);
  const vp = p.vpV;
  if (inputs.targetCurrentA !== undefined) {
    if (inputs.targetCurrentA >= p.idssA) {
      out.push({
        field: 'targetCurrentA',
        severity: 'error',
        message: `This part's IDSS is ${a(p.idssA)}; self-bias can only set a current below it. Try ${a(d.targetCurrentA)} (a quarter of IDSS).`,
      });
    } else if (inputs.targetCurrentA <= 0) {
      out.push({ field: 'targetCurrentA', severity: 'error', message: `Expected a current above 0; try ${a(d.targetCurrentA)} (a quarter of IDSS).` });
    }
  }
  if (inputs.vgs0V !== undefined) {
    const vgs = inputs.vgs0V;
    const beyond = vp < 0 ? vgs <= vp : vgs >= vp;
    const forward = vp < 0 ? vgs > 0 : vgs < 0;
    if (beyond) {
      out.push({
        field: 'vgs0V',
        severity: 'error',
        message: `VGS0 ${v(vgs)} is at or past this part's pinch-off (VP ${v(vp)}): the part is cut off. Choose between ${v(vp)} and 0 V, e.g. ${v(d.vgs0V)} (VP/2).`,
      });
    } else if (forward) {
      out.push({
        field: 'vgs0V',
        severity: 'error',
        message: `VGS0 ${v(vgs)} forward-biases the gate of a ${vp < 0 ? 'N' : 'P'}-channel part. Choose between ${v(vp)} and 0 V, e.g. ${v(d.vgs0V)} (VP/2).`,
      });
    } else if (inputs.loAmplitudeV !== undefined || inputs.rfAmplitudeV !== undefined) {
      const swing = Math.abs(inputs.loAmplitudeV ?? 0) + Math.abs(inputs.rfAmplitudeV ?? 0);
      const room = Math.min(Math.abs(vgs), Math.abs(vp - vgs));
      if (swing > room) {
        out.push({
          field: 'loAmplitudeV',
          severity: 'caution',
          message: `LO + RF reach ${v(swing)} peak, but VGS0 ${v(vgs)} leaves only ${v(room)} before ${Math.abs(vgs) < Math.abs(vp - vgs) ? 'forward gate bias' : 'pinch-off'}: the square-law figures do not hold at the peaks. With VGS0 = VP/2, LO ${v(d.loAmplitudeV)} and RF ${v(d.rfAmplitudeV)} stay inside.`,
        });
      }
    }
  }
  return out;
}
