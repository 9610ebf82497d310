/**
 * Epochs: every form a user may type, turned into a Julian Date, and back.
 *
 * Accepted strings (case-insensitive prefixes, optional space after the prefix):
 * - ISO 8601 with any zone designator: `Z`, `±hh`, `±hh:mm` or `±hhmm` (`2027-03-01T04:30:00Z`,
 *   `2027-08-06T02:00-03`, `2027-03-01T10:00+05:30`); seconds optional, their fraction after `.` or
 *   `,` (both are ISO 8601); or a plain date (`2027-03-01`, read as 00:00 UTC). A time with no zone
 *   (`2027-03-01T04:30`) is refused, never read in some zone: add `Z` or an offset;
 * - `JD 2461466.5`, `MJD 61466`;
 * - a bare number ≥ 1e6 is a Julian Date (`2461466.5`), one from 10000 up to 1e6 a Modified Julian
 *   Date (`61466`, 1886 onwards); 3000–10000 is refused (a year mistyped, or an MJD before 1886
 *   that needs its prefix);
 * - Julian epoch `J2027.35` (J = 2000 + (JD − 2451545)/365.25), and a bare decimal year from 1000
 *   to 3000 (`2027.6`) is read as this Julian epoch;
 * - Besselian epoch `B1934.008` (Lieske 1979), still used for older binary-star orbits.
 *
 * A decimal comma outside ISO seconds (`2027,6`, `JD 2461466,5`) is refused with the fix named.
 *
 * The JD carries the time scale of its input (UTC for ISO strings). Julian and Besselian epochs are
 * formally TT; the ~69 s between TT and UTC is far below what an orbit's epoch resolves, and the sky
 * engine, which needs UTC to the second, takes ISO instants.
 */
import {
  BESSELIAN_JD_1900,
  JD_J2000,
  JD_UNIX_EPOCH,
  JULIAN_YEAR_DAYS,
  MJD_OFFSET,
  SECONDS_PER_DAY,
  TROPICAL_YEAR_DAYS,
} from '../constants.ts';
import { InputError, refuseDecimalComma } from '../errors.ts';

const MS_PER_DAY = SECONDS_PER_DAY * 1000;
const ISO_RE =
  /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?(Z|[+-]\d{2}(?::?\d{2})?)?)?$/i;
const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

/** The forms an epoch can be written in. */
export type EpochFormat = 'iso' | 'jd' | 'mjd' | 'julian' | 'besselian';

/**
 * Parse an epoch string into a Julian Date (days).
 * @param field name of the input field, for the error message
 * @throws InputError naming the field and the accepted forms when the string is none of them
 */
export function parseEpoch(value: unknown, field = 'epoch'): number {
  if (typeof value !== 'string') {
    throw new InputError(
      field,
      value,
      `must be an epoch string: ISO 8601, "JD …", "MJD …", "J2027.35" or "B1934.008"`,
    );
  }
  const s = value.trim().replace(/\u2212/g, '-');
  if (!ISO_RE.test(s)) refuseDecimalComma(s, field, value);
  if (NUMBER_RE.test(s)) return bareNumber(Number(s), field, value);
  const prefixed = /^(mjd|jd|j|b)\s*(.*)$/i.exec(s);
  if (prefixed) {
    const prefix = prefixed[1]!.toLowerCase();
    const num = prefixed[2]!;
    if (!NUMBER_RE.test(num)) {
      throw new InputError(field, value, `must have a number after "${prefixed[1]}"`);
    }
    const x = Number(num);
    switch (prefix) {
      case 'jd':
        return checkRange(field, value, x);
      case 'mjd':
        return checkRange(field, value, x + MJD_OFFSET);
      case 'j':
        return checkRange(field, value, julianEpochToJd(x));
      default:
        return checkRange(field, value, besselianEpochToJd(x));
    }
  }
  const m = ISO_RE.exec(s);
  if (!m) {
    throw new InputError(
      field,
      value,
      `is not an epoch: use ISO 8601 with a zone (2027-03-01T04:30Z), "JD …", "MJD …", "J2027.35" or "B1934.008"`,
    );
  }
  const [, y, mo, d, hh, mm, ss, frac, zone] = m;
  if (hh !== undefined && zone === undefined) {
    throw new InputError(
      field,
      value,
      'must give its time zone: add Z (UTC) or an offset such as -03 or +05:30; times are never ' +
        'read in the machine zone',
    );
  }
  // Date.UTC reads years 0–99 as 1900–1999: refuse them here, by the same range as every form.
  if (Number(y) < 1000) checkRange(field, value, Number.NaN);
  const ms = Date.UTC(
    Number(y),
    Number(mo) - 1,
    Number(d),
    Number(hh ?? 0),
    Number(mm ?? 0),
    Number(ss ?? 0),
  );
  const check = new Date(ms);
  if (
    check.getUTCMonth() !== Number(mo) - 1 ||
    check.getUTCDate() !== Number(d) ||
    Number(hh ?? 0) > 23 ||
    Number(mm ?? 0) > 59 ||
    Number(ss ?? 0) > 60
  ) {
    throw new InputError(field, value, 'is not a real calendar date and time');
  }
  const offsetMin = zoneOffsetMinutes(zone, field, value);
  const fracMs = frac ? Number(`0.${frac}`) * 1000 : 0;
  return checkRange(field, value, unixMsToJd(ms + fracMs - offsetMin * 60_000));
}

