/**
 * The night chart in words (pure; unit-tested in node): the same lanes, read out for screen
 * readers, for a printed sheet and for anyone who prefers a list, every time on the site's clock
 * with UTC beside it.
 */
import type { Visibility, VisTarget } from '../api/client.ts';
import { limitWords, type LaneModel } from './night-lanes.ts';
import { clockAt } from './time-axis.ts';

/** "21:07 site (01:07 UTC)". */
export const bothClocks = (ms: number, siteZone: string) =>
  `${clockAt(ms, siteZone)} site (${clockAt(ms, 'UTC')} UTC)`;

/** A target's name without the report's "(system)". */
export const shortName = (t: Pick<VisTarget, 'name'>) => t.name.replace(/ \([^)]*\)$/, '');

/** The system a report's target belongs to, from its "(system)" suffix, or null. */
export const systemOf = (t: Pick<VisTarget, 'name'>) => /\(([^)]*)\)$/.exec(t.name)?.[1] ?? null;

/** Who a lane is for, and why several targets share it. */
export function laneTitle(members: readonly VisTarget[]): string {
  const names = members.map(shortName).join(', ');
  return members.length > 1
    ? `${names}: one sky position (within 1″), so one lane`
    : (members[0]?.name ?? '');
}

/** One sentence per lane: where it is open, with its best airmass, and what closes it elsewhere. */
export function laneSentence(lane: LaneModel, vis: Visibility): string {
  const zone = vis.site.timeZone;
  const words = limitWords(vis);
  const parts = lane.segments.map((s) =>
    s.limit === null
      ? `open ${bothClocks(s.startMs, zone)} to ${bothClocks(s.endMs, zone)}`
      : `closed ${clockAt(s.startMs, zone)}–${clockAt(s.endMs, zone)} site — ${words[s.limit].long}`,
  );
  const best =
    lane.bestAirmass === null ? 'no window' : `best airmass ${lane.bestAirmass.toFixed(2)}`;
  const moon =
    lane.moonLeastDeg === null
      ? 'the Moon is down in darkness'
      : `the Moon stays at least ${lane.moonLeastDeg.toFixed(0)}° away`;
  return `${lane.members.map(shortName).join(', ')}: ${best}; ${moon}; ${parts.join('; ')}.`;
}
