/**
 * The season planner's relativity goal: asked to maximise the relativity forecast, it chooses
 * epochs after which the forecast's σ of the redshift factor is smaller than the plan without the
 * goal (a strict inequality, printed). Constructed case: the invented deep star of the relativity
 * tests (demo values) at an invented site, passing periapsis in the plan's range, with a tight
 * covariance so the periapsis window is one night and the cadence and extra passes choose freely.
 */
import { describe, expect, it } from 'vitest';
import { validateOrbit, type CovarianceParameter } from '../../../server/science/orbit/index.ts';
import { forecastDetection, planSeason } from '../../../server/science/plan/index.ts';
import { relativityState } from '../../../server/science/plan/season-relativity.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { SeededRandom } from '../../../server/science/random.ts';
import { DEEP_PERIAPSIS_JD, deepStar } from '../orbit/fit/deep-star.ts';
import { epochs, simulate } from '../orbit/fit/simulate.ts';
import { CONSTRAINTS, SITE } from './helpers.ts';

const ORBIT = {
  ...deepStar(),
  covariance: {
    parameters: [
      'periodYears',
      'periapsisDays',
      'eccentricity',
      'semiMajorAxisArcsec',
      'inclinationDeg',
      'ascendingNodeDeg',
      'argPeriapsisDeg',
    ] as CovarianceParameter[],
    matrix: [1e-4, 0.2, 1e-4, 1e-5, 0.05, 0.05, 0.05].map((s, i, all) =>
      all.map((_, j) => (i === j ? s * s : 0)),
    ),
  },
};
const MEASURED = simulate(
  ORBIT,
  {
    astrometryJd: epochs(DEEP_PERIAPSIS_JD - 8 * 365.25, 7.5 * 365.25, 24, new SeededRandom(1), 20),
    sigmaMas: 0.5,
    velocityJd: epochs(DEEP_PERIAPSIS_JD - 7 * 365.25, 6.5 * 365.25, 12, new SeededRandom(2), 20),
    sigmaRadialVelocityKmS: 10,
  },
  3,
);

describe('the relativity goal of the season planner', () => {
  it('lowers the forecast σ of the redshift factor against the plan without it', () => {
    const target = {
      target: validateTarget({ name: 'Deep', raDeg: 100, decDeg: -40, orbit: ORBIT as never }),
      kinds: ['astrometry', 'spectroscopy'] as const,
      cadenceDays: 30,
      measurements: MEASURED,
    };
    const run = (relativityGoal: boolean) =>
      planSeason(
        '2027-11-15',
        '2028-03-15',
        [{ site: SITE, limits: CONSTRAINTS }],
        [{ ...target, kinds: [...target.kinds] }],
        { relativityGoal, extraEpochsPerTarget: 4 },
      );
    const sigmaAfter = (plan: ReturnType<typeof run>) =>
      forecastDetection({
        orbit: validateOrbit(ORBIT as never),
        measurements: MEASURED,
        plan: plan.epochs.map((e) => ({
          jd:
            (Date.parse(e.block.start.utc) + Date.parse(e.block.end.utc)) / 2 / 86_400_000 +
            2_440_587.5,
          kind: e.kind,
          sigma: e.precision.sigma,
        })),
        precision: { astrometryMas: 1, spectroscopyKmS: 5 },
      }).factors.map((f) => f.sigmaAfter!);
    const [plain, goal] = [run(false), run(true)];
    const [a, b] = [sigmaAfter(plain), sigmaAfter(goal)];
    console.log(
      `redshift factor σ after the plan: ${a[0]!.toFixed(4)} without the goal (${plain.epochs.length} epochs), ${b[0]!.toFixed(4)} with it (${goal.epochs.length} epochs); precession ${a[1]!.toFixed(3)} → ${b[1]!.toFixed(3)}`,
    );
    expect(goal.epochs.length).toBeLessThanOrEqual(plain.epochs.length); // not by buying more epochs
    expect(b[0]!).toBeLessThan(a[0]!);
    // The plan's own report gives the same forecast (no blocks stay here, so the plan is its epochs).
    for (const [plan, sigma] of [
      [plain, a],
      [goal, b],
    ] as const) {
      const reported = plan.targets[0]!.relativity!;
      expect(reported.plannedEpochs).toBe(plan.epochs.length);
      // Equal but for the epochs' JD (the test's from milliseconds, the report's from the ISO text).
      reported.factors.forEach((f, q) => {
        expect(Math.abs(f.sigmaAfter! / sigma[q]! - 1)).toBeLessThan(1e-6);
      });
    }
  });

  it('starts from the information of the blocks that stay in place', () => {
    // Constructed case: kept spectroscopy and astrometry around the passage, at 5 km/s and 1 mas.
    const orbit = validateOrbit(ORBIT as never);
    const precision = { astrometryMas: 1, spectroscopyKmS: 5, seeingArcsec: null };
    const kept = [-20, -5, 0, 3, 10].flatMap((d) =>
      (['spectroscopy', 'astrometry'] as const).map((kind) => ({
        jd: DEEP_PERIAPSIS_JD + d,
        kind,
        precision,
      })),
    );
    const without = relativityState(orbit, MEASURED, [])!;
    const withKept = relativityState(orbit, MEASURED, [], kept)!;
    const sigma = (rs: typeof without, q: number) =>
      Math.sqrt(rs.cov.get(rs.factors[q]!, rs.factors[q]!));
    // The forecast's own sum over the same epochs as a plan (forecast.ts, a separate code path).
    const forecast = forecastDetection({
      orbit,
      measurements: MEASURED,
      plan: kept.map((k) => ({ jd: k.jd, kind: k.kind, sigma: k.kind === 'astrometry' ? 1 : 5 })),
      precision,
    }).factors.map((f) => f.sigmaAfter!);
    console.log(
      `redshift factor σ at the season's start: ${sigma(without, 0).toFixed(4)} without the kept blocks, ${sigma(withKept, 0).toFixed(4)} with them (forecast after them ${forecast[0]!.toFixed(4)})`,
    );
    expect(sigma(withKept, 0)).toBeLessThan(0.8 * sigma(without, 0)); // blocks at the passage carry the redshift
    // Equal to the forecast's σ after the same epochs; the planner's weak prior (σ 100) aside.
    expect(Math.abs(sigma(withKept, 0) / forecast[0]! - 1)).toBeLessThan(1e-3);
    expect(Math.abs(sigma(withKept, 1) / forecast[1]! - 1)).toBeLessThan(1e-3);
  });

  it('refuses a goal that is not true or false, naming the field', () => {
    expect(() =>
      planSeason(
        '2027-11-15',
        '2027-11-20',
        [{ site: SITE, limits: CONSTRAINTS }],
        [
          {
            target: validateTarget({ name: 'X', raDeg: 100, decDeg: -40 }),
            kinds: ['astrometry'],
            cadenceDays: 30,
          },
        ],
        { relativityGoal: 'yes' as never },
      ),
    ).toThrow(/relativityGoal/);
  });
});
