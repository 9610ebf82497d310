/**
 * Nights and their blocks. A night is a site and the local date on which its evening falls; a
 * block must lie within that night (local noon to the next local noon at the site).
 */
import { and, eq, gte, inArray, lt, lte } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { blocks, campaignSites, nights } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { jdToIso, parseEpoch } from '../../science/time/index.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { normaliseEpoch } from '../schemas/common.ts';
import { BlockInput, NightInput } from '../schemas/entities.ts';
import { campaignEntity } from './campaigns.ts';
import { targetEntity } from './catalogue.ts';
import { siteEntity } from './sites.ts';

export type NightRow = typeof nights.$inferSelect;
export type BlockRow = typeof blocks.$inferSelect;

export const nightEntity = entity<NightRow>({
  name: 'night',
  table: nights,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [nights.date, nights.siteId],
  check: async (tx, next) => {
    await requireRef(tx, siteEntity, 'siteId', next.siteId);
    if (next.campaignId === null || next.campaignId === undefined) return;
    const campaign = await requireRef(tx, campaignEntity, 'campaignId', next.campaignId);
    const date = next.date as string;
    if (date < campaign.startDate || date > campaign.endDate) {
      throw new InputError(
        'date',
        date,
        `must lie within the campaign's dates ${campaign.startDate} to ${campaign.endDate}`,
      );
    }
    const member = await tx
      .select()
      .from(campaignSites)
      .where(
        and(
          eq(campaignSites.campaignId, campaign.id),
          eq(campaignSites.siteId, next.siteId as number),
        ),
      );
    if (member.length === 0)
      throw new InputError(
        'siteId',
        next.siteId,
        `is not one of the sites of campaign ${campaign.id}`,
      );
  },
});

/** The UTC interval of a night: local noon of its date to local noon of the next day, in the site's zone. */
export function nightIntervalUtc(date: string, timeZone: string): { start: string; end: string } {
  const noon = DateTime.fromISO(`${date}T12:00`, { zone: timeZone });
  return { start: noon.toUTC().toISO()!, end: noon.plus({ days: 1 }).toUTC().toISO()! };
}

export const blockEntity = entity<BlockRow>({
  name: 'block',
  table: blocks,
  hasUpdatedAt: true,
  versioned: true,
  orderBy: [blocks.startUtc],
  check: async (tx, next) => {
    const night = await requireRef(tx, nightEntity, 'nightId', next.nightId);
    await requireRef(tx, targetEntity, 'targetId', next.targetId);
    const start = Date.parse(next.startUtc as string);
    const end = Date.parse(next.endUtc as string);
    if (!(end > start)) throw new InputError('endUtc', next.endUtc, 'must be after startUtc');
    const site = await requireRef(tx, siteEntity, 'siteId', night.siteId);
    const span = nightIntervalUtc(night.date, site.timeZone);
    if (start < Date.parse(span.start) || end > Date.parse(span.end)) {
      throw new InputError(
        'startUtc',
        next.startUtc,
        `with endUtc must lie within night ${night.date} at ${site.name} (${span.start} to ${span.end})`,
      );
    }
  },
});

/** Which nights to list: at a site, of a campaign, with dates (YYYY-MM-DD) in [start, end]. */
export interface NightFilter {
  siteId?: number | undefined;
  campaignId?: number | undefined;
  start?: string | undefined;
  end?: string | undefined;
}
/** Which blocks to list; `start`/`end` are epochs (ISO 8601 with zone, JD, MJD, J…) the block overlaps. */
export interface BlockFilter {
  nightId?: number | undefined;
  targetId?: number | undefined;
  siteId?: number | undefined;
  campaignId?: number | undefined;
  start?: string | undefined;
  end?: string | undefined;
}

/** An epoch as ISO UTC (string comparison of ISO UTC is time order). */
const isoOf = (v: string, field: string) => jdToIso(parseEpoch(v, field));

function blockWhere(f: BlockFilter, db: DbOrTx) {
  const ofNights = (col: typeof nights.siteId | typeof nights.campaignId, id: number) =>
    inArray(blocks.nightId, db.select({ id: nights.id }).from(nights).where(eq(col, id)));
  return [
    f.nightId ? eq(blocks.nightId, f.nightId) : undefined,
    f.targetId ? eq(blocks.targetId, f.targetId) : undefined,
    f.siteId ? ofNights(nights.siteId, f.siteId) : undefined,
    f.campaignId ? ofNights(nights.campaignId, f.campaignId) : undefined,
    f.start ? gte(blocks.endUtc, isoOf(f.start, 'start')) : undefined,
    f.end ? lt(blocks.startUtc, isoOf(f.end, 'end')) : undefined,
  ];
}

export function nightRepository(db: Db) {
  return repository(db, {
    entity: nightEntity,
    where: (f: NightFilter) => [
      f.siteId ? eq(nights.siteId, f.siteId) : undefined,
      f.campaignId ? eq(nights.campaignId, f.campaignId) : undefined,
      f.start ? gte(nights.date, f.start) : undefined,
      f.end ? lte(nights.date, f.end) : undefined,
    ],
    schema: NightInput,
    keys: Object.keys(NightInput.shape),
    fixedKeys: ['siteId', 'date'],
  });
}

export function blockRepository(db: Db) {
  return repository(db, {
    entity: blockEntity,
    where: blockWhere,
    schema: BlockInput,
    keys: Object.keys(BlockInput.shape),
    fixedKeys: ['origin'],
    toRow: (b) => ({
      ...b,
      startUtc: normaliseEpoch(b.startUtc, 'startUtc').iso,
      endUtc: normaliseEpoch(b.endUtc, 'endUtc').iso,
    }),
  });
}
