/**
 * A campaign's iCalendar feed (RFC 5545, with RFC 7986's calendar NAME): one event per allocated
 * site-night (darkness, in the site's local time with its VTIMEZONE), one per block, one per
 * periapsis passage of a campaign target as its ± 1σ span, and the flags that have a date of
 * their own (blend risk). Calendar programs update an event in place by its UID and keep the
 * highest SEQUENCE, so:
 * - UIDs depend only on the stored rows: the row id (or the target and passage number) and a key
 *   of the campaign (its id and creation instant), never on the host the feed was fetched through;
 * - DTSTAMP is the instant of the last change of any row the event shows (`revision`), and
 *   SEQUENCE the whole seconds from the event's creation to that change: it rises with every
 *   change (RFC 5545 §3.8.7.4, "monotonically incremented"), a rename of its target, system or
 *   site included, and never falls, even when a row is moved under another night, target or
 *   site (a count of changes summed over the rows shown would fall then).
 */
import { createHash } from 'node:crypto';
import { and, eq, inArray, max } from 'drizzle-orm';
import {
  auditTrail,
  blocks,
  nights,
  orbitSolutions,
  sites,
  systems,
  targets,
} from '../../../db/schema.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { nowJd } from '../../clock.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { NotFoundError } from '../errors.ts';
import { campaignEntity, campaignMembers } from '../repos/campaigns.ts';
import { currentOrbit } from '../repos/orbits.ts';
import { campaignFlags } from '../views/planning.ts';
import type { CalendarFeed } from './calendar-text.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';

export interface CalendarOptions {
  /** The moment flags are computed for, JD (UTC); default now. */
  flagsAtJd?: number;
}

/** The UIDs' domain: reserved, so it can never clash with a real host (RFC 2606). */
const UID_DOMAIN = 'epochwright.invalid';

/** The last update of each orbit solution in the audit trail (becoming current again is one). */
async function solutionUpdates(db: DbOrTx, ids: number[]): Promise<Map<number, string>> {
  const out = new Map<number, string>();
  if (ids.length === 0) return out;
  const rows = await db
    .select({ id: auditTrail.entityId, last: max(auditTrail.at) })
    .from(auditTrail)
    .where(
      and(
        eq(auditTrail.entity, 'orbit solution'),
        eq(auditTrail.action, 'update'),
        inArray(auditTrail.entityId, ids),
      ),
    )
    .groupBy(auditTrail.entityId);
  for (const r of rows) if (r.id !== null && r.last !== null) out.set(r.id, r.last);
  return out;
}

/**
 * An event's DTSTAMP and SEQUENCE: `created` is the instant the event came to be (a fixed row's
 * creation), `changes` the last-change instants (ISO 8601 UTC) of every row the event shows.
 */
export function revision(
  created: string,
  changes: (string | null | undefined)[],
  ownChanges = 0,
): { stamp: Date; sequence: number } {
  const last = Math.max(
    Date.parse(created),
    ...changes.filter((x): x is string => typeof x === 'string').map(Date.parse),
  );
  return {
    stamp: new Date(last),
    // A versioned row's own changes count too, so a frozen clock (EPOCHWRIGHT_NOW) still raises it.
    sequence:
      Math.max(0, Math.floor(last / 1000) - Math.floor(Date.parse(created) / 1000)) + ownChanges,
  };
}

export async function campaignCalendar(
  db: DbOrTx,
  campaignId: number,
  options: CalendarOptions = {},
  run: Runner = inProcess,
): Promise<string> {
  const campaign = await getById(db, campaignEntity, campaignId);
  const { targetIds } = await campaignMembers(db, campaignId);
  const key = createHash('sha256')
    .update(`${campaign.id}|${campaign.createdAt}`)
    .digest('hex')
    .slice(0, 12);
  const feed: CalendarFeed = {
    name: `epochwright: ${campaign.name}`,
    startJd: parseEpoch(`${campaign.startDate}T00:00Z`, 'startDate'),
    endJd: parseEpoch(`${campaign.endDate}T00:00Z`, 'endDate') + 1 + 365.25,
    uidSuffix: `-c${campaign.id}-${key}@${UID_DOMAIN}`,
    nights: await nightEvents(db, campaignId),
    blocks: await blockEvents(db, campaignId),
    passages: [],
    blends: [],
  };
  const shownOf = await passageEvents(db, targetIds, feed.passages);
  feed.blends = await blendEvents(db, campaign, options, run, shownOf);
  // The darkness, the passages and the text where `run` puts them (the server: the pool).
  return run('calendarText', feed);
}

/** What a target's events show: a key by its id, and the revisions of its name and solution. */
interface Shown {
  key: string;
  created: string;
  changes: string[];
}

/** One event per allocated site-night, in the site's zone. */
async function nightEvents(db: DbOrTx, campaignId: number): Promise<CalendarFeed['nights']> {
  const out: CalendarFeed['nights'] = [];
  const nightRows = await db
    .select({ n: nights, s: sites })
    .from(nights)
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .where(eq(nights.campaignId, campaignId))
    .orderBy(nights.date, sites.name);
  for (const { n, s } of nightRows)
    out.push({
      id: `night-${n.id}`,
      ...revision(n.createdAt, [n.updatedAt, s.updatedAt]),
      date: n.date,
      site: s,
      notes: n.notes,
    });
  return out;
}

