/** Shared inputs for the planning tests: an invented site and targets (demo values, no source needed). */
import type { CovarianceInput } from '../../../server/science/orbit/index.ts';
import {
  validateLimits,
  validateSite,
  validateTarget,
  exactSampler,
  TWILIGHT_SUN_ALTITUDE_DEG,
  type Site,
  type Limits,
  type Target,
} from '../../../server/science/sky/index.ts';

export const SITE: Site = validateSite({
  name: 'Harrow Crest',
  latitudeDeg: -29.25,
  longitudeDeg: -70.73,
  elevationM: 2400,
  timeZone: 'America/Santiago',
  lowestAltitudeDeg: 25,
  leastSunDistanceDeg: 45,
});
/** A second southern site six time zones east of SITE (invented). */
export const EAST_SITE: Site = validateSite({
  name: 'Quill Downs',
  latitudeDeg: -23.3,
  longitudeDeg: 16.5,
  elevationM: 1800,
  timeZone: 'Africa/Windhoek',
  lowestAltitudeDeg: 25,
  leastSunDistanceDeg: 45,
});
export const CONSTRAINTS: Limits = validateLimits({ highestAirmass: 2 }, SITE);
/** Loose limits of the weather tests (constructed case): airmass to 2.2, the Moon no closer than 5°. */
export const weatherLimits = (s: Site): Limits =>
  validateLimits({ highestAirmass: 2.2, leastMoonDistanceDeg: 5 }, s);
/** A covariance that knows the passage date to 0.3 d and the other elements well (constructed case). */
export const PASSAGE_KNOWN_TO_0_3_DAYS: CovarianceInput = {
  parameters: ['periodYears', 'periapsisDays', 'eccentricity', 'semiMajorAxisArcsec'],
  matrix: [
    [1e-6, 0, 0, 0],
    [0, 0.3 ** 2, 0, 0],
    [0, 0, 1e-6, 0],
    [0, 0, 0, 1e-8],
  ],
};

/** Targets spread in right ascension along declination −30° (invented). */
export function spreadTargets(n: number, decDeg = -30): Target[] {
  return Array.from({ length: n }, (_, i) =>
    validateTarget({ name: `F${i}`, raDeg: (i * 360) / n, decDeg }),
  );
}

/**
 * Independent check of one instant with astronomy-engine per instant (the sky engine's exact path):
 * the Sun below astronomical twilight (−18°, Explanatory Supplement to the Astronomical Almanac),
 * the target above the altitude limit and outside the Sun-avoidance angle.
 */
export function safeAt(
  site: Site,
  c: Limits,
  target: Target,
  jd: number,
  toleranceDeg = 0.05,
): string | null {
  const s = exactSampler(site, target)(jd);
  if (s.sunAltitudeDeg > TWILIGHT_SUN_ALTITUDE_DEG.astronomical + 0.01)
    return `Sun at ${s.sunAltitudeDeg.toFixed(2)}°`;
  if (s.altitudeDeg < c.altitudeLimitDeg - toleranceDeg)
    return `target at ${s.altitudeDeg.toFixed(2)}° below ${c.altitudeLimitDeg.toFixed(2)}°`;
  if (s.sunSeparationDeg < c.leastSunDistanceDeg)
    return `target ${s.sunSeparationDeg.toFixed(1)}° from the Sun`;
  return null;
}

export const isoToJd = (iso: string) => Date.parse(iso) / 86_400_000 + 2_440_587.5;
