import { EstimateInputError } from './estimate-input-error';
import { MixerEstimateInput, type MixerDrive } from './mixer-input';

export type MixerProductName = 'rf' | 'lo' | 'lo_minus_rf' | 'lo_plus_rf' | 'two_lo' | 'two_rf';

export interface MixerProduct {
  name: MixerProductName;
  frequencyHz: number;
  /** Peak drain current at this frequency (A). */
  currentA: number;
  /** |Z| of the load R ∥ C at this frequency (Ω). */
  loadImpedanceOhm: number;
  /** Peak output voltage I·|Z| (V). */
  outputPeakV: number;
  /** RMS output in dBV: 20·log10(Vpeak/√2); null when the product is zero. */
  dbv: number | null;
  /** Power into the load resistance R: 10·log10((Vrms²/R)/1 mW); null when zero. */
  dbm: number | null;
}

export interface MixerEstimate {
  /** Difference-frequency current per volt of RF gate–source drive: IDSS·|b|/VP², b the effective LO drive (S). */
  conversionTransconductanceS: number;
  /** Peak drive actually across gate and source, signed as it enters vGS (V). */
  effectiveDrive: { rfV: number; loV: number };
  /** DC drain current with both drives on: IDSS·(u² + (a² + b²)/(2·VP²)) (A). */
  dcDrainCurrentA: number;
  products: MixerProduct[];
  warnings: string[];
}

/**
 * Signed amplitude a drive contributes to vGS: +A on the gate, −A on the source; its in-phase
 * leak onto the other terminal subtracts, so the net is ±(A − leak).
 */
export function effectiveGateSourceDriveV(drive: Pick<MixerDrive, 'amplitudeV' | 'terminal'> & { leakV?: number }): number {
  const net = drive.amplitudeV - (drive.leakV ?? 0);
  return drive.terminal === 'gate' ? net : -net;
}

/** |Z| of R in parallel with C at f: R / sqrt(1 + (2πfRC)²). */
export function parallelRcImpedanceOhm(rOhm: number, cF: number, frequencyHz: number): number {
  const x = 2 * Math.PI * frequencyHz * rOhm * cF;
  return rOhm / Math.sqrt(1 + x * x);
}

/**
 * Output products of a single-JFET square-law mixer, ID = IDSS·(1 − vGS/VP)² with
 * vGS = VGS0 + a·cos ωRF·t + b·cos ωLO·t (a, b the effective signed drives), u = 1 − VGS0/VP
 * (derived; nothing above second order exists in the square law):
 *   RF, LO fundamentals  2·IDSS·u·|a|/|VP|, 2·IDSS·u·|b|/|VP|
 *   LO − RF, LO + RF     IDSS·|a·b|/VP² each
 *   2·RF, 2·LO           IDSS·a²/(2·VP²), IDSS·b²/(2·VP²)
 * Throws EstimateInputError on invalid input; warns when vGS leaves [VP, 0] at its extremes
 * or two products share a frequency.
 */
export function estimateMixer(rawInput: MixerEstimateInput): MixerEstimate {
  const parsed = MixerEstimateInput.safeParse(rawInput);
  if (!parsed.success) {
    throw new EstimateInputError(
      parsed.error.issues.map((i) => ({ field: i.path.map(String).join('.') || '(input)', message: i.message })),
    );
  }
  const { idssA, vpV, vgs0V, loadOhm, probeCapacitanceF, lo, rf } = parsed.data;
  const vp = Math.abs(vpV);
  const u = 1 - vgs0V / vpV;
  const a = effectiveGateSourceDriveV(rf);
  const b = effectiveGateSourceDriveV(lo);
  const warnings: string[] = [];

  const swing = (Math.abs(a) + Math.abs(b)) / vp;
  if (u - swing < 0) {
    warnings.push(
      `At its peaks vGS reaches beyond pinch-off (VP = ${vpV} V): the part cuts off for part of each cycle, the square law no longer holds there and the figures overstate the fundamentals and understate higher-order products.`,
    );
  }
  if (u + swing > 1) {
    warnings.push(
      'At its peaks vGS crosses 0 V toward forward gate bias: gate current flows and the square law no longer holds there; reduce the drive or bias further from 0 V.',
    );
  }
  for (const [drive, name] of [
    [lo, 'LO'],
    [rf, 'RF'],
  ] as const) {
    if (drive.leakV > drive.amplitudeV) {
      warnings.push(`The ${name} leak (${drive.leakV} V) exceeds its drive (${drive.amplitudeV} V): the net drive reverses phase.`);
    }
  }

  const sq = vp * vp;
  const raw: { name: MixerProductName; frequencyHz: number; currentA: number }[] = [
    { name: 'rf', frequencyHz: rf.frequencyHz, currentA: (2 * idssA * u * Math.abs(a)) / vp },
    { name: 'lo', frequencyHz: lo.frequencyHz, currentA: (2 * idssA * u * Math.abs(b)) / vp },
    { name: 'lo_minus_rf', frequencyHz: Math.abs(lo.frequencyHz - rf.frequencyHz), currentA: (idssA * Math.abs(a * b)) / sq },
    { name: 'lo_plus_rf', frequencyHz: lo.frequencyHz + rf.frequencyHz, currentA: (idssA * Math.abs(a * b)) / sq },
    { name: 'two_lo', frequencyHz: 2 * lo.frequencyHz, currentA: (idssA * b * b) / (2 * sq) },
    { name: 'two_rf', frequencyHz: 2 * rf.frequencyHz, currentA: (idssA * a * a) / (2 * sq) },
  ];
  if (raw[2].frequencyHz === 0) {
    warnings.push('LO and RF share one frequency: the difference product is a DC shift, not an output frequency.');
  }
  for (let i = 0; i < raw.length; i++) {
    for (let j = i + 1; j < raw.length; j++) {
      const fi = raw[i].frequencyHz;
      const fj = raw[j].frequencyHz;
      if (Math.abs(fi - fj) <= 1e-9 * Math.max(fi, fj)) {
        warnings.push(`Products ${raw[i].name} and ${raw[j].name} fall at the same frequency (${fi} Hz): they add with their phases, which the listed amplitudes do not show.`);
      }
    }
  }

  const products = raw.map((p): MixerProduct => {
    const loadImpedanceOhm = parallelRcImpedanceOhm(loadOhm, probeCapacitanceF, p.frequencyHz);
    const outputPeakV = p.currentA * loadImpedanceOhm;
    const vrms = outputPeakV / Math.SQRT2;
    return {
      ...p,
      loadImpedanceOhm,
      outputPeakV,
      dbv: vrms > 0 ? 20 * Math.log10(vrms) : null,
      dbm: vrms > 0 ? 10 * Math.log10((vrms * vrms) / loadOhm / 1e-3) : null,
    };
  });

  return {
    conversionTransconductanceS: (idssA * Math.abs(b)) / sq,
    effectiveDrive: { rfV: a, loV: b },
    dcDrainCurrentA: idssA * (u * u + (a * a + b * b) / (2 * sq)),
    products,
    warnings,
  };
}
