/** /sites: observing locations with their pointing limits (lead edits). */
import { z } from '@hono/zod-openapi';
import { SiteFields, type Store } from '../../store/index.ts';
import { crudRoutes, patchOf, rowOf } from './common.ts';

export function siteRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/sites',
    tag: 'sites',
    repo: store.sites,
    create: SiteFields.strict(),
    patch: patchOf(SiteFields),
    row: rowOf('SiteRow', SiteFields, { latitudeDeg: z.number(), longitudeDeg: z.number() }),
    filters: z.object({}),
    writeRole: 'lead',
  });
}
