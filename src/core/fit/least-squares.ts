import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { choleskyFactor, invertSymmetricPositiveDefinite } from './small-matrix.ts';

/** A scaled least-squares problem: minimise Σ (y − f(u))² over u within [min, max]. */
export interface LeastSquaresProblem {
  pointCount: number;
  paramCount: number;
  y: Float64Array;
  /** Fills f (n values) and the row-major n × p Jacobian ∂f/∂u at u. */
  evaluate(u: ArrayLike<number>, f: Float64Array, jac: Float64Array): void;
  initial: number[];
  min: number[];
  max: number[];
}

export interface LeastSquaresSolution {
  u: number[];
  sse: number;
  iterations: number;
  converged: boolean;
  /** Per parameter: true when it ended on a bound and the gradient pushes it outward. */
  atBound: boolean[];
  /** (JᵀJ)⁻¹ at the solution, row-major p × p; null when singular. */
  normalInverse: Float64Array | null;
}

export interface LeastSquaresOptions {
  maxIterations?: number;
  /** 'compressed' (default): q + 1 rows with the full problem's normal equations; 'full': all n rows. */
  rows?: 'compressed' | 'full';
}

/** Library iterations per call; our own convergence test runs between calls. */
const ITERATIONS_PER_CALL = 2;
/**
 * Stop when the Gauss–Newton step would lower the SSE by less than this share of it: the
 * remaining parameter error is then below 1e-5·sqrt(n − p) standard errors (derived).
 */
const PREDICTED_DECREASE_TOLERANCE = 1e-10;

/**
 * Levenberg–Marquardt by `ml-levenberg-marquardt` with the analytic Jacobian from
 * `problem.evaluate`. That library stops only at an absolute SSE (errorTolerance) or at
 * maxIterations, so it is called a few iterations at a time and stopped here when the
 * Gauss–Newton predicted decrease (bound-active parameters held) is negligible.
 *
 * The library is handed the problem in compressed form: q + 1 rows (q free parameters) whose
 * normal matrix, gradient and sum of squares equal those of the full n rows at every point it
 * asks for — Jacobian rows R with RᵀR = JᵀJ (Cholesky), values c with Rᵀc = Jᵀr, and a last
 * row carrying the rest of the SSE. Its damped steps, bound clipping and step acceptance
 * depend on nothing else, so its iterates are those of the full problem (to rounding), while
 * its own per-iteration work, which allocates per row, no longer grows with n. Where JᵀJ is
 * singular the call is made again with the full rows.
 */
