/**
 * Nights and their blocks. A night is a site and the local date on which its evening falls; a
 * block lies within that night (local noon to the next local noon at the site), in its darkness,
 * with the other rules of block-rules.ts.
 */
import { and, eq, gte, inArray, lt, lte } from 'drizzle-orm';
import { blocks, campaignSites, nights } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { jdToIso, parseEpoch } from '../../science/time/index.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { normaliseEpoch } from '../schemas/common.ts';
import { BlockInput, NightFields } from '../schemas/entities.ts';
import { checkBlock, checkBlocksUnder } from './block-rules.ts';
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
  check: async (tx, next, previous) => {
    await requireRef(tx, siteEntity, 'siteId', next.siteId);
    const campaignId = next.campaignId ?? null;
    if (previous && campaignId !== previous.campaignId) {
      // The night's blocks are judged again under the campaign it moves to (its targets, its darkness).
      const campaign =
        campaignId === null ? null : await requireRef(tx, campaignEntity, 'campaignId', campaignId);
      await checkBlocksUnder(tx, [previous], { campaign }, 'campaignId', campaignId);
    }
    if (campaignId === null) return;
    const campaign = await requireRef(tx, campaignEntity, 'campaignId', campaignId);
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

export { nightIntervalUtc } from './night-times.ts';

export const blockEntity = entity<BlockRow>({
  name: 'block',
  table: blocks,
  hasUpdatedAt: true,
  versioned: true,
  orderBy: [blocks.startUtc],
  // The rules with its night and the rows around it: block-rules.ts.
  check: async (tx, next, previous) => {
    const night = await requireRef(tx, nightEntity, 'nightId', next.nightId);
    await requireRef(tx, targetEntity, 'targetId', next.targetId);
    await checkBlock(tx, next, previous, night);
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
    schema: NightFields,
    keys: Object.keys(NightFields.shape),
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
