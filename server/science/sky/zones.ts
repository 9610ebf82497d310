/**
 * A site's time zone: an IANA name, checked with the nearest valid names offered for a typo, and
 * checked against the site's longitude, since a longitude with the wrong sign (or a zone from the
 * wrong continent) otherwise gives a night with dawn before dusk and no other warning.
 */
import { IANAZone } from 'luxon';
import { InputError } from '../errors.ts';

/**
 * Largest accepted gap, hours, between a zone's UTC offset and the longitude's mean solar time
 * (longitude / 15°). Zones of wide countries reach about 3 h (a single zone across a continent),
 * so the bound sits just above; a wrong-signed longitude is off by 2 × longitude / 15 h.
 * (common practice, no source: the widest zones in use, from memory)
 */
export const ZONE_LONGITUDE_TOLERANCE_HOURS = 3;

/** UTC under its names: a site that keeps its log in UTC does so on purpose, at any longitude. */
const UTC_NAMES = new Set([
  'utc',
  'etc/utc',
  'etc/uct',
  'uct',
  'gmt',
  'etc/gmt',
  'universal',
  'etc/universal',
  'zulu',
  'etc/zulu',
]);

/** Above this |latitude| (degrees) meridians crowd together and stations keep any zone: no check. */
const POLAR_LATITUDE_DEG = 80;

let zoneNames: readonly string[] | null = null;
function allZones(): readonly string[] {
  zoneNames ??= [...Intl.supportedValuesOf('timeZone'), 'UTC'];
  return zoneNames;
}

/** Edit distance (insertions, deletions, substitutions), case-insensitive. */
function distance(a: string, b: string): number {
  const x = a.toLowerCase();
  const y = b.toLowerCase();
  let prev = Array.from({ length: y.length + 1 }, (_, j) => j);
  for (let i = 1; i <= x.length; i++) {
    const row = [i];
    for (let j = 1; j <= y.length; j++) {
      const cost = x[i - 1] === y[j - 1] ? 0 : 1;
      row.push(Math.min(prev[j]! + 1, row[j - 1]! + 1, prev[j - 1]! + cost));
    }
    prev = row;
  }
  return prev[y.length]!;
}

/**
 * Up to `count` valid zone names nearest to a mistyped one: a case or separator slip first
 * (`america/santiago`, `America/Santiago_`), then the same city under another region
 * (`Europe/Santiago`), then by edit distance over the name and over its city.
 */
export function nearestZones(typed: string, count = 3): string[] {
  const key = (s: string) => s.toLowerCase().replace(/[\s_-]+/g, '');
  const city = (s: string) => key(s.split('/').at(-1) ?? s);
  const t = typed.trim();
  const scored = allZones().map((z) => {
    const exact = key(z) === key(t) ? 0 : 1;
    const sameCity = city(z) === city(t) ? 0 : 1;
    const d = Math.min(distance(z, t), distance(city(z), city(t)) + 1);
    return { z, score: exact * 1000 + sameCity * 100 + d };
  });
  scored.sort((a, b) => a.score - b.score || a.z.localeCompare(b.z));
  return scored.slice(0, count).map((s) => s.z);
}

/** Zone names already found valid: luxon's check builds an Intl formatter each time, and sites are checked often. */
const knownZones = new Set<string>();

/**
 * Check an IANA time zone name.
 * @throws InputError naming the nearest valid names when the zone is unknown
 */
export function checkTimeZone(value: unknown, field = 'timeZone'): string {
  if (typeof value !== 'string' || value.trim() === '') {
    throw new InputError(
      field,
      value,
      'must be an IANA time zone name such as "America/Santiago" or "UTC"',
    );
  }
  if (knownZones.has(value)) return value;
  if (IANAZone.isValidZone(value)) {
    knownZones.add(value);
    return value;
  }
  const near = nearestZones(value);
  throw new InputError(
    field,
    value,
    `is not an IANA time zone name; nearest valid names: ${near.map((n) => `"${n}"`).join(', ')}`,
  );
}

