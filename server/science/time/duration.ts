/**
 * Durations as people type them: `30d`, `6h`, `15min`, `90s`, `2.5yr` (Julian years), or a bare number of days.
 */
import { JULIAN_YEAR_DAYS } from '../constants.ts';
import { InputError } from '../errors.ts';
import { parseEpoch } from './epoch.ts';

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
    if (!m)
      throw new InputError(field, value, 'must be a duration such as 30d, 6h, 15min, 90s or 2.5yr');
    days = Number(m[1]) * UNITS_IN_DAYS[(m[2] ?? 'd').toLowerCase()]!;
  } else {
    throw new InputError(field, value, 'must be a duration such as 30d, 6h, 15min, 90s or 2.5yr');
  }
  if (!Number.isFinite(days) || days <= 0)
    throw new InputError(field, value, 'must be a positive duration');
  return days;
}

/** Most epochs one request may ask for. */
export const MAX_EPOCHS = 200_000;

/**
 * Epochs from start to end inclusive (JD) every stepDays; the last one is end only if it falls on the step.
 * @throws InputError when end < start or the grid would exceed MAX_EPOCHS
 */
export function epochRange(startJd: number, endJd: number, stepDays: number): Float64Array {
  if (endJd < startJd) throw new InputError('end', endJd, `must not be before start (${startJd})`);
  const count = Math.floor((endJd - startJd) / stepDays + 1e-9) + 1;
  if (count > MAX_EPOCHS)
    throw new InputError(
      'step',
      stepDays,
      `gives ${count} epochs; at most ${MAX_EPOCHS} per request`,
    );
  return Float64Array.from({ length: count }, (_, i) => startJd + i * stepDays);
}

/** Epochs as a request gives them: a list, or a range with a step. */
export type EpochsInput = string[] | { start: string; end: string; step: string | number };

/**
 * The epochs of a request as JD.
 * @throws InputError naming `epochs.<i>`, `epochs.start`, `epochs.end` or `epochs.step`
 */
export function resolveEpochs(epochs: EpochsInput): Float64Array {
  if (Array.isArray(epochs))
    return Float64Array.from(epochs, (e, i) => parseEpoch(e, `epochs.${i}`));
  const start = parseEpoch(epochs.start, 'epochs.start');
  const end = parseEpoch(epochs.end, 'epochs.end');
  if (end < start)
    throw new InputError('epochs.end', epochs.end, 'must not be before epochs.start');
  return epochRange(start, end, parseDurationDays(epochs.step, 'epochs.step'));
}
