/**
 * Relativity benchmarks. `fit-relativistic`: a fit of a deep star (60 offsets, 42 velocities) with
 * both relativity factors free, against the Newtonian fit of the same measurements in the same
 * process (ratio = Newtonian time / relativistic time, as everywhere: below 1 it costs more).
 * `forecast`: the detection forecast of both factors for a season of 40 planned epochs after 36
 * measurements, against a refit of simulated data at the same epochs (the check it replaces).
 * The orbit is invented demo values.
 */
import { fitOrbits, type FitRequest } from '../../server/science/orbit/fit/index.ts';
import { validateOrbit } from '../../server/science/orbit/index.ts';
import { forecastDetection, type ForecastEpoch } from '../../server/science/plan/index.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { DEEP_PERIAPSIS_JD, deepStar } from '../science/orbit/fit/deep-star.ts';
import { epochs, simulate } from '../science/orbit/fit/simulate.ts';
import { benchLine, bestOfPair, isMain } from './timing.ts';

const PERIAPSIS_JD = DEEP_PERIAPSIS_JD;
const TRUTH = deepStar();

export async function run(): Promise<string[]> {
  const r = new SeededRandom(5);
  const measurements = simulate(
    TRUTH,
    {
      astrometryJd: epochs(PERIAPSIS_JD - 10 * 365.25, 16 * 365.25, 60, r, 30),
      sigmaMas: 0.05,
      velocityJd: [
        ...epochs(PERIAPSIS_JD - 10 * 365.25, 16 * 365.25, 30, r, 30),
        ...epochs(PERIAPSIS_JD - 60, 120, 12, r, 2),
      ],
      sigmaRadialVelocityKmS: 10,
    },
    6,
  );
  const star = { name: 'Wren', measurements, hints: { periodYears: { min: 9.5, max: 10.5 } } };
  const relativistic: FitRequest = {
    stars: [star],
    freeFactors: ['redshiftFactor', 'precessionFactor'],
  };
  const newtonian: FitRequest = { stars: [star] };
  fitOrbits(relativistic); // warm up
  const fit = bestOfPair(
    3,
    () => fitOrbits(relativistic),
    () => fitOrbits(newtonian),
  );

  const existing = measurements.slice(0, 24).concat(measurements.slice(60, 72));
  const plan: ForecastEpoch[] = Array.from({ length: 40 }, (_, k) => ({
    jd: PERIAPSIS_JD - 90 + k * 6,
    kind: k % 2 === 0 ? 'astrometry' : 'spectroscopy',
  }));
  const request = {
    orbit: validateOrbit(TRUTH),
    measurements: existing,
    plan,
    precision: { astrometryMas: 0.05, spectroscopyKmS: 10 },
  };
  const refitData = simulate(
    TRUTH,
    {
      astrometryJd: plan.filter((e) => e.kind === 'astrometry').map((e) => e.jd),
      sigmaMas: 0.05,
      velocityJd: plan.filter((e) => e.kind === 'spectroscopy').map((e) => e.jd),
      sigmaRadialVelocityKmS: 10,
    },
    7,
  );
  const refit: FitRequest = {
    stars: [{ ...star, measurements: [...existing, ...refitData] }],
    freeFactors: ['redshiftFactor', 'precessionFactor'],
  };
  forecastDetection(request); // warm up
  const forecast = bestOfPair(
    3,
    () => forecastDetection(request),
    () => fitOrbits(refit),
  );
  return [
    benchLine('fit-relativistic', fit.ours * 1e3, 'ms', fit.baseline / fit.ours, 'newtonian-fit'),
    benchLine('forecast', forecast.ours * 1e3, 'ms', forecast.baseline / forecast.ours, 'refit'),
  ];
}

if (isMain(import.meta.url)) for (const l of await run()) console.log(l);
