/**
 * The season Monte Carlo against refits of simulated seasons (constructed case, seeded): a planned
 * season of 40 epochs around the deep star's periapsis (invented, test/science/orbit/fit/deep-star.ts),
 * each night lost with chance 0.4 and its σ scattered by exp(0.3·z). The draws' percentiles of the
 * redshift factor's final σ must lie within the sampling error of the same percentiles over
 * least-squares refits of seasons drawn the same way and simulated with noise: the rank interval
 * K·p ∓ √(K p (1 − p)) of K refits, widened by 10 % for the linear (Fisher) step (common
 * practice, no source). Checked once against a deliberately wrong Monte Carlo (no night lost): its
 * 16th percentile fell below the refits' interval.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type MeasurementInput } from '../../../server/science/orbit/fit/index.ts';
import type { SeasonPlan, SeasonSite } from '../../../server/science/plan/index.ts';
import { seasonMonteCarlo } from '../../../server/science/plan/season-monte-carlo.ts';
import { SeededRandom } from '../../../server/science/random.ts';
import { validateSite, validateTarget } from '../../../server/science/sky/index.ts';
import { jdToIso } from '../../../server/science/time/index.ts';
import { DEEP_PERIAPSIS_JD, deepStar } from '../orbit/fit/deep-star.ts';
import { epochs, simulate } from '../orbit/fit/simulate.ts';

const TRUTH = deepStar();
const SIGMA_MAS = 0.1,
  SIGMA_KMS = 15;
const LOSS = 0.4,
  SCATTER = 0.3;
const EXISTING = simulate(
  TRUTH,
  {
    astrometryJd: epochs(DEEP_PERIAPSIS_JD - 8 * 365.25, 7.5 * 365.25, 24, new SeededRandom(1), 20),
    sigmaMas: SIGMA_MAS,
    velocityJd: epochs(DEEP_PERIAPSIS_JD - 7 * 365.25, 6.5 * 365.25, 12, new SeededRandom(2), 20),
    sigmaRadialVelocityKmS: SIGMA_KMS,
  },
  3,
);
// One epoch a night, every 6 nights from 90 days before periapsis, astrometry and spectroscopy in turn.
const EPOCHS = Array.from({ length: 40 }, (_, k) => ({
  jd: DEEP_PERIAPSIS_JD - 90 + k * 6,
  kind: k % 2 === 0 ? ('astrometry' as const) : ('spectroscopy' as const),
}));
const SITE = validateSite({
  name: 'Refit Knoll',
  latitudeDeg: -25,
  longitudeDeg: -70,
  elevationM: 2500,
  timeZone: 'UTC',
});
const dateOf = (jd: number) => jdToIso(jd - 0.5).slice(0, 10);
// The Monte Carlo reads only these fields of a plan: a plan built by hand (constructed case).
const PLAN = {
  startDate: dateOf(EPOCHS[0]!.jd - 1),
  endDate: dateOf(EPOCHS[39]!.jd + 1),
  epochs: EPOCHS.map((e) => ({
    target: 'Wren',
    kind: e.kind,
    site: SITE.name,
    date: dateOf(e.jd),
    block: { start: { utc: jdToIso(e.jd - 0.01) }, end: { utc: jdToIso(e.jd + 0.01) } },
    precision: { sigma: e.kind === 'astrometry' ? SIGMA_MAS : SIGMA_KMS },
  })),
} as unknown as SeasonPlan;
const SITES: SeasonSite[] = [
  {
    site: SITE,
    limits: undefined as never,
    nightWeights: Object.fromEntries(EPOCHS.map((e) => [dateOf(e.jd), 1 - LOSS])),
  },
];
const TARGET = {
  target: validateTarget({ name: 'Wren', raDeg: 258.7, decDeg: -33.2, orbit: TRUTH }),
  kinds: ['astrometry', 'spectroscopy'] as const,
  cadenceDays: 30,
  measurements: EXISTING,
};

/** One season drawn as the Monte Carlo draws it, simulated with noise, and refitted: σ of the redshift factor. */
function refit(seed: number): number {
  const rnd = new SeededRandom(seed);
  const season: MeasurementInput[] = [];
  EPOCHS.forEach((e, k) => {
    const lost = rnd.uniform() < LOSS;
    const f = Math.exp(SCATTER * rnd.normal());
    if (lost) return;
    season.push(
      ...simulate(
        TRUTH,
        e.kind === 'astrometry'
          ? { astrometryJd: [e.jd], sigmaMas: SIGMA_MAS * f }
          : {
              astrometryJd: [],
              sigmaMas: 1,
              velocityJd: [e.jd],
              sigmaRadialVelocityKmS: SIGMA_KMS * f,
            },
        seed * 100 + k,
      ),
    );
  });
  const fit = fitOrbits({
    stars: [
      {
        name: 'Wren',
        measurements: [...EXISTING, ...season],
        hints: { periodYears: { min: 9.5, max: 10.5 } },
      },
    ],
    freeFactors: ['redshiftFactor', 'precessionFactor'],
  });
  return fit.relativity.factors.find((x) => x.name === 'redshiftFactor')!.sigma;
}

describe('the season Monte Carlo against refits of simulated seasons', () => {
  it('gives the redshift factor’s final σ percentiles within the refits’ sampling error', () => {
    const mc = seasonMonteCarlo(PLAN, SITES, [TARGET], {
      draws: 2000,
      seed: 9,
      precisionScatter: SCATTER,
    }).targets[0]!;
    const drawn = mc.factors.find((f) => f.name === 'redshiftFactor')!.sigma!;
    const K = 20;
    const sigmas = Array.from({ length: K }, (_, i) => refit(1000 + i)).sort((a, b) => a - b);
    for (const [p, k] of [
      [16, 1],
      [50, 2],
      [84, 3],
    ] as const) {
      const q = p / 100;
      const half = Math.sqrt(K * q * (1 - q));
      const lo = sigmas[Math.max(0, Math.floor(K * q - half))]! / 1.1;
      const hi = sigmas[Math.min(K - 1, Math.ceil(K * q + half) - 1)]! * 1.1;
      const v = drawn.percentiles[k]!.value;
      console.log(
        `redshift factor σ, ${p} %: draws ${v.toFixed(4)}; refits' interval ${lo.toFixed(4)}–${hi.toFixed(4)} (${K} refits)`,
      );
      expect(v).toBeGreaterThanOrEqual(lo);
      expect(v).toBeLessThanOrEqual(hi);
    }
  }, 180_000); // 20 refits with both factors free: about 30 s on a busy 2-core machine
});