/** One event per block, with its night, target and status; the laser caution where it applies. */
async function blockEvents(db: DbOrTx, campaignId: number): Promise<CalendarFeed['blocks']> {
  const out: CalendarFeed['blocks'] = [];
  const blockRows = await db
    .select({ b: blocks, n: nights, s: sites, t: targets, y: systems })
    .from(blocks)
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .innerJoin(targets, eq(targets.id, blocks.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(eq(nights.campaignId, campaignId))
    .orderBy(blocks.startUtc);
  for (const r of blockRows)
    out.push({
      id: `block-${r.b.id}`,
      ...revision(
        r.b.createdAt,
        [r.b.updatedAt, r.n.updatedAt, r.s.updatedAt, r.t.updatedAt, r.y.updatedAt],
        r.b.version - 1,
      ),
      startMs: Date.parse(r.b.startUtc),
      endMs: Date.parse(r.b.endUtc),
      summary: `${r.t.name} (${r.y.name}) ${r.b.kind} at ${r.s.name} [${r.b.status}]`,
      site: r.s,
      description: [
        `Night ${r.n.date} at ${r.s.name}; block ${r.b.id}, version ${r.b.version}.`,
        r.b.notes,
        r.b.laserGuideStar ? LASER_GUIDE_STAR_CAUTION : '',
      ]
        .filter(Boolean)
        .join('\n'),
    });
  return out;
}

/**
 * The periapsis passages of each current orbit, into `passages` (computed with the text,
 * calendar-text.ts); returns what each target's events show (its key and its revisions) by name.
 */
async function passageEvents(
  db: DbOrTx,
  targetIds: number[],
  passages: CalendarFeed['passages'],
): Promise<Map<string, Shown>> {
  // What a target's events show: its name, its system's, its current solution.
  const shownOf = new Map<string, Shown>();
  if (targetIds.length) {
    const named = await db
      .select({ t: targets, y: systems })
      .from(targets)
      .innerJoin(systems, eq(systems.id, targets.systemId))
      .where(inArray(targets.id, targetIds));
    const solutionIds = await db
      .select({ id: orbitSolutions.id })
      .from(orbitSolutions)
      .where(inArray(orbitSolutions.targetId, targetIds));
    const flips = await solutionUpdates(
      db,
      solutionIds.map((r) => r.id),
    );
    for (const { t: row, y } of named) {
      const t = { id: row.id, name: row.name, system: y.name };
      let found: Awaited<ReturnType<typeof currentOrbit>>;
      try {
        found = await currentOrbit(db, t.id);
      } catch (err) {
        if (err instanceof NotFoundError) continue; // no solution: no predicted passages
        throw err;
      }
      const { solution, orbit } = found;
      const shown = {
        key: `t${t.id}`,
        created: row.createdAt,
        changes: [
          row.updatedAt,
          y.updatedAt,
          solution.createdAt,
          flips.get(solution.id) ?? null,
        ].filter((x): x is string => x !== null),
      };
      shownOf.set(t.name, shown);
      passages.push({
        uidPrefix: `periapsis-t${t.id}-p`,
        name: t.name,
        system: t.system,
        orbit,
        solution: { id: solution.id, version: solution.version },
        ...revision(shown.created, shown.changes),
      });
    }
  }
  return shownOf;
}

/**
 * Flags with a date of their own: blend risk spans. Periapsis flags repeat the passages, stale
 * predictions date from the moment they are computed: neither is an event.
 */
async function blendEvents(
  db: DbOrTx,
  campaign: { id: number; createdAt: string; updatedAt: string },
  options: CalendarOptions,
  run: Runner,
  shownOf: Map<string, Shown>,
): Promise<CalendarFeed['blends']> {
  const out: CalendarFeed['blends'] = [];
  const { flags } = await campaignFlags(
    db,
    campaign.id,
    { nowJd: options.flagsAtJd ?? nowJd() },
    run,
  );
  for (const f of flags) {
    if (!f.blend) continue;
    // Keyed by the targets' ids (a rename keeps the event); the other may be the primary.
    const a = shownOf.get(f.target);
    const b = shownOf.get(f.blend.other);
    const pair = [a?.key ?? hashed(f.target), b?.key ?? hashed(f.blend.other)].join('-');
    out.push({
      id: `blend-${pair}-${f.blend.start.slice(0, 10).replace(/-/g, '')}`,
      ...revision(campaign.createdAt, [
        campaign.updatedAt,
        ...(a?.changes ?? []),
        ...(b?.changes ?? []),
      ]),
      startMs: Date.parse(f.blend.start),
      endMs: Date.parse(f.blend.end),
      summary: `Blend risk: ${f.target} and ${f.blend.other}`,
      description: f.reason,
    });
  }
  return out;
}

const hashed = (name: string) => createHash('sha256').update(name).digest('hex').slice(0, 8);
