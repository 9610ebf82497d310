/**
 * Durations as people type them: `30d`, `6h`, `15min`, `90s`, `2.5yr` (Julian years), or a bare number of days.
 */
import { JULIAN_YEAR_DAYS } from '../constants.ts';
import { InputError } from '../errors.ts';

const UNITS_IN_DAYS: Record<string, number> = {
  s: 1 / 86_400,
  min: 1 / 1_440,
  h: 1 / 24,
  d: 1,
  yr: JULIAN_YEAR_DAYS,
};

/** Parse a duration into days. @throws InputError for anything else, or for a duration ≤ 0. */
export function parseDurationDays(value: unknown, field = 'step'): number {
  let days: number;
  if (typeof value === 'number') {
    days = value;
  } else if (typeof value === 'string') {
    const m = /^\s*([0-9]*\.?[0-9]+(?:e[+-]?\d+)?)\s*(s|min|h|d|yr)?\s*$/i.exec(value);
    if (!m) throw new InputError(field, value, 'must be a duration such as 30d, 6h, 15min, 90s or 2.5yr');
    days = Number(m[1]) * UNITS_IN_DAYS[(m[2] ?? 'd').toLowerCase()]!;
  } else {
    throw new InputError(field, value, 'must be a duration such as 30d, 6h, 15min, 90s or 2.5yr');
  }
  if (!Number.isFinite(days) || days <= 0) throw new InputError(field, value, 'must be a positive duration');
  return days;
}
