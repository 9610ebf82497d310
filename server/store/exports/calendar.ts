/**
 * A campaign's iCalendar feed (RFC 5545, with RFC 7986's calendar NAME): one event per allocated
 * site-night (darkness, in the site's local time with its VTIMEZONE), one per block, one per
 * periapsis passage of a campaign target as its ± 1σ span, and the flags that have a date of
 * their own (blend risk). Calendar programs update an event in place by its UID and keep the
 * highest SEQUENCE, so:
 * - UIDs depend only on the stored rows: the row id (or the target and passage number) and a key
 *   of the campaign (its id and creation instant), never on the host the feed was fetched through;
 * - SEQUENCE and DTSTAMP come from the stored changes: a block's version, a night's and its site's
 *   updates in the audit trail, an orbit solution's version, with the instant of the last change.
 */
import { createHash } from 'node:crypto';
import ical from 'ical-generator';
import { DateTime } from 'luxon';
import { and, count, eq, inArray, max } from 'drizzle-orm';
import { auditTrail, blocks, nights, sites, systems, targets } from '../../../db/schema.ts';
import { JD_J2000 } from '../../science/constants.ts';
import { eventsWithUncertainty } from '../../science/orbit/index.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import { nightSpan, sunNight, validateSite, type Site } from '../../science/sky/index.ts';
import { jdToIso, jdToUnixMs, parseEpoch } from '../../science/time/index.ts';
import { nowJd } from '../../clock.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { NotFoundError } from '../errors.ts';
import { campaignEntity, campaignMembers } from '../repos/campaigns.ts';
import { currentOrbit } from '../repos/orbits.ts';
import type { SiteRow } from '../repos/sites.ts';
import { campaignFlags } from '../views/planning.ts';
import { vtimezone } from './vtimezone.ts';
import type { Runner } from '../../jobs/tasks.ts';

export interface CalendarOptions {
  /** The moment flags are computed for, JD (UTC); default now. */
  flagsAtJd?: number;
}

/** The UIDs' domain: reserved, so it can never clash with a real host (RFC 2606). */
const UID_DOMAIN = 'epochwright.invalid';

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

/** Updates recorded in the audit trail per id of one entity: how many, and the last one's instant. */
async function updatesOf(db: DbOrTx, entity: string, ids: number[]) {
  const out = new Map<number, { n: number; last: string | null }>();
  if (ids.length === 0) return out;
  const rows = await db
    .select({ id: auditTrail.entityId, n: count(), last: max(auditTrail.at) })
    .from(auditTrail)
    .where(
      and(
        eq(auditTrail.entity, entity),
        eq(auditTrail.action, 'update'),
        inArray(auditTrail.entityId, ids),
      ),
    )
    .groupBy(auditTrail.entityId);
  for (const r of rows) if (r.id !== null) out.set(r.id, { n: r.n, last: r.last });
  return out;
}

const later = (...isos: (string | null | undefined)[]) =>
  isos
    .filter((x): x is string => typeof x === 'string')
    .sort()
    .at(-1)!;

