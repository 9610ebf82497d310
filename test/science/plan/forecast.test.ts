/**
 * The detection forecast against refits: the Fisher σ of each relativity factor after a plan must
 * match the σ that least-squares refits of simulated measurements at those epochs report (within
 * 20 %, the tolerance; common practice, no source, for a linear forecast of a
 * well-determined orbit), and their scatter. Invented system (demo values, not check values):
 * 6 × 10⁶ M☉ at 10 kpc, P = 10 yr, e = 0.9, periapsis at JD 2461771.5.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type MeasurementInput } from '../../../server/science/orbit/fit/index.ts';
import { validateOrbit } from '../../../server/science/orbit/index.ts';
import { forecastDetection, type ForecastEpoch } from '../../../server/science/plan/index.ts';
import { SeededRandom } from '../../../server/science/random.ts';
import { DEEP_PERIAPSIS_JD, deepStar } from '../orbit/fit/deep-star.ts';
import { epochs, simulate } from '../orbit/fit/simulate.ts';

const PERIAPSIS_JD = DEEP_PERIAPSIS_JD;
const TRUTH = deepStar();
const SIGMA_MAS = 0.1,
  SIGMA_KMS = 15;
const EXISTING_AST = epochs(PERIAPSIS_JD - 8 * 365.25, 7.5 * 365.25, 24, new SeededRandom(1), 20);
const EXISTING_RV = epochs(PERIAPSIS_JD - 7 * 365.25, 6.5 * 365.25, 12, new SeededRandom(2), 20);
// 40 planned epochs over the eight months around periapsis, alternating kinds.
const PLAN: ForecastEpoch[] = Array.from({ length: 40 }, (_, k) => ({
  jd: PERIAPSIS_JD - 90 + k * 6,
  kind: k % 2 === 0 ? 'astrometry' : 'spectroscopy',
}));

function simulated(seed: number): MeasurementInput[] {
  return simulate(
    TRUTH,
    {
      astrometryJd: [
        ...EXISTING_AST,
        ...PLAN.filter((e) => e.kind === 'astrometry').map((e) => e.jd),
      ],
      sigmaMas: SIGMA_MAS,
      velocityJd: [
        ...EXISTING_RV,
        ...PLAN.filter((e) => e.kind === 'spectroscopy').map((e) => e.jd),
      ],
      sigmaRadialVelocityKmS: SIGMA_KMS,
    },
    seed,
  );
}

const forecast = forecastDetection({
  orbit: validateOrbit(TRUTH),
  measurements: simulate(
    TRUTH,
    {
      astrometryJd: EXISTING_AST,
      sigmaMas: SIGMA_MAS,
      velocityJd: EXISTING_RV,
      sigmaRadialVelocityKmS: SIGMA_KMS,
    },
    3,
  ),
  plan: PLAN,
  precision: { astrometryMas: SIGMA_MAS, spectroscopyKmS: SIGMA_KMS },
});

describe('detection forecast of the relativity factors', () => {
  it('matches the σ of refits of simulated measurements at the planned epochs within 20 %', () => {
    const fits = [11, 22, 33, 44, 55, 66].map((seed) =>
      fitOrbits({
        stars: [
          {
            name: 'Wren',
            measurements: simulated(seed),
            hints: { periodYears: { min: 9.5, max: 10.5 } },
          },
        ],
        freeFactors: ['redshiftFactor', 'precessionFactor'],
      }),
    );
    for (const f of forecast.factors) {
      const reported = fits.map((x) => x.relativity.factors.find((y) => y.name === f.name)!);
      const meanSigma = reported.reduce((a, r) => a + r.sigma, 0) / reported.length;
      const scatter = Math.sqrt(
        reported.reduce((a, r) => a + (r.value - 1) ** 2, 0) / reported.length,
      );
      console.log(
        `${f.name}: forecast σ ${f.sigmaAfter!.toFixed(4)}, refits' mean σ ${meanSigma.toFixed(4)}, refits' rms about 1 ${scatter.toFixed(4)} (${reported.length} refits); ${forecast.summary[forecast.factors.indexOf(f)]}`,
      );
      expect(Math.abs(meanSigma / f.sigmaAfter! - 1)).toBeLessThan(0.2);
    }
  });

  it('dates the thresholds in order and ranks the periapsis epochs first', () => {
    for (const f of forecast.factors) {
      expect(f.sigmaAfter!).toBeLessThan(f.sigmaNow ?? Infinity);
      const [three, five] = f.reaches;
      if (three!.epoch && five!.epoch) expect(five!.epoch >= three!.epoch).toBe(true);
      expect(f.topEpochs).toHaveLength(5);
      expect(f.topEpochs[0]!.share).toBeGreaterThanOrEqual(f.topEpochs[4]!.share);
    }
    // The redshift signal peaks at periapsis: its best epoch is a velocity within ±30 d of it
    // (GM/(rc) ∝ 1/r; common practice, no source).
    const rs = forecast.factors.find((f) => f.name === 'redshiftFactor')!;
    expect(rs.topEpochs[0]!.kind).toBe('spectroscopy');
    expect(
      Math.abs(Date.parse(rs.topEpochs[0]!.epoch) / 864e5 + 2440587.5 - PERIAPSIS_JD),
    ).toBeLessThan(30);
  });

  it('says when a factor is not determined yet', () => {
    const none = forecastDetection({
      orbit: validateOrbit(TRUTH),
      measurements: [],
      plan: PLAN.slice(0, 3),
      precision: { astrometryMas: SIGMA_MAS, spectroscopyKmS: SIGMA_KMS },
    });
    for (const f of none.factors) {
      expect(f.sigmaNow).toBeNull();
      expect(f.significanceNow).toBe(0);
    }
    expect(none.summary[0]).toMatch(/not detectable with this plan/);
  });
});