export function solveLeastSquares(
  problem: LeastSquaresProblem,
  options: LeastSquaresOptions = {},
): LeastSquaresSolution {
  const { pointCount: n, paramCount: p, y } = problem;
  const maxIterations = options.maxIterations ?? 60;
  const f = new Float64Array(n);
  const jac = new Float64Array(n * p);
  const residual = new Float64Array(n);
  // Normal equations at the evaluated point: JᵀJ (p × p), Jᵀr and the SSE, one pass per point.
  const h = new Float64Array(p * p);
  const g = new Float64Array(p);
  let sseHere = NaN;
  const evaluatedAt = new Float64Array(p).fill(NaN);

  const ensure = (u: ArrayLike<number>) => {
    if (sameValues(evaluatedAt, u, p)) return;
    problem.evaluate(u, f, jac);
    let sse = 0;
    for (let i = 0; i < n; i++) {
      const r = y[i] - f[i];
      residual[i] = r;
      sse += r * r;
    }
    // Column by column: long inner loops over the rows run fastest.
    for (let a = 0; a < p; a++) {
      let ga = 0;
      for (let i = 0, ia = a; i < n; i++, ia += p) ga += jac[ia] * residual[i];
      g[a] = ga;
      for (let b = 0; b <= a; b++) {
        let hab = 0;
        for (let i = 0, ia = a, ib = b; i < n; i++, ia += p, ib += p) hab += jac[ia] * jac[ib];
        h[a * p + b] = hab;
        h[b * p + a] = hab;
      }
    }
    sseHere = sse;
    for (let k = 0; k < p; k++) evaluatedAt[k] = u[k];
  };

  // Parameters held on a bound (the gradient pushes them outward) are taken out of the
  // library's problem: clipping a coupled step would otherwise stall the others.
  let free = Array.from({ length: p }, (_, k) => k);
  const full = new Float64Array(p);
  const expand = (reduced: ArrayLike<number>) => {
    for (let a = 0; a < free.length; a++) full[free[a]] = reduced[a];
    return full;
  };

  // The full hand-off: every data row.
  const row: number[] = new Array(p).fill(0);
  const fullModel = (reduced: number[]) => {
    ensure(expand(reduced));
    return (x: number) => f[x];
  };
  const fullJacobian = (reduced: number[]) => {
    ensure(expand(reduced));
    const q = free.length;
    row.length = q;
    return (x: number) => {
      const base = x * p;
      for (let a = 0; a < q; a++) row[a] = jac[base + free[a]];
      return row;
    };
  };
  const fullData = { x: Float64Array.from({ length: n }, (_, i) => i), y };

  // The compressed hand-off (see above), rebuilt when the library asks at another point.
  const compressedValues = new Float64Array(p + 1);
  const compressedRows: number[][] = Array.from({ length: p + 1 }, () => new Array<number>(p).fill(0));
  const compressedAt = new Float64Array(p).fill(NaN);
  const hFree = new Float64Array(p * p);
  const lFree = new Float64Array(p * p);
  let compressionFailed = false;
  const compress = (reduced: number[]) => {
    const q = free.length;
    if (sameValues(compressedAt, reduced, q)) return;
    ensure(expand(reduced));
    for (let a = 0; a < q; a++) compressedAt[a] = reduced[a];
    const l = choleskyFactor(freeBlock(h, p, free, hFree), q, lFree);
    for (const r of compressedRows) {
      r.length = q;
      r.fill(0);
    }
    if (!l) {
      // Right SSE, no slope: the call is repeated with the full rows.
      compressionFailed = true;
      compressedValues.fill(0);
      compressedValues[q] = -Math.sqrt(sseHere);
      return;
    }
    // R = Lᵀ; c solves L·c = Jᵀr (that is Rᵀ·c = Jᵀr). The library's residual is
    // y − value with y = 0, so each value is −c.
    let explained = 0;
    for (let a = 0; a < q; a++) {
      let v = g[free[a]];
      for (let b = 0; b < a; b++) v += l[a * q + b] * compressedValues[b];
      const c = v / l[a * q + a];
      explained += c * c;
      compressedValues[a] = -c;
      for (let b = a; b < q; b++) compressedRows[a][b] = l[b * q + a];
    }
    compressedValues[q] = -Math.sqrt(Math.max(sseHere - explained, 0));
  };
  const compressedModel = (reduced: number[]) => {
    compress(reduced);
    return (x: number) => compressedValues[x];
  };
  const compressedJacobian = (reduced: number[]) => {
    compress(reduced);
    return (x: number) => compressedRows[x];
  };

  let u = problem.initial.slice();
  ensure(u);
  let sse = sseHere;
  let damping = 1e-3;
  let iterations = 0;
  // At least one library call: starting values are never the optimum.
  let check = { predictedDecrease: Infinity, atBound: new Array<boolean>(p).fill(false) };
  let converged = false;
  while (!converged && iterations < maxIterations) {
    free = check.atBound.flatMap((b, k) => (b ? [] : [k]));
    for (let k = 0; k < p; k++) full[k] = u[k];
    const q = free.length;
    const callOptions = {
      initialValues: free.map((k) => u[k]),
      damping,
      maxIterations: Math.min(ITERATIONS_PER_CALL, maxIterations - iterations),
      errorTolerance: 0,
      minValues: free.map((k) => problem.min[k]),
      maxValues: free.map((k) => problem.max[k]),
    };
    let r: ReturnType<typeof levenbergMarquardt> | null = null;
    if (options.rows !== 'full') {
      compressionFailed = false;
      compressedAt.fill(NaN);
      const data = { x: Float64Array.from({ length: q + 1 }, (_, i) => i), y: new Float64Array(q + 1) };
      r = levenbergMarquardt(data, compressedModel, { ...callOptions, jacobianFunction: compressedJacobian });
      if (compressionFailed) r = null;
    }
    r ??= levenbergMarquardt(fullData, fullModel, { ...callOptions, jacobianFunction: fullJacobian });
    iterations += r.iterations;
    if (r.parameterError < sse) {
      u = Array.from(expand(r.parameterValues));
      sse = r.parameterError;
      damping = Math.max(damping / 10, 1e-6);
    } else {
      damping = Math.min(damping * 1000, 1e7);
    }
    check = gaussNewtonCheck(u);
    converged = check.predictedDecrease <= PREDICTED_DECREASE_TOLERANCE * sse + n * 1e-28;
  }
  ensure(u);
  return { u, sse, iterations, converged, atBound: check.atBound, normalInverse: invertSymmetricPositiveDefinite(h, p) };

  /** Gauss–Newton predicted SSE decrease over the parameters that are free to move. */
  function gaussNewtonCheck(v: number[]) {
    ensure(v);
    const atBound: boolean[] = new Array(p);
    const free: number[] = [];
    for (let k = 0; k < p; k++) {
      const span = 1e-9 * (1 + Math.abs(v[k]));
      atBound[k] = (v[k] <= problem.min[k] + span && g[k] < 0) || (v[k] >= problem.max[k] - span && g[k] > 0);
      if (!atBound[k]) free.push(k);
    }
    const q = free.length;
    if (q === 0) return { predictedDecrease: 0, atBound };
    const inv = invertSymmetricPositiveDefinite(freeBlock(h, p, free, new Float64Array(q * q)), q);
    if (!inv) return { predictedDecrease: Infinity, atBound };
    let predictedDecrease = 0;
    for (let a = 0; a < q; a++) {
      for (let b = 0; b < q; b++) predictedDecrease += g[free[a]] * inv[a * q + b] * g[free[b]];
    }
    return { predictedDecrease, atBound };
  }
}

/** Whether the first `count` entries of a and b are identical. */
function sameValues(a: ArrayLike<number>, b: ArrayLike<number>, count: number): boolean {
  for (let k = 0; k < count; k++) if (a[k] !== b[k]) return false;
  return true;
}

/** The rows and columns `free` of the p × p matrix `h`, written into `out` as a q × q matrix. */
function freeBlock(h: Float64Array, p: number, free: readonly number[], out: Float64Array): Float64Array {
  const q = free.length;
  for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) out[a * q + b] = h[free[a] * p + free[b]];
  return out;
}