export async function campaignCalendar(
  db: DbOrTx,
  campaignId: number,
  options: CalendarOptions = {},
  run?: Runner,
): Promise<string> {
  const campaign = await getById(db, campaignEntity, campaignId);
  const { targetIds } = await campaignMembers(db, campaignId);
  const key = createHash('sha256')
    .update(`${campaign.id}|${campaign.createdAt}`)
    .digest('hex')
    .slice(0, 12);
  const uid = (what: string) => `${what}-c${campaign.id}-${key}@${UID_DOMAIN}`;
  const startJd = parseEpoch(`${campaign.startDate}T00:00Z`, 'startDate');
  const endJd = parseEpoch(`${campaign.endDate}T00:00Z`, 'endDate') + 1 + 365.25;
  const cal = ical({
    name: `epochwright: ${campaign.name}`,
    prodId: { company: 'epochwright', product: 'campaign feed', language: 'EN' },
    timezone: {
      name: null,
      generator: (zone) => vtimezone(zone, jdToUnixMs(startJd), jdToUnixMs(endJd)),
    },
  });

  // One event per allocated site-night, in the site's zone.
  const nightRows = await db
    .select({ n: nights, s: sites })
    .from(nights)
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .where(eq(nights.campaignId, campaignId))
    .orderBy(nights.date, sites.name);
  const nightUpdates = await updatesOf(
    db,
    'night',
    nightRows.map((r) => r.n.id),
  );
  const siteUpdates = await updatesOf(db, 'site', [...new Set(nightRows.map((r) => r.s.id))]);
  const skySites = new Map<number, Site>();
  for (const { n, s } of nightRows) {
    let site = skySites.get(s.id);
    if (!site) {
      site = validateSite(s, 'site');
      skySites.set(s.id, site);
    }
    const dark = darkSpan(site, n.date);
    if (!dark) continue; // no sunset at all (polar summer): no night to show
    const nu = nightUpdates.get(n.id);
    const su = siteUpdates.get(s.id);
    cal.createEvent({
      id: uid(`night-${n.id}`),
      sequence: (nu?.n ?? 0) + (su?.n ?? 0),
      stamp: new Date(later(n.createdAt, nu?.last, su?.last)),
      start: DateTime.fromMillis(dark.start, { zone: s.timeZone }),
      end: DateTime.fromMillis(dark.end, { zone: s.timeZone }),
      timezone: s.timeZone,
      summary: `Night at ${s.name} (${n.date})`,
      location: location(s),
      description: [
        `Allocated night of ${n.date} at ${s.name}: ${dark.what}, local times (${s.timeZone}).`,
        n.notes,
        s.laserGuideStar ? LASER_GUIDE_STAR_CAUTION : '',
      ]
        .filter(Boolean)
        .join('\n'),
    });
  }

  const blockRows = await db
    .select({ b: blocks, night: nights.date, s: sites, target: targets.name, system: systems.name })
    .from(blocks)
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .innerJoin(targets, eq(targets.id, blocks.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(eq(nights.campaignId, campaignId))
    .orderBy(blocks.startUtc);
  for (const r of blockRows) {
    cal.createEvent({
      id: uid(`block-${r.b.id}`),
      // Every change of a block raises its version (from 1): SEQUENCE counts the changes.
      sequence: r.b.version - 1,
      stamp: new Date(r.b.updatedAt),
      start: new Date(r.b.startUtc),
      end: new Date(r.b.endUtc),
      summary: `${r.target} (${r.system}) ${r.b.kind} at ${r.s.name} [${r.b.status}]`,
      location: location(r.s),
      description: [
        `Night ${r.night} at ${r.s.name}; block ${r.b.id}, version ${r.b.version}.`,
        r.b.notes,
        r.b.laserGuideStar ? LASER_GUIDE_STAR_CAUTION : '',
      ]
        .filter(Boolean)
        .join('\n'),
    });
  }

  // Periapsis passages as their ± 1σ span; the most likely instant in the description.
  const stampOfTarget = new Map<string, string>();
  if (targetIds.length) {
    const named = await db
      .select({ id: targets.id, name: targets.name, system: systems.name })
      .from(targets)
      .innerJoin(systems, eq(systems.id, targets.systemId))
      .where(inArray(targets.id, targetIds));
    for (const t of named) {
      let found: Awaited<ReturnType<typeof currentOrbit>>;
      try {
        found = await currentOrbit(db, t.id);
      } catch (err) {
        if (err instanceof NotFoundError) continue; // no solution: no predicted passages
        throw err;
      }
      const { solution, orbit } = found;
      stampOfTarget.set(t.name, solution.createdAt);
      for (const ev of eventsWithUncertainty(orbit, startJd, endJd, { kinds: ['periapsis'] })) {
        const sigma = ev.sigmaDays;
        const half = sigma !== undefined && sigma > 0 ? sigma : 1 / 1440;
        // The passage's number counted from J2000: the same passage keeps it across refits.
        const passage = Math.round((ev.jd - JD_J2000) / orbit.periodDays);
        const when = jdToIso(ev.jd).slice(0, 16).replace('T', ' ');
        cal.createEvent({
          id: uid(`periapsis-t${t.id}-p${passage}`),
          sequence: solution.version - 1,
          stamp: new Date(solution.createdAt),
          start: new Date(jdToUnixMs(ev.jd - half)),
          end: new Date(jdToUnixMs(ev.jd + half)),
          summary:
            sigma === undefined
              ? `Periapsis of ${t.name} (${t.system})`
              : `Periapsis of ${t.name} (${t.system}), ± 1σ`,
          description: [
            `Most likely at ${when} UTC${sigma === undefined ? '' : `, 1σ ${formatDays(sigma)}`}; the event spans ${sigma === undefined ? 'one minute (the solution has no covariance, so no σ)' : '± 1σ'}.`,
            `Predicted from orbit solution version ${solution.version} (id ${solution.id}).`,
          ].join('\n'),
        });
      }
    }
  }

  // Flags with a date of their own: blend risk spans. Periapsis flags repeat the passages above,
  // stale predictions date from the moment they are computed: neither is an event.
  const { flags } = await campaignFlags(
    db,
    campaignId,
    { nowJd: options.flagsAtJd ?? nowJd() },
    run,
  );
  for (const f of flags) {
    if (!f.blend) continue;
    const pair = [f.target, f.blend.other]
      .map((n) => createHash('sha256').update(n).digest('hex').slice(0, 8))
      .join('-');
    cal.createEvent({
      id: uid(`blend-${pair}-${f.blend.start.slice(0, 10).replace(/-/g, '')}`),
      sequence: 0,
      stamp: new Date(
        later(stampOfTarget.get(f.target), campaign.createdAt, stampOfTarget.get(f.blend.other)),
      ),
      start: new Date(f.blend.start),
      end: new Date(f.blend.end),
      summary: `Blend risk: ${f.target} and ${f.blend.other}`,
      description: f.reason,
    });
  }
  return cal.toString();
}

/** A σ in days, or hours below a day. */
function formatDays(d: number): string {
  return d >= 1 ? `${d.toFixed(2)} d` : `${(d * 24).toFixed(2)} h`;
}
