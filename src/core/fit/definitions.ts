import type { ModelAgreement } from '../operating-point/model-agreement';
import type { OperatingTable } from '../operating-point/operating-table';

/**
 * Shapes that cross the fitting boundary. All values SI and N-equivalent (a P-channel sweep
 * is converted with `toNEquivalent` before it reaches the fit).
 */

/** One VGS step of a sweep: drain current against drain-source voltage. */
export interface Curve {
  vgsV: number;
  points: { vdsV: number[]; idA: number[] };
}

/** All VGS steps of one sweep, in the order the file gave them. */
export interface CurveFamily {
  curves: Curve[];
}

export interface FitOptions {
  /** The device type's IDSS test VDS (magnitude, V). */
  vdsTestV: number;
  /** Measurement temperature, recorded in the result and the model card (TNOM). */
  temperatureC?: number;
  /**
   * Points left out by a reviewer, as flat indices: curve 0's points first, then curve 1's,
   * in the order they appear in `family`.
   */
  excludedPoints?: number[];
  /** 'auto' (default) keeps RS/RD only when the F-test says they help; see `fitCurveFamily`. */
  extended?: 'auto' | 'never' | 'always';
  /**
   * How the problem is handed to ml-levenberg-marquardt: 'compressed' (default) or every
   * data row ('full'). Both give the same iterates; 'full' is kept to check that and to time it.
   */
  solverRows?: 'compressed' | 'full';
}

export type FitModel = 'level1' | 'level1+rs_rd';

export type FitFlagCode =
  | 'poor_fit'
  | 'self_heating'
  | 'breakdown'
  | 'too_few_saturation_points'
  | 'too_few_curves'
  | 'parameter_at_bound'
  | 'no_convergence'
  | 'model_disagrees';

export interface FitFlag {
  code: FitFlagCode;
  /** A sentence for the review queue: what was seen and what was done about it. */
  message: string;
  /** Flat indices (see `FitOptions.excludedPoints`) the flag removed from the fit, if any. */
  excludedPoints?: number[];
  /**
   * True for a flag that informs without holding the part: it is listed in the review queue,
   * but the part is accepted as usual (e.g. `model_disagrees`).
   */
  advisory?: boolean;
}

/** A value with its standard error (same unit); `standardError` is NaN when not estimable. */
export interface Estimate {
  value: number;
  standardError: number;
}

export interface FittedParameters {
  vtoV: Estimate;
  betaAPerV2: Estimate;
  lambdaPerV: Estimate;
  /** 0 with standard error 0 when the level-1 model was kept. */
  rsOhm: Estimate;
  rdOhm: Estimate;
}

export interface DerivedFigures {
  vdsTestV: number;
  /** The model's IDSS at `vdsTestV`. */
  idssA: Estimate;
  /** IDSS read from the VGS = 0 curve at `vdsTestV` (linear interpolation), or null. */
  idssMeasuredA: number | null;
  /** Square-law pinch-off VP = VTO, N-equivalent sign (negative). Not a measured VGS(off). */
  vpV: Estimate;
  /** gfs at VGS = 0, VDS = `vdsTestV`. */
  gfsS: Estimate;
  /** gos at IDSS (VGS = 0, VDS = `vdsTestV`). */
  gosS: Estimate;
  /** rDS(on) at VGS = 0, small VDS, including RS + RD when fitted. */
  rdsOnOhm: Estimate;
}

export interface FitQuality {
  rmsResidualA: number;
  /** RMS residual divided by the model's IDSS at the test VDS. */
  rmsResidualRelative: number;
  rSquared: number;
  iterations: number;
  pointsFitted: number;
}

/**
 * Outcome of the F-test that decides between the level-1 and the extended model. When the
 * pre-screen (`screenExtendedModel`) left the full RS/RD fit out, `screened` is true and
 * `fStatistic`, `pValue` are the screen's predicted ones (`kept` is then false).
 */
export interface ExtendedModelTest {
  fStatistic: number;
  pValue: number;
  kept: boolean;
  /** True when the full extended fit was skipped on the screen's prediction. */
  screened?: boolean;
  /** The screen's one-step Gauss–Newton prediction, in 'auto' mode. */
  predictedFStatistic?: number;
  predictedPValue?: number;
}

export interface FittedResult {
  status: 'fitted';
  model: FitModel;
  engineVersion: string;
  parameters: FittedParameters;
  derived: DerivedFigures;
  quality: FitQuality;
  extendedTest: ExtendedModelTest | null;
  flags: FitFlag[];
  /** True when any flag that is not advisory is raised: the part goes to the review queue. */
  needsReview: boolean;
  temperatureC: number | null;
  /** The fitted model's VGS against the measured one (`compareModelWithMeasurements`), or null. */
  modelAgreement: ModelAgreement | null;
  /**
   * One standard deviation for a VGS taken from the model (outside the measured range): the
   * larger of the model's disagreement with the measurements and VTO's standard error (V).
   */
  modelVgsSigmaV: number;
  /**
   * The measurements in compact form, for operating-point figures (`buildOperatingTable`).
   * Stored in its own column, not with the rest of the result.
   */
  operatingTable: OperatingTable | null;
}

/** The data could not support any fit (e.g. no curve carries current). */
export interface NotFittedResult {
  status: 'not_fitted';
  engineVersion: string;
  flags: FitFlag[];
  needsReview: true;
  temperatureC: number | null;
}

export type FitResult = FittedResult | NotFittedResult;
