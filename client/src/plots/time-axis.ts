/**
 * A night's time axis in one clock: the site's IANA zone or UTC (pure; unit-tested in node).
 * Ticks sit on that clock's whole hours, so a half-hour zone gets its own marks, and a
 * daylight-saving change mid-night shows as a repeated or skipped hour label.
 */
import { DateTime } from 'luxon';

export interface HourTick {
  /** The instant, ms since 1970 (UTC). */
  ms: number;
  /** The hour on the chosen clock, "00"–"23". */
  label: string;
  /** Labelled (every `labelEvery` hours of the clock); the others are drawn as grid only. */
  labelled: boolean;
}

const HOUR_MS = 3_600_000;

/**
 * Whole hours of `zone` in [t0Ms, t1Ms].
 * @param zone IANA zone name, or "UTC"
 * @param labelEvery label every n-th hour of the clock (1, 2, 3…); others unlabelled
 */
export function hourTicks(t0Ms: number, t1Ms: number, zone: string, labelEvery = 1): HourTick[] {
  const first = DateTime.fromMillis(t0Ms, { zone }).startOf('hour').toMillis();
  const out: HourTick[] = [];
  for (let ms = first < t0Ms ? first + HOUR_MS : first; ms <= t1Ms; ms += HOUR_MS) {
    const d = DateTime.fromMillis(ms, { zone });
    // An hour that is not whole on this clock (a half-hour DST shift) is skipped.
    if (d.minute !== 0) continue;
    out.push({ ms, label: d.toFormat('HH'), labelled: d.hour % labelEvery === 0 });
  }
  return out;
}

/** "UTC−04:00" (with a true minus sign), the clock's offset at an instant; "UTC" for UTC itself. */
export function offsetLabel(ms: number, zone: string): string {
  const off = DateTime.fromMillis(ms, { zone }).offset;
  if (zone === 'UTC' || zone === 'utc') return 'UTC';
  const sign = off < 0 ? '−' : '+';
  const a = Math.abs(off);
  return `UTC${sign}${String(Math.floor(a / 60)).padStart(2, '0')}:${String(a % 60).padStart(2, '0')}`;
}

/** "21:07" on the chosen clock. */
export const clockAt = (ms: number, zone: string) =>
  DateTime.fromMillis(ms, { zone }).toFormat('HH:mm');

/** How many clock hours between labels so that labels stay at least `minPx` apart. */
export function labelStep(pxPerHour: number, minPx = 34): number {
  for (const n of [1, 2, 3, 4, 6]) if (n * pxPerHour >= minPx) return n;
  return 12;
}
