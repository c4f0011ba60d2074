/**
 * Dense symmetric positive-definite helpers for the p × p normal matrix (p ≤ 5), row-major
 * Float64Array storage. Pure arithmetic, no allocation beyond the returned arrays.
 */

/**
 * Lower-triangular L with L·Lᵀ = a (p × p, SPD) by Cholesky, written into `l` (p × p or
 * larger); null when not positive definite.
 */
export function choleskyFactor(a: Float64Array, p: number, l: Float64Array = new Float64Array(p * p)): Float64Array | null {
  l.fill(0, 0, p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * p + j];
      for (let k = 0; k < j; k++) s -= l[i * p + k] * l[j * p + k];
      if (i === j) {
        if (!(s > 0)) return null;
        l[i * p + i] = Math.sqrt(s);
      } else {
        l[i * p + j] = s / l[j * p + j];
      }
    }
  }
  return l;
}

/** Inverse of the SPD matrix `a` (p × p) by Cholesky; null when not positive definite. */
export function invertSymmetricPositiveDefinite(a: Float64Array, p: number): Float64Array | null {
  const l = choleskyFactor(a, p);
  if (!l) return null;
  // inv(L) column by column, then inv(A) = inv(L)ᵀ·inv(L).
  const li = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    li[j * p + j] = 1 / l[j * p + j];
    for (let i = j + 1; i < p; i++) {
      let s = 0;
      for (let k = j; k < i; k++) s -= l[i * p + k] * li[k * p + j];
      li[i * p + j] = s / l[i * p + i];
    }
  }
  const inv = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = i; k < p; k++) s += li[k * p + i] * li[k * p + j];
      inv[i * p + j] = s;
      inv[j * p + i] = s;
    }
  }
  return inv;
}
