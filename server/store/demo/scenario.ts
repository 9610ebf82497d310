/**
 * The demo campaign: an invented scenario. Every name, position and number here is made up for
 * the demo; none describes a real object, site, person or instrument.
 *
 * Vesper Core is an invented compact object of 2 × 10⁷ solar masses at 15 kpc with four stars on
 * eccentric orbits; the Lantern Pair is an invented visual binary at 18.6 pc; the Brindle Pair an
 * invented double-lined visual binary at 24.7 pc (mass ratio 0.81). Semi-major axes
 * follow from Kepler's third law, M = a³/P², so the stored orbits agree with the stated masses.
 *
 * The scenario is built relative to the moment it is loaded (the server's clock at first start),
 * so it is alive on any date: Ilex, the headline star, passes periapsis DEMO_DAYS.periapsis days
 * after that day, with a past season of nights behind it and allocated nights ahead at both sites.
 * Right ascensions turn with the anchor's day of the year, so each season falls at the same time
 * of year relative to the Sun as on the day the scenario was drawn up (DESIGNED_ON).
 */
import { DateTime } from 'luxon';
import { JULIAN_YEAR_DAYS } from '../../science/constants.ts';
import type { CampbellInput, OrbitInput } from '../../science/orbit/index.ts';
import { jdToIso, parseEpoch } from '../../science/time/index.ts';

/** The day the scenario's offsets were drawn up for; any other anchor shifts it as a whole. */
export const DESIGNED_ON = '2026-12-01';

/** The demo's calendar, in days from the anchor day (negative: before). */
export const DEMO_DAYS = {
  /** Ilex's periapsis (at 06:00 UTC), about seven months ahead. */
  periapsis: 213,
  passageCampaign: { start: -275, end: 334 },
  binaryCampaign: { start: -61, end: 150 },
  /** The past season at Tolvane Ridge, every 14 nights. */
  pastSeason: { start: -241, end: -66, step: 14 },
  /** The coming season at Tolvane Ridge, every 14 nights, and every 7 within a month of periapsis. */
  comingSeason: { start: 109, end: 298, step: 14 },
  densified: { start: 183, end: 244, step: 7 },
  /** Spectroscopy of Ilex at Ostrel Summit, every 28 nights. */
  secondSite: { start: 141, end: 288, step: 28 },
  /** The Lantern Pair at Ostrel Summit, every 21 nights, around the anchor. */
  binarySeason: { start: -52, end: 144, step: 21 },
  /** Seven weeks of bad weather in the past season: most of its nights are lost. */
  badMonth: { start: -200, end: -150 },
} as const;

/** The anchor's calendar: dates from day offsets, and how far the sky has turned since DESIGNED_ON. */
export interface DemoAnchor {
  /** The anchor day, YYYY-MM-DD (UTC). */
  today: string;
  /** Julian Date of the anchor day's 0h UTC: what the kept demo fits count their periapsis from. */
  dayJd: number;
  day: (offset: number) => string;
  /** An ISO 8601 instant `years` Julian years from the anchor day's noon UTC. */
  yearsFrom: (years: number) => string;
  /** Right-ascension shift, degrees, that keeps each season at its time of year. */
  raShiftDeg: number;
}

export function demoAnchor(nowIso: string): DemoAnchor {
  const today = nowIso.slice(0, 10);
  const base = DateTime.fromISO(today, { zone: 'UTC' });
  const days = base.diff(DateTime.fromISO(DESIGNED_ON, { zone: 'UTC' }), 'days').days;
  const noonJd = parseEpoch(`${today}T12:00:00Z`);
  return {
    today,
    dayJd: noonJd - 0.5,
    day: (offset) => base.plus({ days: offset }).toISODate()!,
    yearsFrom: (years) => jdToIso(noonJd + years * JULIAN_YEAR_DAYS),
    raShiftDeg: ((((days / JULIAN_YEAR_DAYS) % 1) + 1) % 1) * 360,
  };
}

