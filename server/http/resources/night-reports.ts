/** /night-reports: conditions and block outcomes of a night, versioned against lost updates (observers write). */
import { z } from '@hono/zod-openapi';
import { NightReportFields, type Store } from '../../store/index.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export function nightReportRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/night-reports',
    tag: 'night reports',
    repo: store.nightReports,
    create: NightReportFields.strict(),
    patch: patchOf(NightReportFields, ['nightId']),
    row: rowOf(NightReportFields, { version: z.number().int() }),
    filters: z.object({
      nightId: optionalId,
      siteId: optionalId,
      campaignId: optionalId,
      start: z.iso.date().optional().openapi({ description: 'first night (local evening date)' }),
      end: z.iso.date().optional().openapi({ description: 'last night (local evening date)' }),
    }),
    writeRole: 'observer',
    view: store.nightReports.withOutcomes,
  });
}
