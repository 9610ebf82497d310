/**
 * The demo campaign: an invented scenario. Every name, position and number here is made up for
 * the demo; none describes a real object, site, person or instrument.
 *
 * Vesper Core is an invented compact object of 2.6 million solar masses at 7.4 kpc with four
 * stars on eccentric orbits (s1 passes periapsis in June 2027); the Lantern Pair is an invented
 * visual binary at 18.6 pc. Semi-major axes follow from Kepler's third law, M = a³/P², so the
 * stored orbits agree with the stated masses.
 */
import type { OrbitInput } from '../../science/orbit/index.ts';

export const VESPER = {
  name: 'Vesper Core',
  raDeg: 263.842,
  decDeg: -21.716,
  pmRaMasYr: -2.9,
  pmDecMasYr: -5.1,
  distancePc: 7400,
  massSolar: 2.6e6,
  notes: 'Invented compact object for the demo campaign.',
};
export const LANTERN = {
  name: 'Lantern Pair',
  raDeg: 96.318,
  decDeg: 12.407,
  pmRaMasYr: 143.2,
  pmDecMasYr: -61.8,
  positionEpoch: 'J2016.0',
  distancePc: 18.6,
  massSolar: 1.9,
  notes: 'Invented visual binary for the demo campaign; position at J2016.0, moving 1.7″ by 2027.',
};

/** Angular semi-major axis, arcsec, from mass (M☉), period (yr) and distance (pc): a[au] = (M·P²)^(1/3). */
export function keplerAxisArcsec(
  massSolar: number,
  periodYears: number,
  distancePc: number,
): number {
  return Math.cbrt(massSolar * periodYears * periodYears) / distancePc;
}

interface DemoStar {
  name: string;
  magnitude: number;
  band: string;
  periodYears: number;
  periapsis: string;
  eccentricity: number;
  inclinationDeg: number;
  ascendingNodeDeg: number;
  argPeriapsisDeg: number;
}

export const VESPER_STARS: DemoStar[] = [
  {
    name: 'VC s1',
    magnitude: 14.2,
    band: 'K',
    periodYears: 14.2,
    periapsis: '2027-06-14T06:00:00Z',
    eccentricity: 0.87,
    inclinationDeg: 128,
    ascendingNodeDeg: 231,
    argPeriapsisDeg: 64,
  },
  {
    name: 'VC s2',
    magnitude: 15.1,
    band: 'K',
    periodYears: 9.6,
    periapsis: 'J2024.2',
    eccentricity: 0.62,
    inclinationDeg: 42,
    ascendingNodeDeg: 110,
    argPeriapsisDeg: 300,
  },
  {
    name: 'VC s3',
    magnitude: 13.8,
    band: 'K',
    periodYears: 31.0,
    periapsis: 'J2041.7',
    eccentricity: 0.93,
    inclinationDeg: 75,
    ascendingNodeDeg: 12,
    argPeriapsisDeg: 190,
  },
  {
    name: 'VC s4',
    magnitude: 15.9,
    band: 'K',
    periodYears: 48.0,
    periapsis: 'J2012.4',
    eccentricity: 0.41,
    inclinationDeg: 150,
    ascendingNodeDeg: 300,
    argPeriapsisDeg: 20,
  },
];

export function vesperOrbit(s: DemoStar): OrbitInput {
  return {
    elements: {
      periodYears: s.periodYears,
      periapsis: s.periapsis,
      eccentricity: s.eccentricity,
      semiMajorAxisArcsec: Number(
        keplerAxisArcsec(VESPER.massSolar, s.periodYears, VESPER.distancePc).toFixed(6),
      ),
      inclinationDeg: s.inclinationDeg,
      ascendingNodeDeg: s.ascendingNodeDeg,
      argPeriapsisDeg: s.argPeriapsisDeg,
    },
    distancePc: VESPER.distancePc,
    systemicVelocityKmS: 4.0,
    // Relativistic terms matter only for the star that dives deepest.
    relativity:
      s.name === 'VC s1'
        ? { romer: true, gravitationalRedshift: true, transverseDoppler: true, precession: true }
        : {},
  };
}

export const LANTERN_B_ORBIT: OrbitInput = {
  elements: {
    periodYears: 27.3,
    periapsis: 'J2019.7',
    eccentricity: 0.47,
    semiMajorAxisArcsec: Number(
      keplerAxisArcsec(LANTERN.massSolar, 27.3, LANTERN.distancePc).toFixed(5),
    ),
    inclinationDeg: 61,
    ascendingNodeDeg: 145,
    argPeriapsisDeg: 233,
  },
  distancePc: LANTERN.distancePc,
  systemicVelocityKmS: -11.3,
  covariance: {
    parameters: ['periodYears', 'periapsisDays', 'eccentricity', 'semiMajorAxisArcsec'],
    matrix: [
      [0.04, 2.0, 0.0006, 0.0001],
      [2.0, 400, 0.02, 0.004],
      [0.0006, 0.02, 0.0001, 0.000002],
      [0.0001, 0.004, 0.000002, 0.000009],
    ],
  },
};

export const SITES = [
  {
    name: 'Tolvane Ridge',
    latitudeDeg: -24.931,
    longitudeDeg: -69.517,
    elevationM: 2710,
    timeZone: 'America/Santiago',
    lowestAltitudeDeg: 30,
    leastSunDistanceDeg: 45,
    pressureHpa: 742,
    temperatureC: 9,
    laserGuideStar: true,
    // An invented neighbouring summit rises above the 30° limit to the south; low ridges elsewhere.
    horizonMask: [
      { azimuthDeg: 0, altitudeDeg: 8 },
      { azimuthDeg: 60, altitudeDeg: 6 },
      { azimuthDeg: 120, altitudeDeg: 10 },
      { azimuthDeg: 150, altitudeDeg: 22 },
      { azimuthDeg: 170, altitudeDeg: 34 },
      { azimuthDeg: 190, altitudeDeg: 31 },
      { azimuthDeg: 210, altitudeDeg: 14 },
      { azimuthDeg: 260, altitudeDeg: 7 },
      { azimuthDeg: 320, altitudeDeg: 9 },
    ],
    notes:
      'Invented site. Laser guide star in use: follow the site’s laser-traffic rules. The summit to the south rises to 34°, above the 30° limit between azimuths 163° and 191°.',
  },
  {
    name: 'Ostrel Summit',
    latitudeDeg: 23.614,
    longitudeDeg: -105.982,
    elevationM: 2930,
    timeZone: 'America/Mazatlan',
    lowestAltitudeDeg: 25,
    leastSunDistanceDeg: 40,
    pressureHpa: 718,
    temperatureC: 4,
    laserGuideStar: false,
    notes: 'Invented site.',
  },
];

/** Invented instrument labels. */
export const INSTRUMENTS = {
  imager: 'AO imager (demo)',
  spectrograph: 'IFU spectrograph (demo)',
  speckle: 'speckle camera (demo)',
};
