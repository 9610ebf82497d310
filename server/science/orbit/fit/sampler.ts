/**
 * Affine-invariant ensemble sampler with the stretch move (Goodman & Weare, Comm. App. Math. Comp.
 * Sci. 5, 65 (2010)): each walker moves along the line through another walker, y = x_j + z(x_k − x_j)
 * with z drawn from g(z) ∝ 1/√z on [1/a, a], accepted with probability min(1, z^(n−1) p(y)/p(x_k)).
 * Invariant to linear changes of variables, so correlated, differently scaled orbital elements need
 * no tuning. Seeded: the same seed gives the same chain.
 */
import { SeededRandom } from '../../random.ts';

export interface EnsembleOptions {
  /** Members of the ensemble (Goodman & Weare's walkers). */
  ensembleSize: number;
  /** Rounds kept, each moving every member once. */
  rounds: number;
  /** Rounds run first and thrown away. */
  discardRounds: number;
  seed: number;
  /** Stretch scale a; 2 as recommended by Goodman & Weare. */
  a?: number;
  /** At most this many samples are kept (evenly thinned). Default 20000. */
  keep?: number;
}

export interface EnsembleResult {
  /** Kept samples after burn-in, each a parameter vector. */
  samples: Float64Array[];
  /** Fraction of proposals accepted after burn-in. */
  acceptance: number;
}

/**
 * @param logPost log posterior density up to a constant; −Infinity outside the domain
 * @param start one starting vector per walker (all with finite logPost)
 */
export function ensembleSample(
  logPost: (x: Float64Array) => number,
  start: Float64Array[],
  o: EnsembleOptions,
): EnsembleResult {
  const rng = new SeededRandom(o.seed);
  const a = o.a ?? 2;
  const W = start.length,
    n = start[0]!.length;
  const pos = start.map((x) => Float64Array.from(x));
  const lp = pos.map((x) => logPost(x));
  const keep = o.keep ?? 20_000;
  const thin = Math.max(1, Math.ceil((o.rounds * W) / keep));
  const samples: Float64Array[] = [];
  let accepted = 0,
    proposed = 0,
    counter = 0;
  const y = new Float64Array(n);
  for (let step = 0; step < o.discardRounds + o.rounds; step++) {
    for (let k = 0; k < W; k++) {
      let j = Math.floor(rng.uniform() * (W - 1));
      if (j >= k) j++;
      const u = rng.uniform();
      const z = ((a - 1) * u + 1) ** 2 / a;
      const xk = pos[k]!,
        xj = pos[j]!;
      for (let q = 0; q < n; q++) y[q] = xj[q]! + z * (xk[q]! - xj[q]!);
      const lpy = logPost(y);
      const logRatio = (n - 1) * Math.log(z) + lpy - lp[k]!;
      const take = Number.isFinite(lpy) && Math.log(rng.uniform()) < logRatio;
      if (take) {
        xk.set(y);
        lp[k] = lpy;
      }
      if (step >= o.discardRounds) {
        proposed++;
        if (take) accepted++;
        if (counter++ % thin === 0) samples.push(Float64Array.from(xk));
      }
    }
  }
  return { samples, acceptance: proposed > 0 ? accepted / proposed : 0 };
}
