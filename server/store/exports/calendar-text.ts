/**
 * The iCalendar text of a campaign's feed from its gathered rows (calendar.ts): darkness of each
 * site-night, the periapsis passages of each target's current orbit with their σ, and the RFC 5545
 * serialisation. No database here and plain data in, so a worker thread writes the feed (the sky
 * and orbit computations and the text of a long campaign never hold the server's thread).
 */
import ical from 'ical-generator';
import { DateTime } from 'luxon';
import { JD_J2000 } from '../../science/constants.ts';
import { eventsWithUncertainty, type Orbit } from '../../science/orbit/index.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import { nightSpan, sunNight, validateSite, type Site } from '../../science/sky/index.ts';
import { jdToIso, jdToUnixMs } from '../../science/time/index.ts';
import type { SiteRow } from '../repos/sites.ts';
import { vtimezone } from './vtimezone.ts';

/** An event already decided (a block, a blend risk): instants in ms since 1970. */
export interface FeedEvent {
  id: string;
  sequence: number;
  stamp: Date;
  startMs: number;
  endMs: number;
  summary: string;
  description: string;
  site?: SiteRow;
}

export interface FeedNight {
  id: string;
  sequence: number;
  stamp: Date;
  date: string;
  site: SiteRow;
  notes: string;
}

export interface FeedPassages {
  /** UID of each passage: `${uidPrefix}${passage number}` + the feed's suffix. */
  uidPrefix: string;
  name: string;
  system: string;
  orbit: Orbit;
  solution: { id: number; version: number };
  /** DTSTAMP and SEQUENCE of the target's passages (calendar.ts `revision`). */
  stamp: Date;
  sequence: number;
}

export interface CalendarFeed {
  name: string;
  /** The span the passages and time zones cover, JD. */
  startJd: number;
  endJd: number;
  /** Appended to each event id: the campaign's key and the reserved domain. */
  uidSuffix: string;
  nights: FeedNight[];
  blocks: FeedEvent[];
  passages: FeedPassages[];
  blends: FeedEvent[];
}

/** Darkness of a site-night in ms since 1970: astronomical, else nautical, else sunset to sunrise. */
function darkSpan(site: Site, date: string): { start: number; end: number; what: string } | null {
  const sun = sunNight(site, nightSpan(site, date));
  for (const kind of ['astronomical', 'nautical'] as const) {
    const dusk = sun.dusk[kind];
    const dawn = sun.dawn[kind];
    if (dusk !== null && dawn !== null)
      return { start: jdToUnixMs(dusk), end: jdToUnixMs(dawn), what: `${kind} darkness` };
  }
  if (sun.setJd !== null && sun.riseJd !== null)
    return { start: jdToUnixMs(sun.setJd), end: jdToUnixMs(sun.riseJd), what: 'sunset to sunrise' };
  return null;
}

const location = (s: SiteRow) => ({
  title: s.name,
  geo: { lat: s.latitudeDeg, lon: s.longitudeDeg },
});

/** The feed as RFC 5545 text: nights, blocks, passages, blend risks, in that order. */
export function calendarText(feed: CalendarFeed): string {
  const uid = (what: string) => `${what}${feed.uidSuffix}`;
  const cal = ical({
    name: feed.name,
    prodId: { company: 'epochwright', product: 'campaign feed', language: 'EN' },
    timezone: {
      name: null,
      generator: (zone) => vtimezone(zone, jdToUnixMs(feed.startJd), jdToUnixMs(feed.endJd)),
    },
  });
  addNights(cal, feed, uid);
  const plain = (e: FeedEvent) =>
    cal.createEvent({
      id: uid(e.id),
      sequence: e.sequence,
      stamp: e.stamp,
      start: new Date(e.startMs),
      end: new Date(e.endMs),
      summary: e.summary,
      ...(e.site ? { location: location(e.site) } : {}),
      description: e.description,
    });
  feed.blocks.forEach(plain);
  addPassages(cal, feed, uid);
  feed.blends.forEach(plain);
  return cal.toString();
}

type Calendar = ReturnType<typeof ical>;

/** One event per allocated night, over its darkness in the site's zone (none without a sunset). */
function addNights(cal: Calendar, feed: CalendarFeed, uid: (what: string) => string): void {
  const skySites = new Map<number, Site>();
  for (const { id, sequence, stamp, date, site: s, notes } of feed.nights) {
    let site = skySites.get(s.id);
    if (!site) {
      site = validateSite(s, 'site');
      skySites.set(s.id, site);
    }
    const dark = darkSpan(site, date);
    if (!dark) continue; // no sunset at all (polar summer): no night to show
    cal.createEvent({
      id: uid(id),
      sequence,
      stamp,
      start: DateTime.fromMillis(dark.start, { zone: s.timeZone }),
      end: DateTime.fromMillis(dark.end, { zone: s.timeZone }),
      timezone: s.timeZone,
      summary: `Night at ${s.name} (${date})`,
      location: location(s),
      description: [
        `Allocated night of ${date} at ${s.name}: ${dark.what}, local times (${s.timeZone}).`,
        notes,
        s.laserGuideStar ? LASER_GUIDE_STAR_CAUTION : '',
      ]
        .filter(Boolean)
        .join('\n'),
    });
  }
}

/** Periapsis passages as their ± 1σ span; the most likely instant in the description. */
function addPassages(cal: Calendar, feed: CalendarFeed, uid: (what: string) => string): void {
  for (const t of feed.passages) {
    const { orbit, solution } = t;
    for (const ev of eventsWithUncertainty(orbit, feed.startJd, feed.endJd, {
      kinds: ['periapsis'],
    })) {
      const sigma = ev.sigmaDays;
      const half = sigma !== undefined && sigma > 0 ? sigma : 1 / 1440;
      // The passage's number counted from J2000: the same passage keeps it across refits.
      const passage = Math.round((ev.jd - JD_J2000) / orbit.periodDays);
      const when = jdToIso(ev.jd).slice(0, 16).replace('T', ' ');
      cal.createEvent({
        id: uid(`${t.uidPrefix}${passage}`),
        sequence: t.sequence,
        stamp: t.stamp,
        start: new Date(jdToUnixMs(ev.jd - half)),
        end: new Date(jdToUnixMs(ev.jd + half)),
        summary:
          sigma === undefined
            ? `Periapsis of ${t.name} (${t.system})`
            : `Periapsis of ${t.name} (${t.system}), ± 1σ`,
        description: [
          `Most likely at ${when} UTC${sigma === undefined ? '' : `, 1σ ${formatDays(sigma)}`}; ` +
            `the event spans ` +
            `${sigma === undefined ? 'one minute (the solution has no covariance, so no σ)' : '± 1σ'}` +
            `.`,
          `Predicted from orbit solution version ${solution.version} (id ${solution.id}).`,
        ].join('\n'),
      });
    }
  }
}

/** A σ in days, or hours below a day. */
function formatDays(d: number): string {
  return d >= 1 ? `${d.toFixed(2)} d` : `${(d * 24).toFixed(2)} h`;
}
