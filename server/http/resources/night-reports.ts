/** /night-reports: conditions and block outcomes of a night, versioned against lost updates (observers write). */
import { z } from '@hono/zod-openapi';
import { BLOCK_STATUSES, NightReportFields, type Store } from '../../store/index.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

const OutcomeRow = NightReportFields.shape.outcomes
  .unwrap()
  .element.extend({
    id: z.number().int(),
    reportId: z.number().int(),
    previousStatus: z.enum(BLOCK_STATUSES).nullable().openapi({
      description: 'the block’s status before the report; deleting the report restores it',
    }),
  })
  .strict()
  .openapi('OutcomeRow');

export function nightReportRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/night-reports',
    tag: 'night reports',
    repo: store.nightReports,
    create: NightReportFields.strict(),
    patch: patchOf(NightReportFields, ['nightId']),
    row: rowOf('NightReportRow', NightReportFields, {
      version: z.number().int(),
      authorId: z.number().int().nullable().openapi({ description: 'the user who wrote it first' }),
      outcomes: z.array(OutcomeRow),
    }),
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
