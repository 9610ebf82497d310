/** /sites: observing locations with their pointing limits (lead edits). */
import { z } from '@hono/zod-openapi';
import type { Store } from '../../store/index.ts';
import { SiteFields } from '../../store/schemas/entities.ts';
import { crudRoutes, patchOf, rowOf } from './common.ts';

export function siteRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/sites',
    tag: 'sites',
    repo: store.sites,
    create: SiteFields.strict(),
    patch: patchOf(SiteFields),
    row: rowOf(SiteFields),
    filters: z.object({}),
    where: () => [],
    writeRole: 'lead',
  });
}
