/** Campaigns with their targets and sites (join tables rewritten whole with the campaign). */
import { eq, gte, inArray, lte } from 'drizzle-orm';
import { campaignSites, campaignTargets, campaigns } from '../../../db/schema.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { CampaignFields, CampaignInput } from '../schemas/entities.ts';
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
});

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
