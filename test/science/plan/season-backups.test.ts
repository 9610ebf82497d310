/**
 * Backups for the epochs the relativity forecast rests on (constructed case): a star with its
 * redshift term on, a few past measurements, and a sparse season at a site losing 40 % of its
 * nights beside a second site, allocated every night, losing 30 %. Every epoch the plan backs up for the relativity
 * forecast is checked against the forecast itself (forecast.ts, computed here afresh): leaving it
 * out raises a factor's σ by at least the stated share's worth, and the reason names both chances.
 */
import { describe, expect, it } from 'vitest';
import type { MeasurementInput } from '../../../server/science/orbit/fit/types.ts';
import type { OrbitInput } from '../../../server/science/orbit/index.ts';
import {
  forecastDetection,
  planSeason,
  type SeasonSite,
  type SeasonTarget,
} from '../../../server/science/plan/index.ts';
import { RELATIVITY_CRITICAL_SHARE } from '../../../server/science/plan/season-backups.ts';
import { addDays } from '../../../server/science/sky/night.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { EAST_SITE, PASSAGE_KNOWN_TO_0_3_DAYS, SITE, weatherLimits as C } from './helpers.ts';

const PERI = '2027-06-10T00:00:00Z';
// Constructed case: an invented eccentric orbit with the redshift terms on and a narrow passage window.
const ORBIT: OrbitInput = {
  elements: {
    periodYears: 11,
    periapsis: PERI,
    eccentricity: 0.82,
    semiMajorAxisArcsec: 0.09,
    inclinationDeg: 64,
    ascendingNodeDeg: 152,
    argPeriapsisDeg: 305,
  },
  distancePc: 9000,
  relativity: { romer: true, gravitationalRedshift: true, transverseDoppler: true },
  covariance: PASSAGE_KNOWN_TO_0_3_DAYS,
};
// Constructed case: one astrometric and one velocity epoch a year over the last decade.
const PAST: MeasurementInput[] = Array.from({ length: 10 }, (_, k) => {
  const epoch = parseEpoch(PERI) - 3650 + 365 * k;
  return [
    { kind: 'offsets', epoch, dRaMas: 0, dDecMas: 0, sigmaDRaMas: 0.5, sigmaDDecMas: 0.5 },
    { kind: 'radial-velocity', epoch, radialVelocityKmS: 0, sigmaRadialVelocityKmS: 10 },
  ] as MeasurementInput[];
}).flat();
const STAR: SeasonTarget = {
  target: validateTarget({ name: 'Tamsin', raDeg: 258.7, decDeg: -33.2, orbit: ORBIT }),
  kinds: ['astrometry', 'spectroscopy'],
  cadenceDays: 20,
  measurements: PAST,
};
const every = (a: string, b: string, step: number) => {
  const out: string[] = [];
  for (let d = a; d <= b; d = addDays(d, step)) out.push(d);
  return out;
};
const WEST = every('2027-05-01', '2027-07-30', 10);
const EAST = every('2027-05-01', '2027-07-30', 1);
const weights = (dates: string[], clear: number) =>
  Object.fromEntries(dates.map((d) => [d, clear]));
const sites: SeasonSite[] = [
  { site: SITE, limits: C(SITE), nights: WEST, nightWeights: weights(WEST, 0.6) },
  { site: EAST_SITE, limits: C(EAST_SITE), nights: EAST, nightWeights: weights(EAST, 0.7) },
];

describe('backups for the epochs the relativity forecast rests on (constructed case)', () => {
  const plan = planSeason('2027-05-01', '2027-07-30', sites, [STAR], { fillFraction: 0.2 });
  const primary = plan.epochs.filter((e) => e.why !== 'backup');
  const forRelativity = plan.epochs.filter(
    (e) => e.why === 'backup' && /forecast rests on it/.test(e.reason),
  );
  const mid = (e: (typeof plan.epochs)[number]) =>
    (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2;

  it('backs up at least one epoch, and each one the forecast really rests on', () => {
    console.log(
      `${primary.length} epochs, ${forRelativity.length} relativity backups:\n  ${forRelativity.map((e) => `${e.site} ${e.date} ${e.kind}: ${e.reason}`).join('\n  ')}`,
    );
    expect(forRelativity.length).toBeGreaterThan(0);
    const forecast = (list: typeof primary) =>
      forecastDetection({
        orbit: STAR.target.orbit!,
        measurements: PAST,
        plan: list.map((e) => ({ jd: mid(e), kind: e.kind, sigma: e.precision.sigma })),
        precision: { astrometryMas: 1, spectroscopyKmS: 1 },
      }).factors.find((f) => f.name === 'redshiftFactor')!;
    const all = forecast(primary).sigmaAfter!;
    for (const b of forRelativity) {
      // The backed epoch: the reason names its site, kind and date.
      const backed = primary.find(
        (e) =>
          e.kind === b.kind &&
          b.reason.startsWith(`backup for the ${e.kind} epoch at ${e.site} ${e.date}:`),
      );
      expect(backed, b.reason).toBeDefined();
      const without = forecast(primary.filter((e) => e !== backed)).sigmaAfter!;
      console.log(`redshift factor σ ${all.toFixed(4)} with it, ${without.toFixed(4)} without`);
      // Constructed case: the share threshold means at least 1/√(1 − share) on σ.
      expect(without / all).toBeGreaterThanOrEqual(
        1 / Math.sqrt(1 - RELATIVITY_CRITICAL_SHARE) - 1e-9,
      );
      expect(Math.abs(mid(b) - mid(backed!))).toBeLessThanOrEqual(3 + 0.5);
      // Constructed case: the two nights are drawn independently, so both are lost with the product.
      const m =
        /\(lost with chance (\d+) %\): .+ is clear with chance (\d+) %, so both are lost with chance (\d+) %/.exec(
          b.reason,
        );
      expect(m, b.reason).not.toBeNull();
      const [lost, clear, both] = [m![1], m![2], m![3]].map(Number);
      expect(clear!).toBeGreaterThanOrEqual(50);
      expect(Math.abs((lost! * (100 - clear!)) / 100 - both!)).toBeLessThanOrEqual(1);
    }
  });

  it('gives none when every night is sure (weather-blind)', () => {
    const blind = planSeason(
      '2027-05-01',
      '2027-07-30',
      sites.map(({ nightWeights: _w, ...s }) => s),
      [STAR],
      { fillFraction: 0.2 },
    );
    expect(blind.epochs.filter((e) => e.why === 'backup')).toEqual([]);
  });
});
