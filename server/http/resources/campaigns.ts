/** /campaigns: programmes over a date range with their targets, sites, goals and limits (lead edits). */
import { z } from '@hono/zod-openapi';
import { and, gte, inArray, lte } from 'drizzle-orm';
import { campaignSites, campaignTargets, campaigns } from '../../../db/schema.ts';
import type { Store } from '../../store/index.ts';
import { campaignMembers, type CampaignRow } from '../../store/repos/campaigns.ts';
import { CampaignFields } from '../../store/schemas/entities.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

const dateQuery = z.iso.date().optional();

export function campaignRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/campaigns',
    tag: 'campaigns',
    repo: store.campaigns,
    create: CampaignFields.strict(),
    patch: patchOf(CampaignFields),
    row: rowOf(CampaignFields),
    filters: z.object({
      targetId: optionalId,
      siteId: optionalId,
      from: dateQuery.openapi({ description: 'campaigns running on or after this date' }),
      to: dateQuery,
    }),
    where: (q) => [
      q.targetId
        ? inArray(
            campaigns.id,
            store.db
              .select({ id: campaignTargets.campaignId })
              .from(campaignTargets)
              .where(and(inArray(campaignTargets.targetId, [q.targetId]))),
          )
        : undefined,
      q.siteId
        ? inArray(
            campaigns.id,
            store.db
              .select({ id: campaignSites.campaignId })
              .from(campaignSites)
              .where(inArray(campaignSites.siteId, [q.siteId])),
          )
        : undefined,
      q.from ? gte(campaigns.endDate, q.from) : undefined,
      q.to ? lte(campaigns.startDate, q.to) : undefined,
    ],
    writeRole: 'lead',
    view: async (row: CampaignRow) => ({ ...row, ...(await campaignMembers(store.db, row.id)) }),
  });
}
