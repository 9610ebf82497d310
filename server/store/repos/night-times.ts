/**
 * The instants a stored night is judged by: its span (local noon to the next local noon at its
 * site), the darkness the campaign asks for, and when it is over (sunrise). Computed by the sky
 * engine from the site as given (a site edit is judged by its new values) and remembered per
 * site position, date and darkness, since a plan or an import asks about the same night many times.
 */
import { DateTime } from 'luxon';
import {
  darknessExact,
  nightSpan,
  sunNight,
  validateLimits,
  validateSite,
  type Site,
} from '../../science/sky/index.ts';
import { jdToUnixMs } from '../../science/time/index.ts';

/** The site columns the night's instants depend on (a stored site row, or one being written). */
export interface SitePlace {
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
  timeZone: string;
}

/** The UTC interval of a night: local noon of its date to local noon of the next day, in the site's zone. */
export function nightIntervalUtc(date: string, timeZone: string): { start: string; end: string } {
  const noon = DateTime.fromISO(`${date}T12:00`, { zone: timeZone });
  return { start: noon.toUTC().toISO()!, end: noon.plus({ days: 1 }).toUTC().toISO()! };
}

/** A dark interval, Unix ms. */
export interface DarkSpan {
  startMs: number;
  endMs: number;
}

export interface NightTimes {
  /** Local noon to local noon, Unix ms. */
  startMs: number;
  endMs: number;
  /** Sunrise ending the night (the span's end where the Sun does not rise): the night is over. */
  overMs: number;
  dark: DarkSpan[];
  /** The darkness in words, e.g. "astronomical (Sun below -18°)". */
  darknessLabel: string;
}

const MEMO_SIZE = 4000;
const memo = new Map<string, NightTimes>();

function skySite(place: SitePlace): Site {
  const { name, latitudeDeg, longitudeDeg, elevationM, timeZone } = place;
  // Its own checks ran when the site was written; here only its geometry and zone are read.
  return validateSite(
    { name, latitudeDeg, longitudeDeg, elevationM, timeZone, longitudeZoneConfirmed: true },
    'site',
  );
}

/**
 * The instants of night `date` at `place` for a darkness limit (a twilight kind or a solar
 * altitude; undefined: the sky engine's default). Darkness and sunrise use the Sun's geometry only,
 * so pressure, temperature and the horizon mask do not enter.
 */
export function nightTimes(
  place: SitePlace,
  date: string,
  darkness: string | number | undefined,
): NightTimes {
  const key = JSON.stringify([
    place.latitudeDeg,
    place.longitudeDeg,
    place.elevationM,
    place.timeZone,
    date,
    darkness ?? null,
  ]);
  const hit = memo.get(key);
  if (hit) return hit;
  const site = skySite(place);
  const span = nightSpan(site, date);
  const limits = validateLimits(darkness === undefined ? {} : { darkness }, site, 'limits');
  const rise = sunNight(site, span).riseJd;
  const times: NightTimes = {
    startMs: jdToUnixMs(span.startJd),
    endMs: jdToUnixMs(span.endJd),
    overMs: jdToUnixMs(rise ?? span.endJd),
    dark: darknessExact(site, span, limits.sunLimitDeg).map((d) => ({
      startMs: jdToUnixMs(d.startJd),
      endMs: jdToUnixMs(d.endJd),
    })),
    darknessLabel: limits.darknessLabel,
  };
  if (memo.size >= MEMO_SIZE) memo.clear();
  memo.set(key, times);
  return times;
}

/** ISO 8601 UTC to the second, as messages show instants. */
export const isoSecond = (ms: number) => new Date(ms).toISOString().replace(/\.\d{3}Z$/, 'Z');
