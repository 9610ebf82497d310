/**
 * Campaigns with their targets and sites (join tables rewritten whole with the campaign). An edit
 * cannot leave the campaign's nights and blocks behind: dates, sites, targets and darkness are
 * checked against them (409 naming the rows).
 */
import { eq, gte, inArray, lte } from 'drizzle-orm';
import { blocks, campaignSites, campaignTargets, campaigns, nights } from '../../../db/schema.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { CampaignFields, CampaignInput } from '../schemas/entities.ts';
import { checkBlocksUnder, dependentsError } from './block-rules.ts';
import { targetEntity } from './catalogue.ts';
import { siteEntity } from './sites.ts';

export type CampaignRow = typeof campaigns.$inferSelect;
export type CampaignView = CampaignRow & { targetIds: number[]; siteIds: number[] };

export const campaignEntity = entity<CampaignRow>({
  name: 'campaign',
  table: campaigns,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [campaigns.startDate],
  check: async (tx, next, previous) => {
    if (!previous) return;
    const own = await tx.select().from(nights).where(eq(nights.campaignId, previous.id));
    // The dates cannot leave a night of the campaign outside them.
    for (const field of ['startDate', 'endDate'] as const) {
      const value = next[field] as string;
      const outside = own.filter((n) => (field === 'startDate' ? n.date < value : n.date > value));
      if (outside.length > 0)
        throw dependentsError(
          field,
          value,
          `cannot move past the campaign's nights: ${outside.length} of them (${outside
            .slice(0, 5)
            .map((n) => n.date)
            .join(
              ', ',
            )}${outside.length > 5 ? ', …' : ''}) lie ${field === 'startDate' ? 'before' : 'after'} it`,
          outside.map((n) => ({ entity: 'night', id: n.id })),
        );
    }
    // Another darkness judges the campaign's blocks again.
    const darkness = (next.limits as CampaignRow['limits'] | undefined)?.darkness;
    if (darkness !== previous.limits?.darkness)
      await checkBlocksUnder(
        tx,
        own,
        { campaign: next as CampaignRow },
        'limits.darkness',
        darkness,
      );
  },
});

/** The campaign's sites and targets cannot drop one that its nights or their blocks use. */
async function checkMembersInUse(
  tx: DbOrTx,
  campaignId: number,
  siteIds: readonly number[],
  targetIds: readonly number[],
): Promise<void> {
  const own = await tx.select().from(nights).where(eq(nights.campaignId, campaignId));
  const atDropped = own.filter((n) => !siteIds.includes(n.siteId));
  if (atDropped.length > 0)
    throw dependentsError(
      'siteIds',
      siteIds,
      `must keep site${atDropped.length > 1 ? 's' : ''} ` +
        `${[...new Set(atDropped.map((n) => n.siteId))].join(', ')}: ${atDropped.length} of the ` +
        `campaign's nights are there`,
      atDropped.map((n) => ({ entity: 'night', id: n.id })),
    );
  const used = own.length
    ? await tx
        .select({ id: blocks.id, targetId: blocks.targetId })
        .from(blocks)
        .where(
          inArray(
            blocks.nightId,
            own.map((n) => n.id),
          ),
        )
    : [];
  const ofDropped = used.filter((b) => !targetIds.includes(b.targetId));
  if (ofDropped.length > 0)
    throw dependentsError(
      'targetIds',
      targetIds,
      `must keep target${ofDropped.length > 1 ? 's' : ''} ${[...new Set(ofDropped.map((b) => b.targetId))].join(', ')}: blocks ${ofDropped
        .slice(0, 10)
        .map((b) => b.id)
        .join(', ')}${ofDropped.length > 10 ? ', …' : ''} of the campaign's nights observe them`,
      ofDropped.map((b) => ({ entity: 'block', id: b.id })),
    );
}

export async function campaignMembers(
  db: DbOrTx,
  campaignId: number,
): Promise<{ targetIds: number[]; siteIds: number[] }> {
  const t = await db
    .select({ id: campaignTargets.targetId })
    .from(campaignTargets)
    .where(eq(campaignTargets.campaignId, campaignId));
  const s = await db
    .select({ id: campaignSites.siteId })
    .from(campaignSites)
    .where(eq(campaignSites.campaignId, campaignId));
  return {
    targetIds: t.map((r) => r.id).sort((a, b) => a - b),
    siteIds: s.map((r) => r.id).sort((a, b) => a - b),
  };
}

/** Which campaigns to list: with a target, with a site, running on some day of [start, end]. */
export interface CampaignFilter {
  targetId?: number | undefined;
  siteId?: number | undefined;
  /** YYYY-MM-DD: campaigns ending on or after it. */
  start?: string | undefined;
  /** YYYY-MM-DD: campaigns starting on or before it. */
  end?: string | undefined;
}

function campaignWhere(f: CampaignFilter, db: DbOrTx) {
  const withMember = (
    col: typeof campaignTargets.targetId | typeof campaignSites.siteId,
    id: number,
  ) =>
    inArray(
      campaigns.id,
      col === campaignTargets.targetId
        ? db.select({ id: campaignTargets.campaignId }).from(campaignTargets).where(eq(col, id))
        : db.select({ id: campaignSites.campaignId }).from(campaignSites).where(eq(col, id)),
    );
  return [
    f.targetId ? withMember(campaignTargets.targetId, f.targetId) : undefined,
    f.siteId ? withMember(campaignSites.siteId, f.siteId) : undefined,
    f.start ? gte(campaigns.endDate, f.start) : undefined,
    f.end ? lte(campaigns.startDate, f.end) : undefined,
  ];
}

export function campaignRepository(db: Db) {
  const keys = Object.keys(CampaignFields.shape).filter(
    (k) => k !== 'targetIds' && k !== 'siteIds',
  );
  const repo = repository(db, {
    entity: campaignEntity,
    where: campaignWhere,
    schema: CampaignInput,
    keys,
    extraInput: (tx, row) => campaignMembers(tx, row.id),
    after: async (tx, _actor, row, input) => {
      const targetIds = [...new Set(input.targetIds)];
      const siteIds = [...new Set(input.siteIds)];
      for (const [k, t] of targetIds.entries())
        await requireRef(tx, targetEntity, `targetIds.${k}`, t);
      for (const [k, s] of siteIds.entries()) await requireRef(tx, siteEntity, `siteIds.${k}`, s);
      await checkMembersInUse(tx, row.id, siteIds, targetIds);
      await tx.delete(campaignTargets).where(eq(campaignTargets.campaignId, row.id));
      await tx.delete(campaignSites).where(eq(campaignSites.campaignId, row.id));
      if (targetIds.length)
        await tx
          .insert(campaignTargets)
          .values(targetIds.map((targetId) => ({ campaignId: row.id, targetId })));
      if (siteIds.length)
        await tx
          .insert(campaignSites)
          .values(siteIds.map((siteId) => ({ campaignId: row.id, siteId })));
    },
  });
  return {
    ...repo,
    /** The row with its target and site ids, as the API shows a campaign. */
    withMembers: async (row: CampaignRow): Promise<CampaignView> => ({
      ...row,
      ...(await campaignMembers(db, row.id)),
    }),
  };
}
