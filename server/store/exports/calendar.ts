/**
 * A campaign's iCalendar (RFC 5545) feed: its planned blocks and the periapsis passages of its
 * targets from the campaign's start to a year after its end (a fixed window, so these depend
 * only on the stored data), and the campaign's flags as computed at the moment of the request.
 * UIDs are stable (block id, target and orbit number) so a subscribed calendar updates in place.
 */
import ical from 'ical-generator';
import { and, eq, inArray } from 'drizzle-orm';
import { blocks, nights, sites, targets, systems } from '../../../db/schema.ts';
import { findEvents } from '../../science/orbit/index.ts';
import { parseEpoch, jdToUnixMs } from '../../science/time/index.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { campaignEntity, campaignMembers } from '../repos/campaigns.ts';
import { currentOrbit } from '../repos/orbits.ts';
import { NotFoundError } from '../errors.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import { campaignFlags } from '../views/planning.ts';
import { nowJd } from '../../clock.ts';

export interface CalendarOptions {
  /** Host name used in UIDs, e.g. the server's. */
  domain?: string;
  /** Fixed DTSTAMP for reproducible output, ms since 1970. */
  stampMs?: number;
  /** The moment flags are computed for, JD (UTC); default now. */
  flagsAtJd?: number;
}

export async function campaignCalendar(
  db: DbOrTx,
  campaignId: number,
  options: CalendarOptions = {},
): Promise<string> {
  const campaign = await getById(db, campaignEntity, campaignId);
  const { targetIds } = await campaignMembers(db, campaignId);
  const domain = options.domain ?? 'epochwright.invalid';
  const stamp = new Date(options.stampMs ?? Date.parse(campaign.updatedAt));
  const cal = ical({
    name: `epochwright: ${campaign.name}`,
    prodId: { company: 'epochwright', product: 'campaign feed', language: 'EN' },
  });

  const rows = await db
    .select({
      b: blocks,
      night: nights.date,
      site: sites.name,
      target: targets.name,
      system: systems.name,
    })
    .from(blocks)
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .innerJoin(targets, eq(targets.id, blocks.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(and(eq(nights.campaignId, campaignId)))
    .orderBy(blocks.startUtc);
  for (const r of rows) {
    cal.createEvent({
      id: `block-${r.b.id}@${domain}`,
      start: new Date(r.b.startUtc),
      end: new Date(r.b.endUtc),
      stamp,
      summary: `${r.target} (${r.system}) ${r.b.kind} at ${r.site} [${r.b.status}]`,
      description: [
        `Night ${r.night} at ${r.site}; block ${r.b.id}, version ${r.b.version}.`,
        r.b.notes,
        r.b.laserGuideStar ? LASER_GUIDE_STAR_CAUTION : '',
      ]
        .filter(Boolean)
        .join('\n'),
    });
  }

  const startJd = parseEpoch(`${campaign.startDate}T00:00Z`, 'startDate');
  const endJd = parseEpoch(`${campaign.endDate}T00:00Z`, 'endDate') + 1 + 365.25;
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
        if (err instanceof NotFoundError) continue; // a target without a solution has no predicted passages
        throw err;
      }
      for (const ev of findEvents(found.orbit, startJd, endJd, { kinds: ['periapsis'] })) {
        const at = new Date(jdToUnixMs(ev.jd));
        cal.createEvent({
          id: `periapsis-${t.id}-${ev.orbitNumber}-v${found.solution.version}@${domain}`,
          start: at,
          end: new Date(at.getTime() + 60_000),
          stamp,
          summary: `Periapsis of ${t.name} (${t.system})`,
          description: `Predicted from orbit solution version ${found.solution.version} (id ${found.solution.id}): ${ev.epoch}.`,
        });
      }
    }
  }

  // Flags: a UID per kind, target and day, so a flag that persists updates in place.
  const { flags } = await campaignFlags(db, campaignId, { nowJd: options.flagsAtJd ?? nowJd() });
  for (const f of flags) {
    const start = new Date(f.blend ? f.blend.start : f.date);
    const end = f.blend ? new Date(f.blend.end) : new Date(start.getTime() + 60_000);
    cal.createEvent({
      id: `flag-${f.kind}-${encodeURIComponent(f.target).replace(/%/g, '')}-${f.date.slice(0, 10).replace(/-/g, '')}@${domain}`,
      start,
      end: end > start ? end : new Date(start.getTime() + 60_000),
      stamp,
      summary: `Flag, ${f.kind.replace(/-/g, ' ')}: ${f.target}`,
      description: f.reason,
    });
  }
  return cal.toString();
}
