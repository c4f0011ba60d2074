import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { invertSymmetricPositiveDefinite, normalMatrix } from './small-matrix.ts';

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
 */
export function solveLeastSquares(
  problem: LeastSquaresProblem,
  options: LeastSquaresOptions = {},
): LeastSquaresSolution {
  const { pointCount: n, paramCount: p, y } = problem;
  const maxIterations = options.maxIterations ?? 60;
  const f = new Float64Array(n);
  const jac = new Float64Array(n * p);
  const cachedU = new Float64Array(p).fill(NaN);
  const row: number[] = new Array(p).fill(0);

  const ensure = (u: ArrayLike<number>) => {
    let same = true;
    for (let k = 0; k < p; k++) {
      if (cachedU[k] !== u[k]) {
        same = false;
        break;
      }
    }
    if (same) return;
    problem.evaluate(u, f, jac);
    for (let k = 0; k < p; k++) cachedU[k] = u[k];
  };
  // Parameters held on a bound (the gradient pushes them outward) are taken out of the
  // library's problem: clipping a coupled step would otherwise stall the others.
  let free = Array.from({ length: p }, (_, k) => k);
  const full = new Float64Array(p);
  const expand = (reduced: ArrayLike<number>) => {
    for (let a = 0; a < free.length; a++) full[free[a]] = reduced[a];
    return full;
  };
  const model = (reduced: number[]) => {
    ensure(expand(reduced));
    return (x: number) => f[x];
  };
  const jacobian = (reduced: number[]) => {
    ensure(expand(reduced));
    const q = free.length;
    row.length = q;
    return (x: number) => {
      const base = x * p;
      for (let a = 0; a < q; a++) row[a] = jac[base + free[a]];
      return row;
    };
  };
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = i;
  const data = { x, y };

  let u = problem.initial.slice();
  let sse = sumOfSquares(u);
  let damping = 1e-3;
  let iterations = 0;
  // At least one library call: starting values are never the optimum.
  let check = { predictedDecrease: Infinity, atBound: new Array<boolean>(p).fill(false) };
  let converged = false;
  while (!converged && iterations < maxIterations) {
    free = check.atBound.flatMap((b, k) => (b ? [] : [k]));
    for (let k = 0; k < p; k++) full[k] = u[k];
    const r = levenbergMarquardt(data, model, {
      initialValues: free.map((k) => u[k]),
      damping,
      maxIterations: Math.min(ITERATIONS_PER_CALL, maxIterations - iterations),
      errorTolerance: 0,
      minValues: free.map((k) => problem.min[k]),
      maxValues: free.map((k) => problem.max[k]),
      jacobianFunction: jacobian,
    });
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
  return {
    u,
    sse,
    iterations,
    converged,
    atBound: check.atBound,
    normalInverse: invertSymmetricPositiveDefinite(normalMatrix(jac, n, p), p),
  };

  function sumOfSquares(v: number[]): number {
    ensure(v);
    let s = 0;
    for (let i = 0; i < n; i++) s += (y[i] - f[i]) ** 2;
    return s;
  }

  /** Gauss–Newton predicted SSE decrease over the parameters that are free to move. */
  function gaussNewtonCheck(v: number[]) {
    ensure(v);
    const g = new Float64Array(p);
    for (let i = 0, b = 0; i < n; i++, b += p) {
      const r = y[i] - f[i];
      for (let k = 0; k < p; k++) g[k] += jac[b + k] * r;
    }
    const atBound: boolean[] = new Array(p);
    const free: number[] = [];
    for (let k = 0; k < p; k++) {
      const span = 1e-9 * (1 + Math.abs(v[k]));
      atBound[k] = (v[k] <= problem.min[k] + span && g[k] < 0) || (v[k] >= problem.max[k] - span && g[k] > 0);
      if (!atBound[k]) free.push(k);
    }
    const q = free.length;
    if (q === 0) return { predictedDecrease: 0, atBound };
    const h = normalMatrix(jac, n, p);
    const hFree = new Float64Array(q * q);
    for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) hFree[a * q + b] = h[free[a] * p + free[b]];
    const inv = invertSymmetricPositiveDefinite(hFree, q);
    if (!inv) return { predictedDecrease: Infinity, atBound };
    let predictedDecrease = 0;
    for (let a = 0; a < q; a++) {
      for (let b = 0; b < q; b++) predictedDecrease += g[free[a]] * inv[a * q + b] * g[free[b]];
    }
    return { predictedDecrease, atBound };
  }
}
