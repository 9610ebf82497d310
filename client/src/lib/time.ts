/** Instants are UTC everywhere; local times are shown in the site's IANA zone through luxon, never the browser's. */
import { DateTime } from 'luxon';

const utc = (iso: string) => DateTime.fromISO(iso, { zone: 'utc' });

/** "2027-06-14 16:17" in UTC. */
export const utcText = (iso: string) => utc(iso).toFormat('yyyy-LL-dd HH:mm');
export const utcClock = (iso: string) => utc(iso).toFormat('HH:mm');
export const zoneClock = (iso: string, zone: string) => utc(iso).setZone(zone).toFormat('HH:mm');
export const zoneAbbrev = (iso: string, zone: string) => utc(iso).setZone(zone).toFormat('ZZZZ');
export const dateText = (iso: string) => utc(iso).toFormat('yyyy-LL-dd');
export const ms = (iso: string) => Date.parse(iso);
export const isoOf = (msUtc: number) => new Date(msUtc).toISOString();
/** A Julian Date (UTC) as the instant it names, ISO 8601. */
export const isoOfJd = (jd: number) => isoOf((jd - 2440587.5) * 86_400_000);

/** Today's date in a zone, YYYY-MM-DD. */
export const todayIn = (zone: string) => DateTime.now().setZone(zone).toISODate() ?? '';

/**
 * A clock time typed for a night ("22:40", "2240", "05:10:30") as the one instant inside the
 * night's span [startMs, endMs) that shows it on `zone`'s clock (a night runs noon to noon, so
 * 22:40 is the evening and 05:10 the next morning), or the rule the text breaks.
 */
export function clockInNight(
  text: string,
  zone: string,
  startMs: number,
  endMs: number,
): { iso: string } | { rule: string } {
  const m = /^(\d{1,2}):?(\d{2})(?::?(\d{2}))?$/.exec(text.trim());
  const [h, min, s] = m ? [Number(m[1]), Number(m[2]), Number(m[3] ?? 0)] : [NaN, NaN, NaN];
  if (!m || h > 23 || min > 59 || s > 59)
    return { rule: `${JSON.stringify(text)} is not a clock time: write it as 22:40 or 05:10:30` };
  const first = DateTime.fromMillis(startMs, { zone }).startOf('day');
  for (let d = 0; d <= 2; d++) {
    const t = first.plus({ days: d }).set({ hour: h, minute: min, second: s });
    if (t.hour === h && t.minute === min && t.toMillis() >= startMs && t.toMillis() < endMs)
      return { iso: t.toUTC().toISO({ suppressMilliseconds: true }) ?? '' };
  }
  return { rule: `${text} does not occur on this night's ${zone} clock (a skipped hour)` };
}

/** The clock time of an instant on a zone's clock, as `clockInNight` reads it back (HH:mm, with :ss when not zero). */
export const clockOf = (iso: string, zone: string) => {
  const t = utc(iso).setZone(zone);
  return t.second ? t.toFormat('HH:mm:ss') : t.toFormat('HH:mm');
};
