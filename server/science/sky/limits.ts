/**
 * What makes a target observable on a night: darkness, altitude or airmass, the horizon mask, the
 * Moon's distance and the Sun-avoidance angle. Validated once, then read by both paths.
 */
import { InputError, requireFinite } from '../errors.ts';
import { AIRMASS_FORMULAS, altitudeForAirmass, type AirmassFormula } from './airmass.ts';
import { siteRefraction } from './refraction.ts';
import type { HorizonPoint, Site } from './site.ts';
import { TWILIGHT_SUN_ALTITUDE_DEG, type TwilightKind } from './sun-moon.ts';

export interface LimitsInput {
  /** Darkness limit: a twilight kind, or the highest solar altitude in degrees, [−30, 0]. Default "astronomical". */
  darkness?: TwilightKind | number;
  /** Lowest refracted altitude, degrees, [−5, 89]. */
  lowestAltitudeDeg?: number;
  /** Highest airmass, (1, 40]. Default 2 when no lowestAltitudeDeg is given. */
  highestAirmass?: number;
  /** Airmass formula; default "kasten-young". */
  airmassFormula?: AirmassFormula;
  /** Least distance from the Moon while it is above the horizon, degrees, [0, 180). Default 30. */
  leastMoonDistanceDeg?: number;
  /** Overrides the site's Sun-avoidance angle, degrees, [0, 180). */
  leastSunDistanceDeg?: number;
  /** Apply the site's horizon mask; default true. */
  useHorizonMask?: boolean;
  /** Seeing FWHM at the zenith, arcsec, (0, 10]: reported at the best airmass when given. */
  zenithSeeingArcsec?: number;
}

export interface Limits {
  /** Highest geometric solar altitude counted as dark, degrees. */
  sunLimitDeg: number;
  darknessLabel: string;
  /** Lowest refracted altitude, degrees: the strictest of the site's, the requested one and the airmass limit. */
  altitudeLimitDeg: number;
  highestAirmass: number | null;
  airmassFormula: AirmassFormula;
  leastMoonDistanceDeg: number;
  leastSunDistanceDeg: number;
  mask: HorizonPoint[];
  zenithSeeingArcsec: number | null;
}

/** Default airmass limit (common practice, no source). */
export const DEFAULT_HIGHEST_AIRMASS = 2;
/** Default Moon distance, degrees (common practice, no source). */
export const DEFAULT_LEAST_MOON_DISTANCE_DEG = 30;

function bounded(
  field: string,
  value: unknown,
  lo: number,
  hi: number,
  open: 'lo' | 'hi' | 'none',
): number {
  const x = requireFinite(field, value);
  const bad = (open === 'lo' ? x <= lo : x < lo) || (open === 'hi' ? x >= hi : x > hi);
  if (bad)
    throw new InputError(
      field,
      value,
      `must lie in ${open === 'lo' ? '(' : '['}${lo}, ${hi}${open === 'hi' ? ')' : ']'}`,
    );
  return x;
}

/** Check limits against a site and fill the defaults. @throws InputError naming the field. */
export function validateLimits(input: unknown, site: Site, prefix = 'limits'): Limits {
  const c = (input ?? {}) as Record<string, unknown>;
  if (typeof c !== 'object' || Array.isArray(c))
    throw new InputError(prefix, input, 'must be an object');
  const f = (k: string) => `${prefix}.${k}`;
  let sunLimitDeg: number;
  let darknessLabel: string;
  const d = c.darkness ?? 'astronomical';
  if (typeof d === 'string') {
    if (!(d in TWILIGHT_SUN_ALTITUDE_DEG))
      throw new InputError(
        f('darkness'),
        d,
        'must be "civil", "nautical", "astronomical" or a solar altitude in degrees',
      );
    sunLimitDeg = TWILIGHT_SUN_ALTITUDE_DEG[d as TwilightKind];
    darknessLabel = `${d} (Sun below ${sunLimitDeg}°)`;
  } else {
    sunLimitDeg = bounded(f('darkness'), d, -30, 0, 'none');
    darknessLabel = `Sun below ${sunLimitDeg}°`;
  }
  const formula = c.airmassFormula ?? 'kasten-young';
  if (typeof formula !== 'string' || !(AIRMASS_FORMULAS as readonly string[]).includes(formula)) {
    throw new InputError(
      f('airmassFormula'),
      formula,
      `must be one of ${AIRMASS_FORMULAS.join(', ')}`,
    );
  }
  const minAlt =
    c.lowestAltitudeDeg === undefined
      ? null
      : bounded(f('lowestAltitudeDeg'), c.lowestAltitudeDeg, -5, 89, 'none');
  const highestAirmass =
    c.highestAirmass !== undefined
      ? bounded(f('highestAirmass'), c.highestAirmass, 1, 40, 'lo')
      : minAlt === null
        ? DEFAULT_HIGHEST_AIRMASS
        : null;
  const refraction = siteRefraction(site);
  const airmassAlt =
    highestAirmass === null
      ? -90
      : altitudeForAirmass(formula as AirmassFormula, highestAirmass, refraction);
  const useMask = c.useHorizonMask ?? true;
  if (typeof useMask !== 'boolean')
    throw new InputError(f('useHorizonMask'), useMask, 'must be true or false');
  return {
    sunLimitDeg,
    darknessLabel,
    altitudeLimitDeg: Math.max(site.lowestAltitudeDeg, minAlt ?? -90, airmassAlt),
    highestAirmass,
    airmassFormula: formula as AirmassFormula,
    leastMoonDistanceDeg:
      c.leastMoonDistanceDeg === undefined
        ? DEFAULT_LEAST_MOON_DISTANCE_DEG
        : bounded(f('leastMoonDistanceDeg'), c.leastMoonDistanceDeg, 0, 180, 'hi'),
    leastSunDistanceDeg:
      c.leastSunDistanceDeg === undefined
        ? site.leastSunDistanceDeg
        : bounded(f('leastSunDistanceDeg'), c.leastSunDistanceDeg, 0, 180, 'hi'),
    mask: useMask ? site.horizonMask : [],
    zenithSeeingArcsec:
      c.zenithSeeingArcsec === undefined
        ? null
        : bounded(f('zenithSeeingArcsec'), c.zenithSeeingArcsec, 0, 10, 'lo'),
  };
}
