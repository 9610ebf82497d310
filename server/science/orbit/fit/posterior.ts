/**
 * Posterior sampling of a fit. Priors: P log-uniform inside the period range that was searched
 * (the hints, or the default range), T uniform within half a period of the fitted passage (one
 * passage, not its copies a period away), e uniform in [0, 0.999), every other parameter flat inside
 * its domain, plus the Gaussian priors of the request. Without the bounds on P a poorly covered arc
 * leaves the posterior improper (ever longer periods fit an arc about as well). Likelihood from the
 * same whitened residuals as the fit. Where the model is linear in a block of parameters that block
 * is integrated out exactly (marginal.ts) and drawn afterwards. Walkers start in a ball of the
 * covariance around the minimum. Percentiles go onto every parameter and every reported quantity,
 * the next periapsis included (counted per sample from the sample's own P and T).
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { symmetricMatrix } from '../../matrix.ts';
import { SeededRandom } from '../../random.ts';
import { PERCENTILES, percentiles } from '../uncertainty.ts';
import { costOf } from './lm.ts';
import { conditional, drawLinear, linearSplit } from './marginal.ts';
import { inDomain } from './problem.ts';
import { nextCycle, quantityNames, starQuantities } from './quantities.ts';
import type { CheckedRequest } from './request.ts';
import { asOfJdOf, type FitResult } from './result.ts';
import { ensembleSample } from './sampler.ts';
import type { Solution } from './solve.ts';

/** Unwrap angles (deg) to within ±180° of a reference, then take percentiles. */
function anglePct(xs: number[], ref: number): number[] {
  return percentiles(
    xs.map((x) => ref + (x - ref) - 360 * Math.round((x - ref) / 360)),
    PERCENTILES,
  );
}

/** log prior of a full vector (see the module note); −Infinity outside the domain. */
function logPrior(sol: Solution, t: Float64Array): number {
  const { L, theta } = sol;
  if (!inDomain(L, t)) return -Infinity;
  let lp = 0;
  for (const [k, s] of L.stars.entries()) {
    const { P, T, i } = s.slots;
    if (i >= 0 && !(t[i]! >= 0 && t[i]! <= Math.PI)) return -Infinity;
    const range = sol.periodRanges[k]!;
    if (t[P]! < range.min * (1 - 1e-9) || t[P]! > range.max * (1 + 1e-9)) return -Infinity;
    if (Math.abs(t[T]! - theta[T]!) > 0.5 * t[P]!) return -Infinity;
    lp -= Math.log(t[P]!);
  }
  return lp;
}

/** Walkers in a ball of the covariance (rows/columns `keep`) around x0, each inside the domain. */
function startingBall(
  sol: Solution,
  keep: number[],
  x0: Float64Array,
  walkers: number,
  rng: SeededRandom,
  logPost: (y: Float64Array) => number,
): Float64Array[] {
  const sub = keep.map((a) => keep.map((b) => sol.covariance[a]![b]!));
  const chol = new CholeskyDecomposition(symmetricMatrix(sub));
  const Lc = chol.isPositiveDefinite()
    ? chol.lowerTriangularMatrix
    : Matrix.diag(sub.map((r, a) => Math.sqrt(Math.max(r[a]!, 0))));
  const n = keep.length;
  const start: Float64Array[] = [];
  for (let w = 0; w < walkers; w++) {
    for (let tries = 0; ; tries++) {
      // Redraw at full width a few times before shrinking the ball towards the minimum.
      const z = Array.from({ length: n }, () => rng.normal() * 0.5 ** Math.max(0, tries - 10));
      const y = Float64Array.from(
        x0,
        (v, a) => v + z.reduce((s, zb, b) => s + Lc.get(a, b) * zb, 0),
      );
      const ok = Number.isFinite(logPost(y));
      if (ok || tries > 40) {
        start.push(ok ? y : Float64Array.from(x0));
        break;
      }
    }
  }
  return start;
}

/** Free-parameter vectors drawn from the posterior, and the sampler's acceptance and walkers. */
function drawSamples(
  sol: Solution,
  req: CheckedRequest,
): { xs: Float64Array[]; acceptance: number; walkers: number } {
  const opts = req.posterior!;
  const { problem, theta } = sol;
  const rng = new SeededRandom(opts.seed ^ 0x5eed);
  const xBest = Float64Array.from(problem.free, (j) => theta[j]!);
  const split = linearSplit(problem, req.loss);
  const keep = split ? split.nl : problem.free.map((_, j) => j);
  const walkers =
    opts.ensembleSize > 0
      ? Math.max(opts.ensembleSize, 2 * keep.length + 2)
      : Math.max(16, 4 * keep.length);
  const expand = (y: Float64Array) => {
    const x = Float64Array.from(xBest);
    keep.forEach((p, a) => {
      x[p] = y[a]!;
    });
    return x;
  };
  const logPost = (y: Float64Array) => {
    const x = expand(y);
    const lp = logPrior(sol, problem.full(x));
    if (!Number.isFinite(lp)) return -Infinity;
    if (!split) return lp - 0.5 * costOf(problem.evaluate(x, false).r, req.loss);
    const c = conditional(problem, split, x);
    return c ? lp - 0.5 * c.chi2 - 0.5 * c.logDet : -Infinity;
  };
  const y0 = Float64Array.from(keep, (p) => xBest[p]!);
  const start = startingBall(sol, keep, y0, walkers, rng, logPost);
  const { samples, acceptance } = ensembleSample(logPost, start, {
    ensembleSize: walkers,
    rounds: opts.rounds,
    discardRounds: opts.discardRounds,
    seed: opts.seed,
  });
  const xs = samples.map((y) => {
    const x = expand(y);
    if (!split) return x;
    const c = conditional(problem, split, x);
    return c ? drawLinear(c, split, rng) : x;
  });
  return { xs, acceptance, walkers };
}

export function samplePosterior(sol: Solution, req: CheckedRequest, result: FitResult): void {
  const opts = req.posterior!;
  const { L, problem } = sol;
  const asOfJd = asOfJdOf(sol, req);
  const { xs, acceptance, walkers } = drawSamples(sol, req);
  problem.free.forEach((idx, j) => {
    const p = L.params[idx]!;
    const values = xs.map((s) => s[j]! * p.scale);
    const fp = result.parameters[idx]!;
    fp.percentiles = p.angle ? anglePct(values, fp.value) : percentiles(values, PERCENTILES);
  });
  const desc = quantityNames(L);
  L.stars.forEach((_, k) => {
    const cols = desc.map(() => [] as number[]);
    for (const s of xs) {
      const t = problem.full(s);
      starQuantities(L, t, k, nextCycle(L, t, k, asOfJd)).forEach((v, i) => {
        cols[i]!.push(v);
      });
    }
    result.stars[k]!.quantities.forEach((qt, i) => {
      qt.percentiles = desc[i]!.angle
        ? anglePct(cols[i]!, qt.value)
        : percentiles(cols[i]!, PERCENTILES);
    });
  });
  result.posterior = {
    ensembleSize: walkers,
    rounds: opts.rounds,
    discardRounds: opts.discardRounds,
    seed: opts.seed,
    acceptance,
    samples: xs.length,
  };
}
