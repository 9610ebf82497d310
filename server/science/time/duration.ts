/**
 * Durations in ISO 8601 form (ISO 8601-1:2019, 5.5.2.4): `P30D`, `PT6H`, `PT15M`, `P2W`,
 * `P1DT12H`, `PT0.5S`. Weeks, days, hours, minutes and seconds only: years and months have no fixed
 * length, so a step of "P1M" would be a different number of days each time; give days instead.
 * The one place where durations are read and written, for every interface.
 */
import { InputError } from '../errors.ts';
import { parseEpoch } from './epoch.ts';

const FORM = 'an ISO 8601 duration such as P30D, PT6H, PT15M or P1DT12H';
const NUMBER = '(\\d+(?:[.,]\\d+)?)';
const DURATION = new RegExp(
  `^P(?:${NUMBER}W)?(?:${NUMBER}D)?(?:T(?:${NUMBER}H)?(?:${NUMBER}M)?(?:${NUMBER}S)?)?$`,
);
/** Seconds per unit of each component, in the order of the pattern's groups (exact integers). */
const SECONDS_PER = [604_800, 86_400, 3_600, 60, 1];

export interface DurationRule {
  /** Accept a zero duration (`PT0S`), for fields where zero means "none". Default false. */
  allowZero?: boolean;
  /** Shortest accepted duration (ISO 8601), inclusive. */
  atLeast?: string;
  /** Longest accepted duration (ISO 8601), inclusive. */
  atMost?: string;
}

function refusal(value: string): string {
  if (/^-/.test(value)) return 'must be a positive ISO 8601 duration (no sign)';
  if (/^P(\d+([.,]\d+)?[YM])/.test(value))
    return 'years and months have no fixed length: give weeks or days, e.g. P365D or P4W';
  if (/^P.*T$/.test(value) || value === 'P')
    return `must name at least one component, e.g. ${FORM}`;
  if (/^P/i.test(value) && value !== value.toUpperCase())
    return `must use upper-case designators (P, W, D, T, H, M, S): ${FORM}`;
  return `must be ${FORM}`;
}

/**
 * An ISO 8601 duration, in seconds (summed in seconds, so PT30M is exactly 1800).
 * @throws InputError naming the field: another form, a sign, years or months, a fraction on
 *   anything but the last component, or zero (unless allowed)
 */
function parseDurationSeconds(value: unknown, field: string, rule: DurationRule): number {
  if (typeof value !== 'string') throw new InputError(field, value, `must be ${FORM}`);
  const m = DURATION.exec(value.trim());
  if (!m || value.trim() === 'P' || /T$/.test(value.trim()))
    throw new InputError(field, value, refusal(value.trim()));
  const parts = m.slice(1);
  const last = parts.reduce((k, p, i) => (p === undefined ? k : i), -1);
  let seconds = 0;
  for (const [i, p] of parts.entries()) {
    if (p === undefined) continue;
    if (/[.,]/.test(p) && i !== last)
      throw new InputError(field, value, 'only the last component may have a fraction (ISO 8601)');
    seconds += Number(p.replace(',', '.')) * SECONDS_PER[i]!;
  }
  if (!Number.isFinite(seconds) || (seconds === 0 && !rule.allowZero))
    throw new InputError(field, value, 'must be a positive duration');
  const bound = (text: string) => parseDurationSeconds(text, 'rule', {});
  if (rule.atLeast !== undefined && seconds !== 0 && seconds < bound(rule.atLeast))
    throw new InputError(field, value, `must be at least ${rule.atLeast}`);
  if (rule.atMost !== undefined && seconds > bound(rule.atMost))
    throw new InputError(field, value, `must be at most ${rule.atMost}`);
  return seconds;
}

/** An ISO 8601 duration in days. @throws InputError naming the field and the rule */
export function parseDurationDays(value: unknown, field = 'step', rule: DurationRule = {}): number {
  return parseDurationSeconds(value, field, rule) / 86_400;
}

/** The same in minutes, for fields the science takes in minutes (PT5M is exactly 5). */
export function parseDurationMinutes(
  value: unknown,
  field: string,
  rule: DurationRule = {},
): number {
  return parseDurationSeconds(value, field, rule) / 60;
}

/**
 * Days as the canonical ISO 8601 duration: days, hours, minutes and seconds (to the millisecond),
 * zero components left out; `PT0S` for zero. parseDurationDays(formatDuration(d)) = d to 1 ms.
 */
export function formatDuration(days: number): string {
  if (!Number.isFinite(days) || days < 0) throw new RangeError(`no duration of ${days} days`);
  let ms = Math.round(days * 86_400_000);
  const d = Math.floor(ms / 86_400_000);
  ms -= d * 86_400_000;
  const h = Math.floor(ms / 3_600_000);
  ms -= h * 3_600_000;
  const min = Math.floor(ms / 60_000);
  ms -= min * 60_000;
  const s = ms / 1000;
  const time = `${h ? `${h}H` : ''}${min ? `${min}M` : ''}${s ? `${s}S` : ''}`;
  if (!d && !time) return 'PT0S';
  return `P${d ? `${d}D` : ''}${time ? `T${time}` : ''}`;
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

/** Epochs as a request gives them: a list, or a range from start to end with a step (ISO 8601 duration). */
export type EpochsInput = string[] | { start: string; end: string; step: string };

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
