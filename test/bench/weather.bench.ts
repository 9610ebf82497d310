/**
 * Weather benchmarks (issue 16): `plan-weather`, the season plan of 10 targets at 2 sites over 180
 * nights with every night weighted by a chance of being clear (seeded, 0.3–0.95) and periapsis
 * epochs backed up, against the same plan weather-blind (`plan-season` of this campaign); and
 * `season-monte-carlo`, 1,000 draws of that plan (nights lost, precision scattered, σ of the passage
 * date, the mass and both relativity factors from 20 earlier measurements per star), target ≤ 10 s,
 * against the plan it draws. The server runs the draws in its worker pool (tasks.ts): the last line
 * times them there.
 */
import type { MeasurementInput } from '../../server/science/orbit/fit/index.ts';
import { planSeason, type SeasonSite } from '../../server/science/plan/index.ts';
import { seasonMonteCarlo } from '../../server/science/plan/season-monte-carlo.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { validateLimits, validateSite, validateTarget } from '../../server/science/sky/index.ts';
import { addDays } from '../../server/science/sky/night.ts';
import { createJobPool } from '../../server/jobs/pool.ts';
import { benchLine, bestOfPair, isMain } from './timing.ts';

const west = validateSite({
  name: 'Bench Hill',
  latitudeDeg: -27.5,
  longitudeDeg: -70.2,
  elevationM: 2500,
  timeZone: 'America/Santiago',
  lowestAltitudeDeg: 25,
});
const east = validateSite({
  name: 'Bench Karoo',
  latitudeDeg: -31.4,
  longitudeDeg: 20.8,
  elevationM: 1800,
  timeZone: 'Africa/Johannesburg',
  lowestAltitudeDeg: 25,
});

function campaign() {
  const rng = new SeededRandom(16);
  const dates = Array.from({ length: 180 }, (_, d) => addDays('2027-03-01', d));
  const weights = () => Object.fromEntries(dates.map((d) => [d, 0.3 + 0.65 * rng.uniform()]));
  const blind: SeasonSite[] = [
    { site: west, limits: validateLimits({ highestAirmass: 2 }, west) },
    { site: east, limits: validateLimits({ highestAirmass: 2 }, east) },
  ];
  const aware = blind.map((s) => ({ ...s, nightWeights: weights() }));
  const targets = Array.from({ length: 10 }, (_, i) => ({
    target: validateTarget({
      name: `W${i}`,
      raDeg: 150 + i * 9,
      decDeg: -48 + i * 2,
      orbit: {
        elements: {
          periodYears: 12 + i,
          periapsis: `J${2027.3 + i * 0.04}`,
          eccentricity: 0.8,
          semiMajorAxisArcsec: 0.1 + i * 0.005,
          inclinationDeg: 40 + i * 10,
          ascendingNodeDeg: (i * 41) % 360,
          argPeriapsisDeg: (i * 67) % 360,
        },
        distancePc: 11_500,
        relativity: {
          romer: true,
          gravitationalRedshift: true,
          transverseDoppler: true,
          precession: true,
        },
        covariance: {
          parameters: ['periodYears', 'periapsisDays', 'eccentricity', 'semiMajorAxisArcsec'],
          matrix: [
            [0.01, 0, 0, 0],
            [0, 4, 0, 0],
            [0, 0, 1e-5, 0],
            [0, 0, 0, 1e-7],
          ],
        },
      },
    }),
    kinds: ['astrometry', 'spectroscopy'] as const,
    cadenceDays: 20,
    measurements: Array.from(
      { length: 20 },
      (_, k): MeasurementInput =>
        k % 2
          ? {
              kind: 'radial-velocity',
              epoch: `J${2010 + k * 0.8}`,
              radialVelocityKmS: 0,
              sigmaRadialVelocityKmS: 10,
            }
          : {
              kind: 'offsets',
              epoch: `J${2010 + k * 0.8}`,
              dRaMas: 0,
              dDecMas: 0,
              sigmaDRaMas: 0.5,
              sigmaDDecMas: 0.5,
            },
    ),
  }));
  return { blind, aware, targets };
}

export async function run(): Promise<string[]> {
  const c = campaign();
  const plan = () => planSeason('2027-03-01', '2027-08-27', c.aware, c.targets);
  const pair = bestOfPair(
    2,
    () => void plan(),
    () => void planSeason('2027-03-01', '2027-08-27', c.blind, c.targets),
  );
  const p = plan();
  const draws = bestOfPair(
    1,
    () => void seasonMonteCarlo(p, c.aware, c.targets, { draws: 1000, seed: 1 }),
    () => void plan(),
  );
  const backups = p.epochs.filter((e) => e.why === 'backup').length;
  // As the server runs it: on a pool thread (started and warmed first), the plan sent across.
  const pool = createJobPool({ threads: 1, maxQueue: 2, timeLimitS: 300 });
  let worker = Infinity;
  try {
    const opts = { draws: 1000, seed: 1 };
    await pool.run('seasonMonteCarlo', p, c.aware, c.targets, { ...opts, draws: 1 });
    const t0 = performance.now();
    await pool.run('seasonMonteCarlo', p, c.aware, c.targets, opts);
    worker = (performance.now() - t0) / 1000;
  } finally {
    await pool.close();
  }
  return [
    benchLine('plan-weather', pair.ours, 's', pair.ours / pair.baseline, 'plan-season') +
      ` (${p.epochs.length} epochs, ${backups} backups; 10 targets, 2 sites, 180 nights)`,
    benchLine('season-monte-carlo', draws.ours, 's', draws.ours / draws.baseline, 'plan-weather') +
      ` (1000 draws of ${p.epochs.length} epochs)`,
    benchLine('season-monte-carlo-worker', worker, 's', worker / draws.ours, 'season-monte-carlo') +
      ' (the same draws on a job-pool thread, as the server runs them; target ≤ 10 s)',
  ];
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
