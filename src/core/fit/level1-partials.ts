/**
 * Level-1 drain current with its partial derivatives, written for the fitting hot loop
 * (plain numbers, caller-owned scratch, no allocation). Same equations as
 * `intrinsicDrainCurrentA` in ../jfet-model.ts; N-equivalent signs.
 */

/** Slots of the partials scratch array. */
export const D_VTO = 0;
export const D_BETA = 1;
export const D_LAMBDA = 2;
export const D_VGS = 3;
export const D_VDS = 4;
export const PARTIALS_LENGTH = 5;

/**
 * Intrinsic drain current (A); writes ∂ID/∂VTO, ∂ID/∂BETA, ∂ID/∂LAMBDA, ∂ID/∂VGS, ∂ID/∂VDS
 * into `out[0..4]`.
 */
export function intrinsicCurrentWithPartials(
  vtoV: number,
  beta: number,
  lambda: number,
  vgsV: number,
  vdsV: number,
  out: Float64Array,
): number {
  if (vdsV < 0) {
    // Source and drain swap: ID(vgs, vds) = −ID(vgs − vds, −vds).
    const id = intrinsicCurrentWithPartials(vtoV, beta, lambda, vgsV - vdsV, -vdsV, out);
    const dg = out[D_VGS];
    const dd = out[D_VDS];
    out[D_VTO] = -out[D_VTO];
    out[D_BETA] = -out[D_BETA];
    out[D_LAMBDA] = -out[D_LAMBDA];
    out[D_VGS] = -dg;
    out[D_VDS] = dg + dd;
    return -id;
  }
  const vov = vgsV - vtoV;
  if (vov <= 0) {
    out[0] = 0;
    out[1] = 0;
    out[2] = 0;
    out[3] = 0;
    out[4] = 0;
    return 0;
  }
  const clm = 1 + lambda * vdsV;
  if (vdsV < vov) {
    const shape = vdsV * (2 * vov - vdsV);
    const dg = 2 * beta * vdsV * clm;
    out[D_VGS] = dg;
    out[D_VTO] = -dg;
    out[D_BETA] = shape * clm;
    out[D_LAMBDA] = beta * shape * vdsV;
    out[D_VDS] = beta * (2 * (vov - vdsV) * clm + shape * lambda);
    return beta * shape * clm;
  }
  const vov2 = vov * vov;
  const dg = 2 * beta * vov * clm;
  out[D_VGS] = dg;
  out[D_VTO] = -dg;
  out[D_BETA] = vov2 * clm;
  out[D_LAMBDA] = beta * vov2 * vdsV;
  out[D_VDS] = beta * vov2 * lambda;
  return beta * vov2 * clm;
}