/** Ilex's periapsis for a given anchor: what the demo's tests and screens look for. */
export function demoPeriapsis(nowIso: string): string {
  return `${demoAnchor(nowIso).day(DEMO_DAYS.periapsis)}T06:00:00.000Z`;
}

function turned(raDeg: number, anchor: DemoAnchor): number {
  return Number((((raDeg + anchor.raShiftDeg) % 360) + 360).toFixed(3)) % 360;
}

export function vesperSystem(anchor: DemoAnchor) {
  return {
    name: 'Vesper Core',
    raDeg: turned(263.842, anchor),
    decDeg: -21.716,
    pmRaMasYr: -2.9,
    pmDecMasYr: -5.1,
    distancePc: 15_000,
    massSolar: 2e7,
    notes: 'Invented compact object for the demo campaign.',
  };
}
export function lanternSystem(anchor: DemoAnchor) {
  return {
    name: 'Lantern Pair',
    raDeg: turned(96.318, anchor),
    decDeg: 12.407,
    pmRaMasYr: 143.2,
    pmDecMasYr: -61.8,
    positionEpoch: 'J2016.0',
    distancePc: 18.6,
    massSolar: 1.9,
    notes:
      'Invented visual binary for the demo campaign; catalogue position at J2016.0, moving 156 mas a year.',
  };
}

/** An invented double-lined visual binary: speckle positions and the velocities of both stars. */
export function brindleSystem(anchor: DemoAnchor) {
  return {
    name: 'Brindle Pair',
    raDeg: turned(41.775, anchor),
    decDeg: 4.318,
    pmRaMasYr: -38.4,
    pmDecMasYr: 22.9,
    distancePc: 24.7,
    massSolar: 2.3,
    notes:
      'Invented double-lined visual binary for the demo: both stars’ lines are measured, so the fit gives ' +
      'the orbital parallax and each mass.',
  };
}

/** The Brindle Pair's mass ratio M₂/M₁ (invented). */
export const BRINDLE_MASS_RATIO = 0.81;

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
  /** Periapsis, Julian years from the anchor day (Ilex's is set by DEMO_DAYS.periapsis). */
  periapsisYears: number | null;
  eccentricity: number;
  inclinationDeg: number;
  ascendingNodeDeg: number;
  argPeriapsisDeg: number;
}

/** The headline star, followed through its periapsis. */
export const HEADLINE = 'Ilex';

export const VESPER_STARS: DemoStar[] = [
  {
    name: HEADLINE,
    magnitude: 14.2,
    band: 'K',
    periodYears: 14.2,
    periapsisYears: null,
    eccentricity: 0.85,
    inclinationDeg: 52,
    ascendingNodeDeg: 147,
    argPeriapsisDeg: 238,
  },
  {
    name: 'Morrow',
    magnitude: 15.1,
    band: 'K',
    periodYears: 9.6,
    periapsisYears: -2.717,
    eccentricity: 0.62,
    inclinationDeg: 42,
    ascendingNodeDeg: 110,
    argPeriapsisDeg: 300,
  },
  {
    name: 'Quill',
    magnitude: 13.8,
    band: 'K',
    periodYears: 31.0,
    periapsisYears: 14.783,
    eccentricity: 0.93,
    inclinationDeg: 75,
    ascendingNodeDeg: 12,
    argPeriapsisDeg: 190,
  },
  {
    name: 'Sorrel',
    magnitude: 15.9,
    band: 'K',
    periodYears: 48.0,
    periapsisYears: -14.517,
    eccentricity: 0.41,
    inclinationDeg: 150,
    ascendingNodeDeg: 300,
    argPeriapsisDeg: 20,
  },
];

