/**
 * Nights: a site and the local date on which the evening falls. A night runs from local noon to the
 * next local noon in the site's IANA zone, so it lasts 23 or 25 hours across a daylight-saving change.
 */
import { DateTime } from 'luxon';
import { InputError } from '../errors.ts';
import { jdToUnixMs, unixMsToJd } from '../time/index.ts';
import type { Site } from './site.ts';

export interface NightSpan {
  /** Local evening date, YYYY-MM-DD. */
  date: string;
  /** Local noon on `date` and on the next day, as UTC Julian Dates. */
  startJd: number;
  endJd: number;
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Parse a local evening date. @throws InputError unless it is a real YYYY-MM-DD date in 1900–2100. */
export function parseNightDate(
  value: unknown,
  field = 'date',
): { year: number; month: number; day: number } {
  const m = typeof value === 'string' ? DATE_RE.exec(value) : null;
  if (!m)
    throw new InputError(
      field,
      value,
      'must be a local date YYYY-MM-DD (the date on which the evening falls)',
    );
  const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const dt = DateTime.fromObject({ year, month, day }, { zone: 'UTC' });
  if (!dt.isValid || dt.month !== month || dt.day !== day)
    throw new InputError(field, value, 'is not a real calendar date');
  if (year < 1900 || year > 2100)
    throw new InputError(field, value, 'must lie between the years 1900 and 2100');
  return { year, month, day };
}

/** The noon-to-noon span of a night at a site. */
export function nightSpan(site: Site, date: string, field = 'date'): NightSpan {
  const { year, month, day } = parseNightDate(date, field);
  const noon = DateTime.fromObject({ year, month, day, hour: 12 }, { zone: site.timeZone });
  const next = noon.plus({ days: 1 });
  return { date, startJd: unixMsToJd(noon.toMillis()), endJd: unixMsToJd(next.toMillis()) };
}

/** The night (local evening date, YYYY-MM-DD) an instant falls in: nights run from local noon to local noon. */
export function nightOf(jd: number, timeZone: string): string {
  return DateTime.fromMillis(jdToUnixMs(jd - 0.5), { zone: timeZone }).toISODate()!;
}

/** The night whose evening follows `date` by `offsetDays` days, as YYYY-MM-DD. */
export function addDays(date: string, offsetDays: number): string {
  const { year, month, day } = parseNightDate(date);
  return DateTime.fromObject({ year, month, day }, { zone: 'UTC' })
    .plus({ days: offsetDays })
    .toISODate()!;
}

/** An instant shown both ways: ISO 8601 UTC and ISO 8601 in the site's zone with its offset. */
export interface Instant {
  utc: string;
  local: string;
}

export function instant(jd: number, timeZone: string): Instant {
  const ms = Math.round(jdToUnixMs(jd) / 1000) * 1000;
  return {
    utc: new Date(ms).toISOString().replace('.000Z', 'Z'),
    local: DateTime.fromMillis(ms, { zone: timeZone }).toISO({ suppressMilliseconds: true })!,
  };
}
