/**
 * Levenberg–Marquardt for weighted least squares (Marquardt 1963, with his scaling of the damping
 * by the diagonal of JᵀJ), optionally with Huber's loss (Huber 1964) by iteratively reweighted rows.
 * The damped normal equations are solved by ml-matrix's Cholesky decomposition: a maintained,
 * tested decomposition rather than hand code, and the one the covariance step shares.
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';

export interface LeastSquares {
  /** Number of free parameters. */
  n: number;
  /**
   * Whitened residuals r (model − observed)/σ at x and, when asked, their Jacobian ∂r/∂x
   * (row-major, rows × n).
   */
  evaluate(x: Float64Array, withJacobian: boolean): { r: Float64Array; J: Float64Array | null };
  /** Whether x is inside the parameter domain (e.g. 0 ≤ e < 1, P > 0). */
  feasible?(x: Float64Array): boolean;
  /** Map x to its canonical form after an accepted step (e.g. i < 0 → −i with Ω, ω + 180°). */
  normalize?(x: Float64Array): void;
}

export interface LmOptions {
  maxIterations?: number;
  /** Stop when the relative decrease of the cost falls below this. Default 1e-10. */
  tolerance?: number;
  /** …or its absolute decrease below this (χ² units: 1e-4 moves a parameter by ~0.01σ). Default 1e-4. */
  absoluteTolerance?: number;
  loss?: 'gaussian' | 'huber';
  /** Huber threshold in σ. Default 2. */
  huberK?: number;
}

export interface LmResult {
  x: Float64Array;
  /** Σ r² (plain χ², whatever the loss). */
  chi2: number;
  /** The minimised cost: χ² for the Gaussian loss, 2 Σ ρ_Huber(r) for Huber. */
  cost: number;
  iterations: number;
  converged: boolean;
  /** Row weights of the final iteration (1 for the Gaussian loss). */
  weights: Float64Array;
}

/** The cost LM minimises: Σ r² (Gaussian), or 2 Σ ρ_Huber(r) with threshold k (Huber). */
export function costOf(r: Float64Array, loss: 'gaussian' | 'huber', k = 2): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) {
    const a = Math.abs(r[i]!);
    s += loss === 'huber' && a > k ? 2 * k * a - k * k : a * a;
  }
  return s;
}

/** Iteratively reweighted rows: 1 for the Gaussian loss, min(1, k/|r|) for Huber's. */
function rowWeights(
  r: Float64Array,
  loss: LmOptions['loss'],
  k: number,
): Float64Array<ArrayBuffer> {
  const weights = new Float64Array(r.length);
  for (let i = 0; i < r.length; i++)
    weights[i] = loss === 'huber' && Math.abs(r[i]!) > k ? k / Math.abs(r[i]!) : 1;
  return weights;
}

/** JᵀWJ (upper triangle, row-major n×n) and JᵀWr into `JtJ` and `g`, skipping zero entries of J. */
function normalEquations(
  r: Float64Array,
  J: Float64Array,
  weights: Float64Array,
  n: number,
  JtJ: Float64Array,
  g: Float64Array,
): void {
  JtJ.fill(0);
  g.fill(0);
  for (let i = 0; i < r.length; i++) {
    const w = weights[i]!,
      ri = r[i]!,
      base = i * n;
    for (let a = 0; a < n; a++) {
      const ja = J[base + a]! * w;
      if (ja === 0) continue;
      g[a] = g[a]! + ja * ri;
      for (let b = a; b < n; b++) JtJ[a * n + b] = JtJ[a * n + b]! + ja * J[base + b]!;
    }
  }
}

export function levenbergMarquardt(
  problem: LeastSquares,
  start: Float64Array,
  options: LmOptions = {},
): LmResult {
  const maxIter = options.maxIterations ?? 200;
  const tol = options.tolerance ?? 1e-10;
  const absTol = options.absoluteTolerance ?? 1e-4;
  const loss = options.loss ?? 'gaussian';
  const k = options.huberK ?? 2;
  const n = problem.n;
  let x = Float64Array.from(start);
  problem.normalize?.(x);
  let ev = problem.evaluate(x, true);
  let cost = costOf(ev.r, loss, k);
  let lambda = 1e-3;
  let converged = false;
  let iter = 0;
  let weights = new Float64Array(ev.r.length).fill(1);
  const JtJ = new Float64Array(n * n),
    g = new Float64Array(n);
  for (; iter < maxIter && !converged; iter++) {
    // 1. Row weights (Huber: k/|r| beyond k), then the weighted normal equations JᵀWJ and JᵀWr.
    weights = rowWeights(ev.r, loss, k);
    normalEquations(ev.r, ev.J!, weights, n, JtJ, g);
    // 2. Damped steps (Marquardt's diagonal scaling) until one lowers the cost: λ down on success.
    let maxDiag = 0;
    for (let a = 0; a < n; a++) maxDiag = Math.max(maxDiag, JtJ[a * n + a]!);
    let accepted = false;
    for (let tries = 0; tries < 30 && !accepted; tries++) {
      const A = new Matrix(n, n);
      for (let a = 0; a < n; a++) {
        for (let b = a; b < n; b++) {
          A.set(a, b, JtJ[a * n + b]!);
          A.set(b, a, JtJ[a * n + b]!);
        }
        A.set(a, a, JtJ[a * n + a]! + lambda * Math.max(JtJ[a * n + a]!, 1e-12 * maxDiag, 1e-300));
      }
      const chol = new CholeskyDecomposition(A);
      if (!chol.isPositiveDefinite()) {
        lambda *= 10;
        continue;
      }
      const step = chol.solve(Matrix.columnVector(Array.from(g, (v) => -v)));
      const trial = Float64Array.from(x, (v, a) => v + step.get(a, 0));
      if (problem.feasible && !problem.feasible(trial)) {
        lambda *= 4;
        continue;
      }
      problem.normalize?.(trial);
      const trialCost = costOf(problem.evaluate(trial, false).r, loss, k);
      if (Number.isFinite(trialCost) && trialCost <= cost) {
        const drop = cost - trialCost;
        x = trial;
        ev = problem.evaluate(trial, true);
        converged = drop <= tol * Math.max(cost, 1e-30) || drop <= absTol;
        cost = trialCost;
        lambda = Math.max(lambda / 3, 1e-12);
        accepted = true;
      } else {
        lambda *= 4;
      }
    }
    if (!accepted) converged = true; // no step lowers the cost: a minimum to working precision
  }
  let chi2 = 0;
  for (const v of ev.r) chi2 += v * v;
  return { x, chi2, cost, iterations: iter, converged, weights };
}