/** A zone designator in minutes east of UTC (0 for `Z` or none); hours ≤ 23, minutes ≤ 59 (ISO 8601). */
function zoneOffsetMinutes(zone: string | undefined, field: string, value: unknown): number {
  if (!zone || zone.toUpperCase() === 'Z') return 0;
  const z = /^([+-])(\d{2}):?(\d{2})?$/.exec(zone)!;
  const hours = Number(z[2]);
  const minutes = Number(z[3] ?? 0);
  if (hours > 23 || minutes > 59) {
    throw new InputError(field, value, 'must have a zone offset of at most ±23:59');
  }
  return (z[1] === '-' ? -1 : 1) * (hours * 60 + minutes);
}

/**
 * A number with no prefix: a Julian Date when ≥ 1e6, a decimal (Julian) year from 1000 to 3000,
 * a Modified Julian Date from 10000 (1886) up to 1e6. Between 3000 and 10000 it is refused: more
 * likely a year with a slip of the finger than an MJD of the 1860s.
 */
function bareNumber(x: number, field: string, value: unknown): number {
  if (x >= 1e6) return checkRange(field, value, x);
  if (x >= 1000 && x <= 3000) return checkRange(field, value, julianEpochToJd(x));
  if (x >= 10_000) return checkRange(field, value, x + MJD_OFFSET);
  throw new InputError(
    field,
    value,
    'is not a Julian Date (≥ 1e6), a Modified Julian Date (10000 to 1e6) or a year from 1000 to ' +
      '3000: write "MJD …", "JD …" or "J…" before it',
  );
}

/**
 * Years 1000–3000 cover every epoch an orbit or an observing plan needs; outside is a typo. One
 * range for every form (ISO 8601 included), so `9999-01-01` and `JD 0` are refused alike.
 */
function checkRange(field: string, value: unknown, jd: number): number {
  if (!Number.isFinite(jd) || jd < 2_086_302.5 || jd > 2_816_787.5) {
    throw new InputError(field, value, 'must lie between the years 1000 and 3000');
  }
  return jd;
}

export function unixMsToJd(ms: number): number {
  return ms / MS_PER_DAY + JD_UNIX_EPOCH;
}

export function jdToUnixMs(jd: number): number {
  return (jd - JD_UNIX_EPOCH) * MS_PER_DAY;
}

/** JD → ISO 8601 UTC with milliseconds and `Z`. */
export function jdToIso(jd: number): string {
  return new Date(Math.round(jdToUnixMs(jd))).toISOString();
}

export function julianEpochToJd(j: number): number {
  return JD_J2000 + (j - 2000) * JULIAN_YEAR_DAYS;
}

export function jdToJulianEpoch(jd: number): number {
  return 2000 + (jd - JD_J2000) / JULIAN_YEAR_DAYS;
}

export function besselianEpochToJd(b: number): number {
  return BESSELIAN_JD_1900 + (b - 1900) * TROPICAL_YEAR_DAYS;
}

export function jdToBesselianEpoch(jd: number): number {
  return 1900 + (jd - BESSELIAN_JD_1900) / TROPICAL_YEAR_DAYS;
}

export function jdToMjd(jd: number): number {
  return jd - MJD_OFFSET;
}

/** Format a JD in the requested form (ISO to the millisecond; others to 1e-6 of their unit). */
export function formatEpoch(jd: number, format: EpochFormat): string {
  switch (format) {
    case 'iso':
      return jdToIso(jd);
    case 'jd':
      return `JD ${jd.toFixed(6)}`;
    case 'mjd':
      return `MJD ${jdToMjd(jd).toFixed(6)}`;
    case 'julian':
      return `J${jdToJulianEpoch(jd).toFixed(6)}`;
    case 'besselian':
      return `B${jdToBesselianEpoch(jd).toFixed(6)}`;
  }
}
