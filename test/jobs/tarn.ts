/**
 * An invented star (demo values, not check values) whose 20 offsets and 10 velocities the job
 * tests and the job benchmark fit: small enough to fit quickly, and with a posterior long enough
 * to keep a thread busy.
 */
import { SeededRandom } from '../../server/science/random.ts';
import { epochs, simulate } from '../science/orbit/fit/simulate.ts';

export const TARN_TRUTH = {
  elements: {
    periodYears: 10,
    periapsis: 'J2018.1',
    eccentricity: 0.4,
    semiMajorAxisArcsec: 0.15,
    inclinationDeg: 60,
    ascendingNodeDeg: 160,
    argPeriapsisDeg: 45,
  },
  distancePc: 40,
  systemicVelocityKmS: 21,
};
const r = new SeededRandom(4);
export const TARN_MEASUREMENTS = simulate(
  TARN_TRUTH,
  {
    astrometryJd: epochs(2457023.5, 12 * 365.25, 20, r, 20),
    sigmaMas: 0.8,
    velocityJd: epochs(2457123.5, 11 * 365.25, 10, r, 20),
    sigmaRadialVelocityKmS: 0.4,
  },
  5,
);
