/** /night-reports: conditions and block outcomes of a night, versioned against lost updates (observers write). */
import { z } from '@hono/zod-openapi';
import { eq, gte, inArray, lte } from 'drizzle-orm';
import { nightReports, nights } from '../../../db/schema.ts';
import type { Store } from '../../store/index.ts';
import { outcomesOf, type NightReportRow } from '../../store/repos/reports.ts';
import { NightReportFields } from '../../store/schemas/entities.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export function nightReportRoutes(store: Store) {
  const nightIds = (cond: ReturnType<typeof eq>) =>
    inArray(nightReports.nightId, store.db.select({ id: nights.id }).from(nights).where(cond));
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
      from: z.iso.date().optional(),
      to: z.iso.date().optional(),
    }),
    where: (q) => [
      q.nightId ? eq(nightReports.nightId, q.nightId) : undefined,
      q.siteId ? nightIds(eq(nights.siteId, q.siteId)) : undefined,
      q.campaignId ? nightIds(eq(nights.campaignId, q.campaignId)) : undefined,
      q.from ? nightIds(gte(nights.date, q.from)) : undefined,
      q.to ? nightIds(lte(nights.date, q.to)) : undefined,
    ],
    writeRole: 'observer',
    view: async (row: NightReportRow) => ({ ...row, outcomes: await outcomesOf(store.db, row.id) }),
  });
}
