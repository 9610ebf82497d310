/**
 * Uncertainty of predictions and event dates from an orbit's covariance: linear propagation
 * (σ² = J·C·Jᵀ with a central-difference Jacobian), and Monte Carlo percentiles from seeded draws.
 */
import { CholeskyDecomposition, EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { symmetricMatrix } from '../matrix.ts';
import { ComputationError, InputError } from '../errors.ts';
import { SeededRandom } from '../random.ts';
import { getParameter, withParameter } from './elements.ts';
import type { Covariance, CovarianceParameter, Orbit } from './types.ts';

/** Percentiles reported by Monte Carlo: median, ±1σ and ±2σ equivalents of a normal. */
export const PERCENTILES = [2.5, 16, 50, 84, 97.5] as const;

export interface MonteCarloOptions {
  /** Number of draws, 10 … 100 000. */
  draws: number;
  /** Seed of the random source (any integer): the same seed gives the same answer. */
  seed: number;
}

export function validateMonteCarlo(mc: MonteCarloOptions, field = 'monteCarlo'): MonteCarloOptions {
  if (!Number.isInteger(mc.draws) || mc.draws < 10 || mc.draws > 100_000)
    throw new InputError(`${field}.draws`, mc.draws, 'must be an integer from 10 to 100000');
  if (!Number.isInteger(mc.seed))
    throw new InputError(`${field}.seed`, mc.seed, 'must be an integer');
  return mc;
}

function requireCovariance(orbit: Orbit): Covariance {
  if (!orbit.covariance)
    throw new InputError('orbit.covariance', null, 'is needed for uncertainties');
  return orbit.covariance;
}

/** Difference of two values; for angles in degrees, the shortest way round. */
function diff(a: number, b: number, angle: boolean): number {
  const d = a - b;
  return angle ? ((((d + 180) % 360) + 360) % 360) - 180 : d;
}

/**
 * Linear 1σ of each output of f, which maps an orbit to a fixed-length vector.
 * @param angleOutputs indices of outputs that are angles in degrees (differences wrap at 360°)
 * @returns σ per output (0 where the output does not depend on any uncertain parameter)
 */
export function linearSigma(
  orbit: Orbit,
  f: (o: Orbit) => ArrayLike<number>,
  angleOutputs: ReadonlySet<number> = new Set(),
): Float64Array {
  const cov = requireCovariance(orbit);
  const n = cov.parameters.length;
  const J = parameterJacobian(
    orbit,
    cov.parameters.map((name, j) => ({ name, sigma: Math.sqrt(cov.matrix[j]![j]!) })),
    f,
    angleOutputs,
  );
  const m = J[0]?.length ?? f(orbit).length;
  const out = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = 0;
    for (let a = 0; a < n; a++) {
      const ja = J[a]![i]!;
      if (ja === 0) continue;
      for (let b = 0; b < n; b++) s += ja * cov.matrix[a]![b]! * J[b]![i]!;
    }
    out[i] = Math.sqrt(Math.max(0, s));
  }
  return out;
}

/**
 * Derivatives of each output of f over the given parameters, by differences of step 1e-4 σ
 * (one-sided at a bound: e in [0, 1), sizes positive). J[j][i] = ∂f_i/∂θ_j; a row of zeros where σ is 0.
 */
export function parameterJacobian(
  orbit: Orbit,
  parameters: readonly { name: CovarianceParameter; sigma: number }[],
  f: (o: Orbit) => ArrayLike<number>,
  angleOutputs: ReadonlySet<number> = new Set(),
): Float64Array[] {
  const m = f(orbit).length;
  return parameters.map(({ name, sigma }) => {
    const row = new Float64Array(m);
    if (!(sigma > 0)) return row;
    const x = getParameter(orbit, name);
    const h0 = 1e-4 * sigma;
    // Keep e inside [0, 1) and sizes positive: step one-sided near a bound.
    let lo = x - h0,
      hi = x + h0;
    if (name === 'eccentricity' || name === 'lightFraction') {
      if (lo < 0) lo = x;
      if (hi >= 1) hi = x;
    }
    if (
      (name === 'periodYears' ||
        name === 'semiMajorAxisArcsec' ||
        name === 'distancePc' ||
        name === 'massRatio') &&
      lo <= 0
    )
      lo = x;
    const h = hi - lo;
    if (h === 0) return row;
    const fp = f(withParameter(orbit, name, hi));
    const fm = f(withParameter(orbit, name, lo));
    for (let i = 0; i < m; i++) row[i] = diff(fp[i]!, fm[i]!, angleOutputs.has(i)) / h;
    return row;
  });
}