export function vesperOrbit(s: DemoStar, anchor: DemoAnchor): OrbitInput {
  const vesper = vesperSystem(anchor);
  return {
    elements: {
      periodYears: s.periodYears,
      periapsis:
        s.periapsisYears === null
          ? `${anchor.day(DEMO_DAYS.periapsis)}T06:00:00Z`
          : anchor.yearsFrom(s.periapsisYears),
      eccentricity: s.eccentricity,
      semiMajorAxisArcsec: Number(
        keplerAxisArcsec(vesper.massSolar, s.periodYears, vesper.distancePc).toFixed(6),
      ),
      inclinationDeg: s.inclinationDeg,
      ascendingNodeDeg: s.ascendingNodeDeg,
      argPeriapsisDeg: s.argPeriapsisDeg,
    },
    distancePc: vesper.distancePc,
    systemicVelocityKmS: 4.0,
    // Relativistic terms matter only for the star that dives deepest.
    relativity:
      s.name === HEADLINE
        ? { romer: true, gravitationalRedshift: true, transverseDoppler: true, precession: true }
        : {},
  };
}

/** A binary's orbit: its system's distance and mass set a by Kepler's third law (5 digits). */
function binaryOrbit(
  system: { distancePc: number; massSolar: number },
  el: Omit<CampbellInput, 'periapsis' | 'semiMajorAxisArcsec' | 'kind'>,
  periapsis: string,
  extra: Pick<OrbitInput, 'systemicVelocityKmS' | 'massRatio'>,
): OrbitInput {
  const a = keplerAxisArcsec(system.massSolar, el.periodYears, system.distancePc);
  return {
    elements: { ...el, periapsis, semiMajorAxisArcsec: Number(a.toFixed(5)) },
    distancePc: system.distancePc,
    ...extra,
  };
}

export function lanternOrbit(anchor: DemoAnchor): OrbitInput {
  return binaryOrbit(
    lanternSystem(anchor),
    {
      periodYears: 27.3,
      eccentricity: 0.47,
      inclinationDeg: 61,
      ascendingNodeDeg: 145,
      argPeriapsisDeg: 233,
    },
    anchor.yearsFrom(-7.217),
    { systemicVelocityKmS: -11.3 },
  );
}

export function brindleOrbit(anchor: DemoAnchor): OrbitInput {
  return binaryOrbit(
    brindleSystem(anchor),
    {
      periodYears: 3.84,
      eccentricity: 0.36,
      inclinationDeg: 72,
      ascendingNodeDeg: 204,
      argPeriapsisDeg: 118,
    },
    anchor.yearsFrom(-1.37),
    { systemicVelocityKmS: 6.2, massRatio: BRINDLE_MASS_RATIO },
  );
}

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
    // Invented precision: laser-assisted adaptive optics sharpens astrometry; a smaller spectrograph.
    astrometrySigmaMas: 0.4,
    spectroscopySigmaKmS: 8,
    referenceSeeingArcsec: 0.7,
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
      'Invented site. Laser guide star in use: follow the site’s laser-traffic rules. The summit to the ' +
      'south rises to 34°, above the 30° limit between azimuths 163° and 191°.',
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
    // Invented precision: natural-guide-star correction only, and a larger spectrograph.
    astrometrySigmaMas: 1.5,
    spectroscopySigmaKmS: 4,
    referenceSeeingArcsec: 0.9,
    notes: 'Invented site.',
  },
];

/**
 * Invented clear-night priors per calendar month (January first), one list per site of SITES, each
 * month worth DEMO_PRIOR_STRENGTH nights: a drier southern summer at Tolvane Ridge, a summer rainy
 * season at Ostrel Summit.
 */
export const DEMO_CLEAR_PRIORS = [
  [0.85, 0.8, 0.8, 0.75, 0.65, 0.6, 0.6, 0.65, 0.75, 0.8, 0.85, 0.85],
  [0.8, 0.8, 0.85, 0.9, 0.85, 0.6, 0.45, 0.45, 0.55, 0.75, 0.8, 0.8],
] as const;
export const DEMO_PRIOR_STRENGTH = 8;

/** Invented instrument labels. */
export const INSTRUMENTS = {
  imager: 'AO imager (demo)',
  spectrograph: 'IFU spectrograph (demo)',
  speckle: 'speckle camera (demo)',
  echelle: 'echelle spectrograph (demo)',
};
