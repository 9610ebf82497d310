/**
 * Posterior sampling of a fit. Priors: P log-uniform inside the period range that was searched
 * (the hints, or the default range), T uniform within half a period of the fitted passage (one
 * passage, not its copies a period away), e uniform in [0, 0.999), every other parameter flat inside
 * its domain, plus the Gaussian priors of the request. Without the bounds on P a poorly covered arc
 * leaves the posterior improper (ever longer periods fit an arc about as well). Likelihood from the
 * same whitened residuals as the fit. Walkers start in a ball of the covariance around the minimum.
 * Percentiles go onto every parameter and every reported quantity, the next periapsis included
 * (counted per sample from the sample's own P and T).
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { SeededRandom } from '../../random.ts';
import { PERCENTILES, percentiles } from '../uncertainty.ts';
import { inDomain } from './problem.ts';
import { nextCycle, quantityNames, starQuantities } from './quantities.ts';
import type { CheckedRequest } from './request.ts';
import { asOfJdOf, type FitResult } from './result.ts';
import { ensembleSample } from './sampler.ts';
import type { Solution } from './solve.ts';

function cost(r: Float64Array, loss: 'gaussian' | 'huber'): number {
  let s = 0;
  for (const v of r) {
    const a = Math.abs(v);
    s += loss === 'huber' && a > 2 ? 4 * a - 4 : a * a;
  }
  return s;
}

/** Unwrap angles (deg) to within ±180° of a reference, then take percentiles. */
function anglePct(xs: number[], ref: number): number[] {
  return percentiles(xs.map((x) => ref + (x - ref) - 360 * Math.round((x - ref) / 360)), PERCENTILES);
}

export function samplePosterior(sol: Solution, req: CheckedRequest, result: FitResult): void {
  const opts = req.sample!;
  const { L, problem, theta } = sol;
  const n = problem.n;
  const walkers = opts.walkers > 0 ? Math.max(opts.walkers, 2 * n + 2) : 4 * n;
  const asOfJd = asOfJdOf(sol, req);
  const logPost = (x: Float64Array) => {
    const t = problem.full(x);
    if (!inDomain(L, t)) return -Infinity;
    let logPrior = 0;
    for (const [k, s] of L.stars.entries()) {
      const { P, T, i } = s.slots;
      if (i >= 0 && !(t[i]! >= 0 && t[i]! <= Math.PI)) return -Infinity;
      const range = sol.periodRanges[k]!;
      if (t[P]! < range.min * (1 - 1e-9) || t[P]! > range.max * (1 + 1e-9)) return -Infinity;
      if (Math.abs(t[T]! - theta[T]!) > 0.5 * t[P]!) return -Infinity;
      logPrior -= Math.log(t[P]!);
    }
    return logPrior - 0.5 * cost(problem.evaluate(x, false).r, req.loss);
  };
  const rng = new SeededRandom(opts.seed ^ 0x5eed);
  const C = new Matrix(sol.covariance);
  const chol = new CholeskyDecomposition(C);
  const Lc = chol.isPositiveDefinite() ? chol.lowerTriangularMatrix : Matrix.diag(sol.covariance.map((r, a) => Math.sqrt(Math.max(r[a]!, 0))));
  const x0 = Float64Array.from(problem.free, (j) => theta[j]!);
  const start: Float64Array[] = [];
  for (let w = 0; w < walkers; w++) {
    for (let tries = 0; ; tries++) {
      // Redraw at full width a few times before shrinking the ball towards the minimum.
      const z = Array.from({ length: n }, () => rng.normal() * 0.5 ** Math.max(0, tries - 10));
      const x = Float64Array.from(x0, (v, a) => v + z.reduce((s, zb, b) => s + Lc.get(a, b) * zb, 0));
      if (Number.isFinite(logPost(x)) || tries > 40) {
        start.push(Number.isFinite(logPost(x)) ? x : Float64Array.from(x0));
        break;
      }
    }
  }
  const { samples, acceptance } = ensembleSample(logPost, start, { walkers, steps: opts.steps, burn: opts.burn, seed: opts.seed });
  // Fitted parameters.
  problem.free.forEach((idx, j) => {
    const p = L.params[idx]!;
    const xs = samples.map((s) => s[j]! * p.scale);
    const fp = result.parameters[idx]!;
    fp.percentiles = p.angle ? anglePct(xs, fp.value) : percentiles(xs, PERCENTILES);
  });
  // Every reported quantity of every star.
  const desc = quantityNames(L);
  L.stars.forEach((_, k) => {
    const cols = desc.map(() => [] as number[]);
    for (const s of samples) {
      const t = problem.full(s);
      const q = starQuantities(L, t, k, nextCycle(L, t, k, asOfJd));
      q.forEach((v, i) => cols[i]!.push(v));
    }
    result.stars[k]!.quantities.forEach((qt, i) => {
      qt.percentiles = desc[i]!.angle ? anglePct(cols[i]!, qt.value) : percentiles(cols[i]!, PERCENTILES);
    });
  });
  result.sampler = { walkers, steps: opts.steps, burn: opts.burn, seed: opts.seed, acceptance, samples: samples.length };
}
