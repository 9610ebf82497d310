/**
 * Analytic marginalisation of the linear parameters for the sampler. An astrometric-only star in
 * the Thiele–Innes form with offsets (and the frame's offset and drift) is exactly linear in
 * A, B, F, G, x0, y0, vx, vy once P, T and e are fixed, so with flat priors on them
 *   p(P, T, e | data) ∝ prior · exp(−χ²_min/2) · det(JᵀJ)^(−1/2)
 * and, given P, T, e, the linear parameters are Gaussian about their least-squares values with
 * covariance (JᵀJ)⁻¹. The ensemble then walks in two or three dimensions, where it mixes quickly,
 * instead of seven or more with curved correlations, which it crosses slowly on a poorly covered arc.
 */
import { CholeskyDecomposition, Matrix, solve } from 'ml-matrix';
import type { SeededRandom } from '../../random.ts';
import type { Problem } from './problem.ts';

const LINEAR_KEYS = new Set([
  'aArcsec',
  'bArcsec',
  'fArcsec',
  'gArcsec',
  'offsetRaMas',
  'offsetDecMas',
  'driftRaMasYr',
  'driftDecMasYr',
]);

export interface Split {
  /** Positions in the free vector x of the linear and of the nonlinear parameters. */
  lin: number[];
  nl: number[];
}

/** The split when the model is exactly linear in its linear block, else null. */
export function linearSplit(problem: Problem, loss: 'gaussian' | 'huber'): Split | null {
  const { L } = problem;
  if (loss !== 'gaussian' || L.stars.length !== 1) return null;
  const star = L.stars[0]!;
  if (star.orientation !== 'thiele-innes' || star.obs.some((m) => m.kind !== 'offsets'))
    return null;
  const lin: number[] = [],
    nl: number[] = [];
  problem.free.forEach((idx, j) => {
    (LINEAR_KEYS.has(L.params[idx]!.key) ? lin : nl).push(j);
  });
  return nl.length > 0 && lin.length > 0 ? { lin, nl } : null;
}

export interface Conditional {
  /** The free vector with the linear block at its least-squares values. */
  x: Float64Array;
  /** χ² at that point, and log det(JᵀJ) of the linear block. */
  chi2: number;
  logDet: number;
  /** Cholesky factor of JᵀJ (linear block), for conditional draws. */
  factor: Matrix;
}

/** The linear block solved exactly for the nonlinear values in `x` (null if it is not determined). */
export function conditional(problem: Problem, split: Split, x: Float64Array): Conditional | null {
  const { r, J } = problem.evaluate(x, true);
  const n = problem.n,
    k = split.lin.length;
  const A = new Matrix(k, k);
  const g = new Array<number>(k).fill(0);
  for (let i = 0; i < r.length; i++) {
    for (let a = 0; a < k; a++) {
      const ja = J![i * n + split.lin[a]!]!;
      if (ja === 0) continue;
      g[a] = g[a]! + ja * r[i]!;
      for (let b = 0; b <= a; b++) A.set(a, b, A.get(a, b) + ja * J![i * n + split.lin[b]!]!);
    }
  }
  for (let a = 0; a < k; a++) for (let b = 0; b < a; b++) A.set(b, a, A.get(a, b));
  const chol = new CholeskyDecomposition(A);
  if (!chol.isPositiveDefinite()) return null;
  const delta = chol.solve(Matrix.columnVector(g.map((v) => -v))).getColumn(0);
  const out = Float64Array.from(x);
  split.lin.forEach((p, a) => {
    out[p] = x[p]! + delta[a]!;
  });
  let chi2 = 0;
  for (const v of r) chi2 += v * v;
  delta.forEach((d, a) => {
    chi2 += g[a]! * d;
  }); // |r + Jδ|² = |r|² + gᵀδ when JᵀJδ = −g
  const factor = chol.lowerTriangularMatrix;
  let logDet = 0;
  for (let a = 0; a < k; a++) logDet += 2 * Math.log(factor.get(a, a));
  return { x: out, chi2: Math.max(chi2, 0), logDet, factor };
}

/** A draw of the linear block from its conditional Gaussian N(x̂, (JᵀJ)⁻¹). */
export function drawLinear(c: Conditional, split: Split, rng: SeededRandom): Float64Array {
  const z = Matrix.columnVector(split.lin.map(() => rng.normal()));
  const y = solve(c.factor.transpose(), z).getColumn(0); // Lᵀy = z  ⇒  cov(y) = (LLᵀ)⁻¹
  const out = Float64Array.from(c.x);
  split.lin.forEach((p, a) => {
    out[p] = c.x[p]! + y[a]!;
  });
  return out;
}
