/**
 * Right ascension and declination as astronomers type them, turned into degrees, and back.
 *
 * Right ascension (result in degrees, [0, 360)):
 * - decimal degrees: `250.3`, `250.3d`, `250.3°` — a bare decimal is always degrees, so `16.69` is
 *   16.69°, never hours;
 * - decimal hours, marked with `h`: `16.69h`;
 * - sexagesimal hours: `16:41:12.5`, `16 41 12.5`, `16h41m12.5s` (also `16:41.2`, `16h41.2m`).
 *
 * Declination (degrees, [−90, 90]):
 * - decimal degrees: `-26.69`, `-26.69d`, `-26.69°`;
 * - sexagesimal degrees: `-26:41:12`, `-26 41 12`, `-26°41′12″`, `-26°41'12"`, `-26d41m12s`.
 *   A sign on the degrees applies to the whole value, so `-00:30:00` is −0.5°.
 *
 * Everywhere: minutes and seconds lie in [0, 60); only the last component may carry a fraction; the
 * Unicode minus `−` is read as `-`; a decimal comma is refused with the fix named (`1,5` is never
 * read as 15). JSON numbers are read as decimal degrees.
 */
import { InputError, refuseDecimalComma } from '../errors.ts';

/** A non-negative number, exponent allowed (`1e-7`), as JSON and String(number) write it. */
const NUM = String.raw`((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)`;
const SEP = String.raw`(?:\s*:\s*|\s+)`;
/** `d:m[:s]` or `d m [s]`, with a leading sign. */
const SEXAGESIMAL_RE = new RegExp(`^([+-]?)${NUM}${SEP}${NUM}(?:${SEP}${NUM})?$`);
/** `16h41m12.5s`, `16h41.2m`, `16.69h`. */
const HOURS_LETTERS_RE = new RegExp(
  String.raw`^([+-]?)${NUM}\s*h(?:\s*${NUM}\s*m(?:\s*${NUM}\s*s?)?)?$`,
  'i',
);
/** `-26°41′12″`, `-26d41m12s`, `-26°41'12"`, `-26.5°`, `250.3d`. */
const DEGREES_LETTERS_RE = new RegExp(
  String.raw`^([+-]?)${NUM}\s*[d°](?:\s*${NUM}\s*[m′'](?:\s*${NUM}\s*(?:s|″|"|′′|'')?)?)?$`,
  'i',
);
const DECIMAL_RE = new RegExp(`^([+-]?)${NUM}$`, 'i');

const RA_FORMS =
  'use degrees (250.3, 250.3d), hours with h (16.69h) or hours h:m:s (16:41:12.5, 16 41 12.5, 16h41m12.5s)';
const DEC_FORMS = 'use degrees (-26.69, -26.69d) or d:m:s (-26:41:12, -26°41′12″, -26d41m12s)';

const LAT_FORMS = 'use degrees (-24.6, -24.6d) or d:m:s (-24:37:38, -24°37′38″, -24d37m38s)';
const LON_FORMS = 'use degrees east (-70.4, -70.4d) or d:m:s (-70:24:10, -70°24′10″, -70d24m10s)';

/** A value read from text: sign, up to three components, and the unit of the first. */
interface Parsed {
  negative: boolean;
  parts: string[];
  unit: 'deg' | 'hour';
}

/**
 * Read a right ascension in degrees.
 * @throws InputError naming the field, the value and the rule
 */
export function parseRightAscension(value: unknown, field = 'ra'): number {
  const p = read(value, field, RA_FORMS, 'ra');
  if (p.negative) throw new InputError(field, value, 'must not be negative: RA lies in [0, 360)°');
  const x = combine(p, value, field);
  if (p.unit === 'hour') {
    if (x >= 24) throw new InputError(field, value, 'must lie in [0, 24) h');
    return x * 15;
  }
  if (x >= 360) throw new InputError(field, value, 'must lie in [0, 360)°');
  return x;
}

