import { describe, expect, it } from 'vitest';
import { JULIAN_YEAR_DAYS } from '../../../server/science/constants.ts';
import {
  ephemeris,
  eventsWithUncertainty,
  validateOrbit,
} from '../../../server/science/orbit/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';

// An invented orbit with an invented covariance (demo numbers, not check values).
const sigP = 0.02; // yr
const sigT = 3; // days
const rhoPT = 0.4;
const orbitInput = {
  elements: {
    periodYears: 11.3,
    periapsis: '2019-06-01T00:00:00Z',
    eccentricity: 0.81,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 16_000,
  covariance: {
    parameters: ['periodYears', 'periapsisDays', 'eccentricity'] as (
      | 'periodYears'
      | 'periapsisDays'
      | 'eccentricity'
    )[],
    matrix: [
      [sigP ** 2, rhoPT * sigP * sigT, 0],
      [rhoPT * sigP * sigT, sigT ** 2, 0],
      [0, 0, 0.002 ** 2],
    ],
  },
};

describe('uncertainty of periapsis dates', () => {
  const orbit = validateOrbit(orbitInput);
  const k = 1; // the next passage after T
  // Linear propagation of t_k = T + k·P: σ² = σ_T² + k²σ_P² + 2k·cov(T,P) (common practice, no source).
  const pDays = sigP * JULIAN_YEAR_DAYS;
  const expected = Math.sqrt(sigT ** 2 + k * k * pDays ** 2 + 2 * k * rhoPT * pDays * sigT);

  it('gives the analytic 1σ by linear propagation', () => {
    const [ev] = eventsWithUncertainty(orbit, parseEpoch('2030-01-01'), parseEpoch('2036-01-01'), {
      kinds: ['periapsis'],
    });
    expect(ev!.orbitNumber).toBe(1);
    expect(Math.abs(ev!.sigmaDays! - expected) / expected).toBeLessThan(1e-4);
  });

  it('agrees with Monte Carlo percentiles, and the same seed gives the same answer', () => {
    const run = (seed: number) =>
      eventsWithUncertainty(orbit, parseEpoch('2030-01-01'), parseEpoch('2036-01-01'), {
        kinds: ['periapsis'],
        monteCarlo: { draws: 4000, seed },
      })[0]!;
    const a = run(7);
    const half =
      (Date.parse(a.percentileEpochs![3]!) - Date.parse(a.percentileEpochs![1]!)) / 2 / 86_400_000;
    // Sampling error of a 68% half-width from 4000 draws is ~1.5%: allow 5% (common practice, no source).
    expect(Math.abs(half - expected) / expected).toBeLessThan(0.05);
    expect(run(7).percentileEpochs).toEqual(a.percentileEpochs);
    expect(run(8).percentileEpochs).not.toEqual(a.percentileEpochs);
  });

  it('gives every ephemeris quantity a 1σ, and Monte Carlo percentiles that bracket the nominal value', () => {
    const jd = Float64Array.of(parseEpoch('2033-08-01'), parseEpoch('2034-01-01'));
    const rows = ephemeris(orbit, jd, { monteCarlo: { draws: 500, seed: 3 } });
    for (const r of rows) {
      expect(r.sigma!.separationMas!).toBeGreaterThan(0);
      expect(r.sigma!.radialVelocityKmS!).toBeGreaterThan(0);
      const [lo, , , , hi] = r.percentiles!.separationMas!;
      expect(lo!).toBeLessThan(r.separationMas);
      expect(hi!).toBeGreaterThan(r.separationMas);
    }
  });

  it('refuses a covariance that is not positive semi-definite, or not symmetric', () => {
    const bad = structuredClone(orbitInput);
    bad.covariance.matrix = [
      [1, 0.9, 0],
      [0.9, 1, 0.9],
      [0, 0.9, 1],
    ];
    expect(() =>
      ephemeris(validateOrbit(bad), Float64Array.of(2461000), {
        monteCarlo: { draws: 100, seed: 1 },
      }),
    ).toThrow(/positive semi-definite/);
    const asym = structuredClone(orbitInput);
    asym.covariance.matrix[0]![1] = 0.001;
    expect(() => validateOrbit(asym)).toThrow(/symmetric/);
  });
});
