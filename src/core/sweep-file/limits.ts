/**
 * Limits and tolerances of the sweep-file parser. Every number here is quoted in the error
 * messages and in FORMATS.md, so change them in one place only.
 */

/** Largest sweep file accepted, in bytes (4 MiB). */
export const MAX_SWEEP_FILE_BYTES = 4 * 1024 * 1024;

/** Largest number of (VGS, VDS, ID) points in one file, over all its parts. */
export const MAX_SWEEP_POINTS_PER_FILE = 100_000;

/**
 * Fewest gate steps (curves) per part. The level-1 fit takes VTO and BETA from how
 * sqrt(ID) in saturation moves with VGS: two steps always fit a straight line exactly, so a
 * third is the least that can show whether the square law holds at all.
 */
export const MIN_CURVES_PER_PART = 3;

/**
 * Fewest points per curve. A curve needs about three points in the linear region to show
 * its curvature (BETA, VTO again), three in saturation for the output slope (LAMBDA), and
 * room to drop the top points that self-heating or breakdown onset spoil without leaving
 * the saturation slope to two points.
 */
export const MIN_POINTS_PER_CURVE = 8;

/**
 * Sign noise: an ID whose magnitude is at most this fraction of the part's largest |ID|
 * (and a VDS at most this fraction of the part's largest |VDS|) counts as zero and may
 * carry either sign: offset and leakage at VDS = 0 and on cut-off curves.
 */
export const SIGN_NOISE_FRACTION = 1e-3;

/**
 * Highest N-equivalent VGS accepted (V). A silicon gate junction conducts hard by about
 * 0.7 V forward (common practice); a step beyond this means the VGS sign or the channel is
 * wrong, not that the part was driven there.
 */
export const MAX_FORWARD_VGS_V = 1;

/** Gate steps closer than this (V) are one step: VGS values are snapped to this grid. */
export const VGS_STEP_RESOLUTION_V = 1e-4;

/**
 * Most header cells read, and most per-gate-step ID columns in a wide file. A curve tracer
 * steps the gate 5 to 20 times (common practice); 200 is ten times that, and bounds the work
 * one header can ask of the worker.
 */
export const MAX_HEADER_CELLS = 1000;
export const MAX_GATE_STEP_COLUMNS = 200;

/**
 * Plausibility: values no JFET curve tracer produces. |ID| above 10 A is beyond any
 * small-signal JFET (IDSS of the largest ones is well under 1 A) and beyond the continuous
 * collector supply of common tracers; |VDS| above 1 kV is beyond every small-signal JFET's
 * breakdown (25 to 50 V, typical datasheets) and the high-voltage range of tracers; |VGS|
 * above 100 V is beyond any gate junction (gate breakdown 25 to 50 V; pinch-off under 10 V).
 * A value past these is a unit or scaling mistake (a file in nA written as A, ×1e10).
 */
export const MAX_ABS_ID_A = 10;
export const MAX_ABS_VDS_V = 1000;
export const MAX_ABS_VGS_V = 100;

/**
 * Smallest largest-|ID| of a part (A). Low-IDSS JFETs still conduct tens of µA at VGS = 0
 * (e.g. 30 µA minimum IDSS, 2N4117-class datasheets); a part whose largest current is under
 * 100 nA was not conducting, or its unit is wrong (a file scaled ×1e-10, currents of 1e-300).
 * Single tiny readings (1e-28 A of simulator noise) are kept: they are zero in effect.
 */
export const MIN_PEAK_ID_A = 1e-7;

/** `# temperature_c:` range, the same as the upload's own temperature field. */
export const MIN_TEMPERATURE_C = -60;
export const MAX_TEMPERATURE_C = 200;

/**
 * Noise floor of a part's currents, from its readings that should be zero (VDS = 0 points and
 * cut-off curves): offset (median) plus this many robust standard deviations (1.4826 × MAD),
 * so that Gaussian noise crosses it about once in two million readings.
 */
export const NOISE_FLOOR_SIGMAS = 5;

/**
 * The noise floor is never taken above this share of the part's largest |ID|: zero readings
 * spread wider than that are not noise, and a file whose bulk has both signs is refused.
 */
export const MAX_NOISE_FLOOR_FRACTION = 0.05;

/** A curve whose largest |ID| is at most this share of its part's largest is cut off. */
export const CUT_OFF_CURVE_FRACTION = 0.02;

/** Fewest points of a transfer curve (ID against VGS at one VDS). */
export const MIN_POINTS_PER_TRANSFER_CURVE = 5;