/**
 * Read a declination in degrees.
 * @throws InputError naming the field, the value and the rule
 */
export function parseDeclination(value: unknown, field = 'dec'): number {
  const p = read(value, field, DEC_FORMS, 'dec');
  const x = combine(p, value, field);
  if (x > 90) throw new InputError(field, value, 'must lie in [-90, 90]°');
  return p.negative ? -x : x;
}

/**
 * Read a geodetic latitude in degrees, [−90, 90], north positive; the same forms as a declination.
 * @throws InputError naming the field, the value and the rule
 */
export function parseLatitude(value: unknown, field = 'latitudeDeg'): number {
  const p = read(value, field, LAT_FORMS, 'latitude');
  const x = combine(p, value, field);
  if (x > 90) throw new InputError(field, value, 'must lie in [-90, 90]°');
  return p.negative ? -x : x;
}

/**
 * Read a longitude in degrees east, [−180, 360) (a value past 180 is returned as it is; callers
 * fold it); the same forms as a declination.
 * @throws InputError naming the field, the value and the rule
 */
export function parseLongitude(value: unknown, field = 'longitudeDeg'): number {
  const p = read(value, field, LON_FORMS, 'longitude');
  const x = combine(p, value, field);
  const signed = p.negative ? -x : x;
  if (signed < -180 || signed >= 360)
    throw new InputError(field, value, 'must lie in [-180, 360)°');
  return signed;
}

type Quantity = 'ra' | 'dec' | 'latitude' | 'longitude';
const QUANTITY_WORDS: Record<Quantity, string> = {
  ra: 'right ascension',
  dec: 'declination',
  latitude: 'latitude',
  longitude: 'longitude',
};

function read(value: unknown, field: string, forms: string, kind: Quantity): Parsed {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InputError(field, value, 'must be a finite number');
    return { negative: value < 0, parts: [String(Math.abs(value))], unit: 'deg' };
  }
  if (typeof value !== 'string')
    throw new InputError(field, value, `must be a string or number: ${forms}`);
  const s = value.trim().replace(/\u2212/g, '-');
  refuseDecimalComma(s, field, value);
  let m = DECIMAL_RE.exec(s);
  if (m) return parsed(m, 'deg');
  m = DEGREES_LETTERS_RE.exec(s);
  if (m) return parsed(m, 'deg');
  if (kind === 'ra') {
    m = HOURS_LETTERS_RE.exec(s);
    if (m) return parsed(m, 'hour');
  }
  m = SEXAGESIMAL_RE.exec(s);
  if (m) return parsed(m, kind === 'ra' ? 'hour' : 'deg');
  throw new InputError(field, value, `is not a ${QUANTITY_WORDS[kind]}: ${forms}`);
}

function parsed(m: RegExpExecArray, unit: Parsed['unit']): Parsed {
  const parts = m.slice(2).filter((x): x is string => x !== undefined);
  return { negative: m[1] === '-', parts, unit };
}

/** Sum the components (value of the first unit); minutes and seconds in [0, 60), fraction last. */
function combine(p: Parsed, value: unknown, field: string): number {
  const nums = p.parts.map(Number);
  for (let i = 0; i < p.parts.length - 1; i++) {
    if (/[.e]/i.test(p.parts[i]!)) {
      throw new InputError(field, value, 'may carry a fraction only in its last component');
    }
  }
  for (let i = 1; i < nums.length; i++) {
    if (nums[i]! >= 60) {
      throw new InputError(field, value, `must have ${i === 1 ? 'minutes' : 'seconds'} in [0, 60)`);
    }
  }
  return (nums[0] ?? 0) + (nums[1] ?? 0) / 60 + (nums[2] ?? 0) / 3600;
}

// The formatters live with the other shared vocabulary, so the client writes positions alike.
export { formatDecDms, formatRaHms } from '../../../descriptors/sexagesimal.ts';
