/**
 * What makes a target observable on a night: darkness, altitude or airmass, the horizon mask, the
 * Moon's distance and the Sun-avoidance angle. Validated once, then read by both paths.
 */
import { InputError, requireFinite } from '../errors.ts';
import { AIRMASS_FORMULAS, altitudeForAirmass, type AirmassFormula } from './airmass.ts';
import { refractionScale } from './refraction.ts';
import type { HorizonPoint, Site } from './site.ts';
import { TWILIGHT_SUN_ALTITUDE_DEG, type TwilightKind } from './sun-moon.ts';

export interface ConstraintsInput {
  /** Darkness limit: a twilight kind, or the highest solar altitude in degrees, [−30, 0]. Default "astronomical". */
  darkness?: TwilightKind | number;
  /** Lowest refracted altitude, degrees, [−5, 89]. */
  minAltitudeDeg?: number;
  /** Highest airmass, (1, 40]. Default 2 when no minAltitudeDeg is given. */
  maxAirmass?: number;
  /** Airmass formula; default "kasten-young". */
  airmassFormula?: AirmassFormula;
  /** Least distance from the Moon while it is above the horizon, degrees, [0, 180). Default 30. */
  minMoonSeparationDeg?: number;
  /** Overrides the site's Sun-avoidance angle, degrees, [0, 180). */
  sunAvoidanceDeg?: number;
  /** Apply the site's horizon mask; default true. */
  useHorizonMask?: boolean;
  /** Seeing FWHM at the zenith, arcsec, (0, 10]: reported at the best airmass when given. */
  zenithSeeingArcsec?: number;
}

export interface Constraints {
  /** Highest geometric solar altitude counted as dark, degrees. */
  sunLimitDeg: number;
  darknessLabel: string;
  /** Lowest refracted altitude, degrees: the strictest of the site's, the constraint's and the airmass limit. */
  altitudeLimitDeg: number;
  maxAirmass: number | null;
  airmassFormula: AirmassFormula;
  minMoonSeparationDeg: number;
  sunAvoidanceDeg: number;
  mask: HorizonPoint[];
  zenithSeeingArcsec: number | null;
}

/** Default airmass limit (common practice, no source). */
export const DEFAULT_MAX_AIRMASS = 2;
/** Default Moon distance, degrees (common practice, no source). */
export const DEFAULT_MOON_SEPARATION_DEG = 30;

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

/** Check constraints against a site and fill the defaults. @throws InputError naming the field. */
export function validateConstraints(
  input: unknown,
  site: Site,
  prefix = 'constraints',
): Constraints {
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
    c.minAltitudeDeg === undefined
      ? null
      : bounded(f('minAltitudeDeg'), c.minAltitudeDeg, -5, 89, 'none');
  const maxAirmass =
    c.maxAirmass !== undefined
      ? bounded(f('maxAirmass'), c.maxAirmass, 1, 40, 'lo')
      : minAlt === null
        ? DEFAULT_MAX_AIRMASS
        : null;
  const scale = refractionScale(site.pressureHpa, site.temperatureC);
  const airmassAlt =
    maxAirmass === null ? -90 : altitudeForAirmass(formula as AirmassFormula, maxAirmass, scale);
  const useMask = c.useHorizonMask ?? true;
  if (typeof useMask !== 'boolean')
    throw new InputError(f('useHorizonMask'), useMask, 'must be true or false');
  return {
    sunLimitDeg,
    darknessLabel,
    altitudeLimitDeg: Math.max(site.minAltitudeDeg, minAlt ?? -90, airmassAlt),
    maxAirmass,
    airmassFormula: formula as AirmassFormula,
    minMoonSeparationDeg:
      c.minMoonSeparationDeg === undefined
        ? DEFAULT_MOON_SEPARATION_DEG
        : bounded(f('minMoonSeparationDeg'), c.minMoonSeparationDeg, 0, 180, 'hi'),
    sunAvoidanceDeg:
      c.sunAvoidanceDeg === undefined
        ? site.sunAvoidanceDeg
        : bounded(f('sunAvoidanceDeg'), c.sunAvoidanceDeg, 0, 180, 'hi'),
    mask: useMask ? site.horizonMask : [],
    zenithSeeingArcsec:
      c.zenithSeeingArcsec === undefined
        ? null
        : bounded(f('zenithSeeingArcsec'), c.zenithSeeingArcsec, 0, 10, 'lo'),
  };
}
