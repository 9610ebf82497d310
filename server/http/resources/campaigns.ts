/** /campaigns: programmes over a date range with their targets, sites, goals and limits (lead edits). */
import { z } from '@hono/zod-openapi';
import { CampaignFields, type Store } from '../../store/index.ts';
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
    row: rowOf('CampaignRow', CampaignFields),
    filters: z.object({
      targetId: optionalId,
      siteId: optionalId,
      start: dateQuery.openapi({ description: 'campaigns running on or after this date' }),
      end: dateQuery.openapi({ description: 'campaigns running on or before this date' }),
    }),
    writeRole: 'lead',
    view: store.campaigns.withMembers,
  });
}
