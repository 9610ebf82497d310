/**
 * VTIMEZONE components (RFC 5545 §3.6.5) for the zones a feed uses, built from luxon's zone rules:
 * every offset change within the feed's years is written as an explicit STANDARD or DAYLIGHT
 * observance with its local DTSTART, so a calendar program needs no zone database of its own to
 * place a site-night in local time (a TZID without its VTIMEZONE is not valid RFC 5545).
 */
import { DateTime, IANAZone } from 'luxon';

const DAY_MS = 86_400_000;

/** ±HHMM of an offset in minutes. */
function offsetText(minutes: number): string {
  const a = Math.abs(minutes);
  return `${minutes < 0 ? '-' : '+'}${String(Math.floor(a / 60)).padStart(2, '0')}${String(a % 60).padStart(2, '0')}`;
}

/** The instants (ms) within [fromMs, toMs] where the zone's offset changes, to the minute. */
function transitions(zone: IANAZone, fromMs: number, toMs: number): number[] {
  const out: number[] = [];
  for (let t = fromMs; t < toMs; t += DAY_MS) {
    if (zone.offset(t) === zone.offset(t + DAY_MS)) continue;
    let lo = t;
    let hi = t + DAY_MS;
    while (hi - lo > 60_000) {
      const mid = lo + Math.floor((hi - lo) / 2 / 60_000) * 60_000;
      if (zone.offset(mid) === zone.offset(lo)) lo = mid;
      else hi = mid;
    }
    out.push(hi);
  }
  return out;
}

/** One VTIMEZONE for `name`, exact from a year before `fromMs` to a year after `toMs`. */
export function vtimezone(name: string, fromMs: number, toMs: number): string {
  const zone = IANAZone.create(name);
  const start = fromMs - 366 * DAY_MS;
  const end = toMs + 366 * DAY_MS;
  const changes = transitions(zone, start, end);
  const offsets = [zone.offset(start), ...changes.map((t) => zone.offset(t))];
  const standard = Math.min(...offsets);
  const lines = ['BEGIN:VTIMEZONE', `TZID:${name}`];
  const observance = (atMs: number, from: number, to: number) => {
    const kind = to > standard ? 'DAYLIGHT' : 'STANDARD';
    const local = DateTime.fromMillis(atMs, { zone: 'UTC' })
      .plus({ minutes: from })
      .toFormat("yyyyLLdd'T'HHmmss");
    lines.push(
      `BEGIN:${kind}`,
      `DTSTART:${local}`,
      `TZOFFSETFROM:${offsetText(from)}`,
      `TZOFFSETTO:${offsetText(to)}`,
      `END:${kind}`,
    );
  };
  const first = zone.offset(start);
  observance(start - (start % DAY_MS), first, first);
  for (const t of changes) observance(t, zone.offset(t - 60_000), zone.offset(t));
  lines.push('END:VTIMEZONE');
  return `${lines.join('\r\n')}\r\n`;
}
