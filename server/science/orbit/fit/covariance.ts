/**
 * The covariance of the free parameters, (JᵀJ)⁻¹ at the minimum, and the refusal when it does not
 * exist. The normal matrix is first scaled to unit diagonal so that its condition number speaks of
 * the data, not of the units; ml-matrix's singular value decomposition then both inverts it and,
 * when it is singular, names the parameters that the data leave undetermined (the large entries
 * of the singular vector of the smallest singular value).
 */
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { FitRefusal } from './refusal.ts';

/** Beyond this condition number of the scaled normal matrix the fit is refused. */
export const MAX_CONDITION = 1e12;

/**
 * @param J whitened Jacobian, rows × n, row-major
 * @param weights per-row weights (Huber), or null
 * @param names parameter names, for the refusal
 * @returns n×n covariance in the units of the parameters
 * @throws FitRefusal (singular) naming the parameters without constraint
 */
export function covarianceFromJacobian(
  J: Float64Array,
  rows: number,
  n: number,
  weights: Float64Array | null,
  names: string[],
): number[][] {
  const N = new Float64Array(n * n);
  for (let i = 0; i < rows; i++) {
    const w = weights ? weights[i]! : 1;
    for (let a = 0; a < n; a++) {
      const ja = J[i * n + a]! * w;
      if (ja === 0) continue;
      for (let b = a; b < n; b++) N[a * n + b] = N[a * n + b]! + ja * J[i * n + b]!;
    }
  }
  const scale = new Float64Array(n);
  for (let a = 0; a < n; a++) {
    const d = N[a * n + a]!;
    if (!(d > 0)) {
      throw new FitRefusal(
        'singular',
        `the data do not constrain ${names[a]}: no measurement depends on it (fix it or give it a prior)`,
        [names[a]!],
      );
    }
    scale[a] = 1 / Math.sqrt(d);
  }
  const S = new Matrix(n, n);
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      const v = N[a * n + b]! * scale[a]! * scale[b]!;
      S.set(a, b, v);
      S.set(b, a, v);
    }
  }
  const svd = new SingularValueDecomposition(S, { autoTranspose: true });
  const sv = svd.diagonal;
  const smax = sv[0]!,
    smin = sv[sv.length - 1]!;
  if (!(smin > smax / MAX_CONDITION)) {
    const v = svd.rightSingularVectors.getColumn(sv.length - 1);
    const involved = v
      .map((x, a) => [Math.abs(x), a] as const)
      .filter(([x]) => x > 0.25)
      .sort((p, q) => q[0] - p[0])
      .map(([, a]) => names[a]!);
    throw new FitRefusal(
      'singular',
      `singular normal matrix (condition ${(smax / Math.max(smin, 1e-300)).toExponential(1)}): ` +
        `the data cannot separate ${involved.join(', ')}; add measurements that tell them apart, ` +
        `fix one, or give a prior`,
      involved,
    );
  }
  const inv = svd.inverse();
  // Symmetrised exactly (the SVD inverse is symmetric only to rounding; Cholesky downstream checks).
  const C: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let a = 0; a < n; a++) {
    for (let b = a; b < n; b++) {
      const v = 0.5 * (inv.get(a, b) + inv.get(b, a)) * scale[a]! * scale[b]!;
      C[a]![b] = v;
      C[b]![a] = v;
    }
  }
  return C;
}

/** Propagate: σ² = gᵀ C g for a gradient g over the same parameters. */
export function propagate(C: number[][], g: ArrayLike<number>): number {
  let s = 0;
  for (let a = 0; a < C.length; a++) {
    const ga = g[a]!;
    if (ga === 0) continue;
    const row = C[a]!;
    for (let b = 0; b < C.length; b++) s += ga * row[b]! * g[b]!;
  }
  return Math.max(s, 0);
}
