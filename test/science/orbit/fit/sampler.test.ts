/**
 * The ensemble sampler against the covariance. On a well-constrained orbit the posterior is close
 * to Gaussian, so its 16–84% half-width must match the linear 1σ and its median the best fit; on
 * a poorly covered arc the posterior is not Gaussian, and the sampler must show it: wider than the
 * covariance says, and lopsided. Tolerances: ±20% on widths, 0.3σ on medians, 0.25 on the
 * asymmetry (Monte Carlo error with ~16 000 correlated samples is a few per cent on the good orbit;
 * common practice, no source; on the poorly covered arc one chain's width scatters by ~10%, measured
 * below). Orbits are invented demo values.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type FitResult } from '../../../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { CLASSES } from './classes.ts';
import { epochs, simulate } from './simulate.ts';

/** Half-width (p84 − p16)/2 over σ, and asymmetry ((p84 − p50) − (p50 − p16)) / half-width. */
function shape(p: { sigma: number; percentiles?: number[] }) {
  const [, p16, p50, p84] = p.percentiles!;
  const half = (p84! - p16!) / 2;
  return { ratio: half / p.sigma, asym: (p84! - p50! - (p50! - p16!)) / half, median: p50! };
}

function report(name: string, r: FitResult): void {
  const rows = r.parameters
    .filter((p) => !p.fixed)
    .map((p) => {
      const s = shape(p);
      return `  ${p.name.padEnd(24)} σ ${p.sigma.toPrecision(3).padStart(9)}  half-width/σ ${s.ratio.toFixed(2)}  asymmetry ${s.asym.toFixed(2)}  (median − best)/σ ${((s.median - p.value) / p.sigma).toFixed(2)}`;
    });
  console.log(
    `${name}: acceptance ${r.posterior!.acceptance.toFixed(2)}, ${r.posterior!.samples} samples\n${rows.join('\n')}`,
  );
}

describe('posterior sampling', () => {
  it('agrees with the covariance on a well-constrained orbit', () => {
    const c = CLASSES.eccentric!;
    const r = fitOrbits({
      stars: [{ name: 'X', measurements: c.measurements(77), hints: c.hints }],
      posterior: { seed: 5, rounds: 1000, discardRounds: 600 },
    });
    report('well constrained', r);
    for (const p of r.parameters) {
      const s = shape(p);
      expect(s.ratio, p.name).toBeGreaterThan(0.8);
      expect(s.ratio, p.name).toBeLessThan(1.25);
      expect(Math.abs(s.median - p.value) / p.sigma, p.name).toBeLessThan(0.3);
      expect(Math.abs(s.asym), p.name).toBeLessThan(0.25);
    }
  });

  it('is wider than the covariance and lopsided on a poorly covered orbit, next periapsis included', () => {
    // A 25-year orbit seen for 8 years, astrometry only.
    const truth = {
      elements: {
        periodYears: 25,
        periapsis: 'J2026.0',
        eccentricity: 0.5,
        semiMajorAxisArcsec: 0.3,
        inclinationDeg: 60,
        ascendingNodeDeg: 100,
        argPeriapsisDeg: 40,
      },
    };
    const measurements = simulate(
      truth,
      { astrometryJd: epochs(2457023.5, 8 * 365.25, 20, new SeededRandom(9), 10), sigmaMas: 0.5 },
      10,
    );
    const r = fitOrbits({
      stars: [{ name: 'Y', measurements, hints: { periodYears: { min: 10, max: 100 } } }],
      posterior: { seed: 5, rounds: 1000, discardRounds: 1000 },
    });
    report('poorly covered', r);
    const P = shape(r.parameters.find((p) => p.name === 'Y.periodYears')!);
    // P's own widening is smaller than one chain's Monte Carlo error, so it is not asserted; what is
    // asserted is that the sampler does not collapse P below its linear σ. Measured on this data set
    // (seeds 1–5, 4000 rounds after 2000 discarded): P half-width/σ 1.25, 1.00, 1.12, 1.21, 1.13
    // (mean 1.14, sd 0.10 between chains); this chain (seed 5, 1000 rounds) gives 1.05. The threshold
    // was > 1.1 until T moved to the passage nearest the data; that move cannot change P's marginal
    // nor its linear σ (T → T + kP is linear with unit Jacobian and the stretch move is
    // affine-invariant; only the prior's ±P/2 window on T moves), so the drop to 1.05 is this chain's
    // Monte Carlo error, not a property of the posterior. 0.85 is 2 sd of one chain below the mean.
    expect(P.ratio).toBeGreaterThan(0.85);
    const widest = Math.max(...r.parameters.map((p) => shape(p).ratio));
    expect(widest).toBeGreaterThan(1.5);
    const lopsided = Math.max(...r.parameters.map((p) => Math.abs(shape(p).asym)));
    expect(lopsided).toBeGreaterThan(0.5);
    const next = r.stars[0]!.quantities.find((q) => q.name === 'nextPeriapsisJd')!;
    const [p2, , p50, , p97] = next.percentiles!;
    const lower = p50! - p2!,
      upper = p97! - p50!;
    console.log(
      `next periapsis: linear 1σ ${next.sigma.toFixed(1)} d; posterior 2.5/50/97.5% at ${(p2! - next.value).toFixed(1)}, ${(p50! - next.value).toFixed(1)}, ${(p97! - next.value).toFixed(1)} d from the best fit`,
    );
    expect(p97! - p2!).toBeGreaterThan(1.2 * 3.92 * next.sigma); // wider than the Gaussian 95% interval
    expect(Math.max(lower / upper, upper / lower)).toBeGreaterThan(1.5);
  });

  it('is reproducible: the same seed gives the same percentiles', () => {
    const c = CLASSES.faceOn!;
    const once = () =>
      fitOrbits({
        stars: [{ name: 'Z', measurements: c.measurements(3), hints: c.hints }],
        posterior: { seed: 42, rounds: 200, discardRounds: 100 },
      }).parameters.map((p) => p.percentiles);
    expect(once()).toEqual(once());
  });
});
