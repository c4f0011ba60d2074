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