/** A disagreement between a site's longitude and its time zone, with the likely correction. */
export interface ZoneMismatch {
  /** The zone's UTC offsets over the year that is nearest to the longitude's, hours. */
  zoneOffsetHours: number;
  /** Mean solar time at the longitude, hours east of UTC (longitude / 15°). */
  meanSolarHours: number;
  /** Gap between the two, hours, folded into [0, 12]. */
  gapHours: number;
  /** What to change: the longitude with its sign flipped when that fits the zone, else the zone. */
  correction: string;
}

const utcHours = (x: number) => `UTC${x < 0 ? '−' : '+'}${Math.abs(x).toFixed(1)} h`;

const gap = (a: number, b: number) => {
  const d = Math.abs(a - b) % 24;
  return d > 12 ? 24 - d : d;
};

/** The zone's UTC offsets in January and July of 2000–2030 (standard and summer time), hours. */
function zoneOffsetsHours(zone: string): number[] {
  const known = offsetsByZone.get(zone);
  if (known) return known;
  const z = IANAZone.create(zone);
  const out = new Set<number>();
  for (const year of [2000, 2015, 2030]) {
    for (const month of [0, 6]) out.add(z.offset(Date.UTC(year, month, 15)) / 60);
  }
  offsetsByZone.set(zone, [...out]);
  return [...out];
}
/** Each zone's offsets, computed once: the rules of past and fixed dates do not change while we run. */
const offsetsByZone = new Map<string, number[]>();

/**
 * Whether a longitude (degrees east) contradicts a zone by more than
 * ZONE_LONGITUDE_TOLERANCE_HOURS; null when they agree, for UTC itself, or at polar latitudes
 * where any zone is kept. Zone offsets are taken over several years, so a zone whose rules changed is not refused.
 */
export function longitudeZoneMismatch(
  latitudeDeg: number,
  longitudeDeg: number,
  zone: string,
): ZoneMismatch | null {
  if (Math.abs(latitudeDeg) > POLAR_LATITUDE_DEG || UTC_NAMES.has(zone.toLowerCase())) return null;
  const solar = longitudeDeg / 15;
  const offsets = zoneOffsetsHours(zone);
  const nearest = (h: number) =>
    offsets.reduce((best, o) => (gap(o, h) < gap(best, h) ? o : best), offsets[0]!);
  const offset = nearest(solar);
  const g = gap(offset, solar);
  if (g <= ZONE_LONGITUDE_TOLERANCE_HOURS) return null;
  const flipped = -longitudeDeg;
  const fitsFlipped = gap(nearest(flipped / 15), flipped / 15) <= ZONE_LONGITUDE_TOLERANCE_HOURS;
  const correction = fitsFlipped
    ? `longitude ${flipped.toFixed(4)}° (east positive; the sign looks flipped)`
    : `a zone near ${utcHours(Math.round(solar))} for this longitude, or the longitude of the site in ${zone}`;
  return { zoneOffsetHours: offset, meanSolarHours: solar, gapHours: g, correction };
}

/** The refusal's rule for a mismatch, naming both times and the likely correction. */
export function describeMismatch(m: ZoneMismatch, longitudeDeg: number, zone: string): string {
  const h = utcHours;
  return (
    `contradicts the time zone: longitude ${Number(longitudeDeg.toFixed(4))}° keeps mean solar ` +
    `time ${h(m.meanSolarHours)}, ` +
    `but ${zone} is ${h(m.zoneOffsetHours)} (${m.gapHours.toFixed(1)} h apart, more than ` +
    `${ZONE_LONGITUDE_TOLERANCE_HOURS} h); likely correction: ${m.correction}; ` +
    'or confirm with longitudeZoneConfirmed: true to keep both as they are'
  );
}
