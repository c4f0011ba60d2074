/**
 * Dense symmetric positive-definite helpers for the p × p normal matrix (p ≤ 5), row-major
 * Float64Array storage. Pure arithmetic, no allocation beyond the returned arrays.
 */

/** Inverse of the SPD matrix `a` (p × p) by Cholesky; null when not positive definite. */
export function invertSymmetricPositiveDefinite(a: Float64Array, p: number): Float64Array | null {
  const l = new Float64Array(p * p);
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

/** Jᵀ·J (p × p) of a row-major n × p Jacobian. */
export function normalMatrix(jac: Float64Array, n: number, p: number): Float64Array {
  const h = new Float64Array(p * p);
  for (let i = 0; i < n; i++) {
    const base = i * p;
    for (let a = 0; a < p; a++) {
      const ja = jac[base + a];
      for (let b = 0; b <= a; b++) h[a * p + b] += ja * jac[base + b];
    }
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) h[b * p + a] = h[a * p + b];
  return h;
}
