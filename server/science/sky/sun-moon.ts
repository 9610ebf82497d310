/**
 * The Sun and the Moon over one night, through astronomy-engine's own searches: rise, set and
 * transit, the three twilights, the Moon's illumination and phase. This is the exact path; the fast
 * twilight of `frame.ts` is checked against it.
 */
import {
  Body,
  Equator,
  Horizon,
  Illumination,
  MoonPhase,
  SearchAltitude,
  SearchHourAngle,
  SearchRiseSet,
  type AstroTime,
} from 'astronomy-engine';
import { DEG, JD_J2000 } from '../constants.ts';
import { astroTime } from './apparent.ts';
import type { NightSpan } from './night.ts';
import type { Site } from './site.ts';
import { unitFromRaDec, type Vec3 } from './vectors.ts';

/**
 * Solar altitudes (degrees, centre, no refraction) that end each twilight. Explanatory Supplement to
 * the Astronomical Almanac.
 */
export const TWILIGHT_SUN_ALTITUDE_DEG = { civil: -6, nautical: -12, astronomical: -18 } as const;
export type TwilightKind = keyof typeof TWILIGHT_SUN_ALTITUDE_DEG;

const jdOf = (t: AstroTime | null): number | null => (t === null ? null : t.ut + JD_J2000);

/** First crossing of a Sun/Moon altitude in the span, or null. `direction` −1 descending, +1 ascending. */
function crossing(
  body: Body,
  site: Site,
  span: NightSpan,
  direction: 1 | -1,
  altitudeDeg: number | 'rise-set',
): number | null {
  const start = astroTime(span.startJd);
  const limit = span.endJd - span.startJd;
  const t =
    altitudeDeg === 'rise-set'
      ? SearchRiseSet(body, site.observer, direction, start, limit)
      : SearchAltitude(body, site.observer, direction, start, limit, altitudeDeg);
  const jd = jdOf(t);
  return jd !== null && jd <= span.endJd ? jd : null;
}

/** Topocentric apparent direction of date and geometric altitude (degrees) of the Sun or Moon. */
export function bodyPlace(
  body: Body.Sun | Body.Moon,
  site: Site,
  jdUtc: number,
): { ofDate: Vec3; altitudeDeg: number; azimuthDeg: number } {
  const time = astroTime(jdUtc);
  const eq = Equator(body, time, site.observer, true, true);
  const hor = Horizon(time, site.observer, eq.ra, eq.dec);
  return {
    ofDate: unitFromRaDec(eq.ra * 15 * DEG, eq.dec * DEG),
    altitudeDeg: hor.altitude,
    azimuthDeg: hor.azimuth,
  };
}

export interface SunNight {
  /** Sunset and sunrise (upper limb, standard refraction) inside the night, or null when there is none. */
  setJd: number | null;
  riseJd: number | null;
  /** Lower transit (local solar midnight) inside the night. */
  midnightJd: number;
  /** End of evening twilight (Sun descending through the limit) and start of morning twilight, per kind. */
  dusk: Record<TwilightKind, number | null>;
  dawn: Record<TwilightKind, number | null>;
}

export function sunNight(site: Site, span: NightSpan): SunNight {
  const dusk = {} as Record<TwilightKind, number | null>;
  const dawn = {} as Record<TwilightKind, number | null>;
  for (const kind of Object.keys(TWILIGHT_SUN_ALTITUDE_DEG) as TwilightKind[]) {
    dusk[kind] = crossing(Body.Sun, site, span, -1, TWILIGHT_SUN_ALTITUDE_DEG[kind]);
    dawn[kind] = crossing(Body.Sun, site, span, 1, TWILIGHT_SUN_ALTITUDE_DEG[kind]);
  }
  const lower = SearchHourAngle(Body.Sun, site.observer, 12, astroTime(span.startJd));
  return {
    setJd: crossing(Body.Sun, site, span, -1, 'rise-set'),
    riseJd: crossing(Body.Sun, site, span, 1, 'rise-set'),
    midnightJd: lower.time.ut + JD_J2000,
    dusk,
    dawn,
  };
}

export interface MoonNight {
  riseJd: number | null;
  setJd: number | null;
  /** Upper transit inside the night, or null. */
  transitJd: number | null;
  /** Illuminated fraction of the disc at local solar midnight, [0, 1]. */
  illuminatedFraction: number;
  /**
   * Moon − Sun ecliptic longitude at local solar midnight, degrees: 0 new, 90 first quarter, 180 full,
   * 270 last quarter.
   */
  phaseDeg: number;
}

export function moonNight(site: Site, span: NightSpan, midnightJd: number): MoonNight {
  const t = astroTime(midnightJd);
  const transit = SearchHourAngle(Body.Moon, site.observer, 0, astroTime(span.startJd));
  const transitJd = transit.time.ut + JD_J2000;
  return {
    riseJd: crossing(Body.Moon, site, span, 1, 'rise-set'),
    setJd: crossing(Body.Moon, site, span, -1, 'rise-set'),
    transitJd: transitJd <= span.endJd ? transitJd : null,
    illuminatedFraction: Illumination(Body.Moon, t).phase_fraction,
    phaseDeg: MoonPhase(t),
  };
}
