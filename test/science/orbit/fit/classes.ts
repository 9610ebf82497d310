/**
 * The invented orbits of the recovery checks (demo values, not check values) and how each is
 * observed. Epoch counts are kept small so that 50 realizations of a class fit in well under
 * a minute on a shared two-core machine.
 */
import type { OrbitInput } from '../../../../server/science/orbit/index.ts';
import type { MeasurementInput, StarHints } from '../../../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const J2015 = 2457023.5;
const YR = 365.25;

export interface OrbitClass {
  name: string;
  truth: OrbitInput;
  measurements: (seed: number) => MeasurementInput[];
  hints: StarHints;
}

const elements = (
  periodYears: number,
  periapsis: string,
  eccentricity: number,
  a: number,
  i: number,
  node: number,
  arg: number,
) => ({
  periodYears,
  periapsis,
  eccentricity,
  semiMajorAxisArcsec: a,
  inclinationDeg: i,
  ascendingNodeDeg: node,
  argPeriapsisDeg: arg,
});

/** A binary of ~2 M☉ at 50 pc with astrometry and radial velocities. */
const eccentricTruth: OrbitInput = {
  elements: elements(12, 'J2019.6', 0.6, 0.132, 55, 110, 300),
  distancePc: 50,
  systemicVelocityKmS: -7,
};
/** Astrometry only: fitted in the Thiele–Innes form. */
const circularTruth: OrbitInput = { elements: elements(8, 'J2017.2', 0.03, 0.2, 40, 75, 20) };
const edgeOnTruth: OrbitInput = {
  elements: elements(10, 'J2018.1', 0.35, 0.15, 90, 160, 45),
  distancePc: 40,
  systemicVelocityKmS: 21,
};
/** Face-on: i, Ω and ω are not separately defined; the fit's Thiele–Innes constants are. */
const faceOnTruth: OrbitInput = { elements: elements(9, 'J2020.3', 0.45, 0.18, 0, 0, 130) };
/** A star around an invented compact object (~3 × 10⁷ M☉ at 16 kpc), periapsis inside the data. */
const coveredTruth: OrbitInput = {
  elements: elements(15, 'J2021.4', 0.92, 0.12, 50, 140, 250),
  distancePc: 16_000,
  systemicVelocityKmS: 0,
};
/** The same kind of star observed only on the far side of its orbit, periapsis not reached. */
const uncoveredTruth: OrbitInput = {
  elements: elements(18, 'J2034.0', 0.91, 0.14, 70, 40, 300),
  distancePc: 16_000,
  systemicVelocityKmS: 0,
};

function plan(truth: OrbitInput, make: (r: SeededRandom) => Parameters<typeof simulate>[1]) {
  // Epoch jitter and noise from separate streams, so the noise does not echo the epochs.
  return (seed: number) => simulate(truth, make(new SeededRandom(2 * seed)), 2 * seed + 1);
}

export const CLASSES: Record<string, OrbitClass> = {
  eccentric: {
    name: 'eccentric (e = 0.6)',
    truth: eccentricTruth,
    hints: { periodYears: { min: 10, max: 14.5 } },
    measurements: plan(eccentricTruth, (r) => ({
      astrometryJd: epochs(J2015, 14 * YR, 30, r, 30),
      sigmaMas: 1,
      velocityJd: epochs(J2015 + 200, 12 * YR, 20, r, 30),
      sigmaRadialVelocityKmS: 0.3,
    })),
  },
  circular: {
    name: 'near-circular (e = 0.03)',
    truth: circularTruth,
    hints: { periodYears: { min: 6.5, max: 10 } },
    measurements: plan(circularTruth, (r) => ({
      astrometryJd: epochs(J2015, 10 * YR, 30, r, 30),
      sigmaMas: 0.6,
    })),
  },
  edgeOn: {
    name: 'edge-on (i = 90°)',
    truth: edgeOnTruth,
    hints: { periodYears: { min: 8, max: 12 } },
    measurements: plan(edgeOnTruth, (r) => ({
      astrometryJd: epochs(J2015, 12 * YR, 30, r, 30),
      sigmaMas: 0.8,
      velocityJd: epochs(J2015 + 100, 11 * YR, 20, r, 30),
      sigmaRadialVelocityKmS: 0.4,
    })),
  },
  faceOn: {
    name: 'face-on (i = 0°)',
    truth: faceOnTruth,
    hints: { periodYears: { min: 7, max: 11 } },
    measurements: plan(faceOnTruth, (r) => ({
      astrometryJd: epochs(J2015, 11 * YR, 30, r, 30),
      sigmaMas: 0.8,
      polar: true,
    })),
  },
  covered: {
    name: 'e = 0.92, periapsis well covered',
    truth: coveredTruth,
    hints: { periodYears: { min: 12.5, max: 18 } },
    measurements: plan(coveredTruth, (r) => ({
      astrometryJd: [
        ...epochs(J2015, 10 * YR, 16, r, 20),
        ...epochs(J2015 + 6 * YR, 0.8 * YR, 10, r, 5),
      ].sort((a, b) => a - b),
      sigmaMas: 0.5,
      velocityJd: [
        ...epochs(J2015, 10 * YR, 8, r, 20),
        ...epochs(J2015 + 6.1 * YR, 0.6 * YR, 8, r, 5),
      ],
      sigmaRadialVelocityKmS: 15,
    })),
  },
  uncovered: {
    name: 'e = 0.91, periapsis not covered',
    truth: uncoveredTruth,
    hints: { periodYears: { min: 12, max: 26 } },
    measurements: plan(uncoveredTruth, (r) => ({
      astrometryJd: epochs(J2015 + 3 * YR, 11 * YR, 26, r, 20),
      sigmaMas: 0.5,
      velocityJd: epochs(J2015 + 3 * YR, 11 * YR, 12, r, 20),
      sigmaRadialVelocityKmS: 15,
    })),
  },
};
