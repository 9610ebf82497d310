/**
 * A fit as a least-squares problem: the free parameters, the priors, and residuals whitened by the
 * measurement uncertainties (with the Δα* and Δδ correlation taken out by a 2×2 Cholesky factor).
 */
import { TWO_PI } from '../../constants.ts';
import type { LeastSquares } from './lm.ts';
import type { Layout } from './layout.ts';
import { evaluateModel, stepFor } from './model.ts';

export interface Prior {
  index: number;
  /** Mean and σ in internal units. */
  mean: number;
  sigma: number;
}

export interface Problem extends LeastSquares {
  L: Layout;
  /** Indices (into L.params) of the free parameters, in the order of x. */
  free: number[];
  priors: Prior[];
  /** The whole vector with the fixed values; x fills in the free ones. */
  base: Float64Array;
  full(x: ArrayLike<number>): Float64Array;
  /** Residual rows: measurement components, then one per prior. */
  rows: number;
}

/** Whitened (model − observed)/σ for each component at the full vector theta, with ∂/∂(free) when asked. */
export function whiten(
  L: Layout,
  theta: Float64Array,
  free: number[],
  priors: Prior[],
  withJ: boolean,
): { r: Float64Array; J: Float64Array | null } {
  const { values, deriv } = evaluateModel(L, theta, withJ);
  const nf = free.length,
    np = L.params.length;
  const rows = L.components + priors.length;
  const r = new Float64Array(rows);
  const J = withJ ? new Float64Array(rows * nf) : null;
  const pick = (c: number, j: number) => deriv![c * np + free[j]!]!;
  for (const star of L.stars) {
    let c = star.firstComponent;
    for (const m of star.obs) {
      if (m.kind === 'radial-velocity') {
        r[c] = (values[c]! - m.value[0]) / m.sigma[0];
        if (J) for (let j = 0; j < nf; j++) J[c * nf + j] = pick(c, j) / m.sigma[0];
        c += 1;
        continue;
      }
      let d0 = values[c]! - m.value[0],
        d1 = values[c + 1]! - m.value[1];
      if (m.kind === 'separation') d1 = d1 - TWO_PI * Math.round(d1 / TWO_PI);
      const [s0, s1] = m.sigma;
      const rho = m.rho,
        k = 1 / Math.sqrt(1 - rho * rho);
      r[c] = d0 / s0;
      r[c + 1] = (d1 / s1 - (rho * d0) / s0) * k;
      if (J) {
        for (let j = 0; j < nf; j++) {
          const g0 = pick(c, j) / s0,
            g1 = pick(c + 1, j) / s1;
          J[c * nf + j] = g0;
          J[(c + 1) * nf + j] = (g1 - rho * g0) * k;
        }
      }
      c += 2;
    }
  }
  priors.forEach((p, q) => {
    const row = L.components + q;
    r[row] = (theta[p.index]! - p.mean) / p.sigma;
    const j = free.indexOf(p.index);
    if (J && j >= 0) J[row * nf + j] = 1 / p.sigma;
  });
  return { r, J };
}

/** Bounds of the parameter domain, checked on the full vector. */
export function inDomain(L: Layout, theta: ArrayLike<number>): boolean {
  for (let j = 0; j < L.params.length; j++) {
    const key = L.params[j]!.key,
      v = theta[j]!;
    if (!Number.isFinite(v)) return false;
    if (key === 'eccentricity' && !(v >= 0 && v < 0.999)) return false;
    if (key === 'lightFraction' && !(v >= 0 && v <= 1)) return false;
    if (
      (key === 'periodYears' ||
        key === 'semiMajorAxisArcsec' ||
        key === 'distancePc' ||
        key === 'massSolar' ||
        key === 'massRatio') &&
      !(v > 0)
    )
      return false;
  }
  return true;
}

/** Canonical angles: 0 ≤ i ≤ π (i ↦ −i or 2π − i with Ω, ω + π leaves the orbit unchanged). */
export function canonicalize(L: Layout, theta: Float64Array): void {
  for (const s of L.stars) {
    const { i, node, arg } = s.slots;
    if (i < 0) continue;
    let inc = theta[i]! % TWO_PI;
    if (inc < 0) inc += TWO_PI;
    if (inc > Math.PI) {
      inc = TWO_PI - inc;
      theta[node] = theta[node]! + Math.PI;
      theta[arg] = theta[arg]! + Math.PI;
    }
    theta[i] = inc;
  }
}

export function makeProblem(
  L: Layout,
  base: Float64Array,
  free: number[],
  priors: Prior[],
): Problem {
  const full = (x: ArrayLike<number>) => {
    const t = Float64Array.from(base);
    free.forEach((idx, j) => {
      t[idx] = x[j]!;
    });
    return t;
  };
  return {
    L,
    free,
    priors,
    base,
    full,
    n: free.length,
    rows: L.components + priors.length,
    evaluate: (x, withJ) => whiten(L, full(x), free, priors, withJ),
    feasible: (x) => inDomain(L, full(x)),
    normalize: (x) => {
      const t = full(x);
      canonicalize(L, t);
      free.forEach((idx, j) => {
        x[j] = t[idx]!;
      });
    },
  };
}

/**
 * The same problem with every derivative taken by central differences (the benchmark's baseline and
 * the tests' check).
 */
export function finiteDifferenceProblem(p: Problem): Problem {
  return {
    ...p,
    evaluate: (x, withJ) => {
      const base = p.evaluate(x, false);
      if (!withJ) return base;
      const rows = base.r.length,
        n = p.n;
      const J = new Float64Array(rows * n);
      for (let j = 0; j < n; j++) {
        const h = stepFor(p.L, p.full(x), p.free[j]!);
        const xp = Float64Array.from(x),
          xm = Float64Array.from(x);
        xp[j] = x[j]! + h;
        xm[j] = x[j]! - h;
        const rp = p.evaluate(xp, false).r,
          rm = p.evaluate(xm, false).r;
        for (let i = 0; i < rows; i++) J[i * n + j] = (rp[i]! - rm[i]!) / (2 * h);
      }
      return { r: base.r, J };
    },
  };
}