/** A lower-triangular L with L·Lᵀ = C; for a singular C, from its eigen-decomposition. */
function covarianceRoot(cov: Covariance): Matrix {
  const C = symmetricMatrix(cov.matrix);
  const chol = new CholeskyDecomposition(C);
  if (chol.isPositiveDefinite()) return chol.lowerTriangularMatrix;
  const eig = new EigenvalueDecomposition(C, { assumeSymmetric: true });
  const values = eig.realEigenvalues;
  const scale = Math.max(...values.map(Math.abs));
  values.forEach((v, k) => {
    if (v < -1e-10 * scale)
      throw new InputError(
        'orbit.covariance.matrix',
        cov.matrix,
        `is not positive semi-definite (eigenvalue ${v.toPrecision(3)})`,
      );
    void k;
  });
  const V = eig.eigenvectorMatrix;
  const D = Matrix.diag(values.map((v) => Math.sqrt(Math.max(0, v))));
  return V.mmul(D);
}

/**
 * Seeded draws of the orbit from N(elements, covariance). Draws outside the physical domain
 * (e outside [0, 1), P, a or d ≤ 0) are redrawn: the distribution is truncated there.
 */
export function drawOrbits(orbit: Orbit, mc: MonteCarloOptions): Orbit[] {
  const cov = requireCovariance(orbit);
  const L = covarianceRoot(cov);
  const n = cov.parameters.length;
  const rng = new SeededRandom(mc.seed);
  const base = cov.parameters.map((p) => getParameter(orbit, p));
  const out: Orbit[] = [];
  let attempts = 0;
  while (out.length < mc.draws) {
    if (++attempts > mc.draws * 20)
      throw new ComputationError(
        'the covariance puts most draws outside bound orbits (e ≥ 1 or sizes ≤ 0)',
      );
    const z = Array.from({ length: n }, () => rng.normal());
    let o = orbit;
    let ok = true;
    for (let r = 0; r < n; r++) {
      let v = base[r]!;
      for (let c = 0; c < n; c++) v += L.get(r, c) * z[c]!;
      if (!inDomain(cov.parameters[r]!, v)) {
        ok = false;
        break;
      }
      o = withParameter(o, cov.parameters[r]!, v);
    }
    if (ok) out.push(o);
  }
  return out;
}

function inDomain(name: CovarianceParameter, v: number): boolean {
  if (name === 'eccentricity') return v >= 0 && v < 1;
  if (name === 'lightFraction') return v >= 0 && v <= 1;
  if (name === 'massRatio') return v >= 0;
  if (name === 'periodYears' || name === 'semiMajorAxisArcsec' || name === 'distancePc')
    return v > 0;
  return true;
}

/** Percentiles (linear interpolation between order statistics) of a sample. */
export function percentiles(
  sample: ArrayLike<number>,
  ps: readonly number[] = PERCENTILES,
): number[] {
  const s = Float64Array.from(sample).sort();
  return ps.map((p) => {
    const x = (p / 100) * (s.length - 1);
    const i = Math.floor(x);
    const f = x - i;
    return i + 1 < s.length ? s[i]! * (1 - f) + s[i + 1]! * f : s[i]!;
  });
}

/** Percentiles of angles (deg) unwrapped around a reference angle, returned in [0, 360). */
export function anglePercentiles(
  sample: ArrayLike<number>,
  referenceDeg: number,
  ps: readonly number[] = PERCENTILES,
): number[] {
  const u = Float64Array.from(sample, (a) => referenceDeg + diff(a, referenceDeg, true));
  return percentiles(u, ps).map((a) => ((a % 360) + 360) % 360);
}
