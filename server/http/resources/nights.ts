/** /nights and /blocks: the planned nights at each site and their blocks (observers write). */
import { z } from '@hono/zod-openapi';
import { eq, gte, inArray, lt, lte } from 'drizzle-orm';
import { BLOCK_ORIGINS, blocks, nights } from '../../../db/schema.ts';
import { parseEpoch, jdToIso } from '../../science/time/index.ts';
import type { Store } from '../../store/index.ts';
import { BlockFields, NightFields } from '../../store/schemas/entities.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

const dateQuery = z.iso.date().optional();
const instantQuery = z
  .string()
  .optional()
  .openapi({ description: 'epoch (ISO 8601 with zone, JD, MJD, J…)' });

/** An epoch from the query string as ISO UTC (string comparison of ISO UTC is time order). */
export const isoOf = (v: string, field: string) => jdToIso(parseEpoch(v, field));

export const NightRowSchema = rowOf(NightFields).openapi('Night');
export const BlockRowSchema = rowOf(BlockFields, {
  version: z.number().int(),
  origin: z.enum(BLOCK_ORIGINS).openapi({
    description:
      'who made the block: an accepted season plan, night schedule, or a person; set once',
  }),
}).openapi('Block');

export function nightRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/nights',
    tag: 'nights',
    repo: store.nights,
    create: NightFields.strict(),
    patch: patchOf(NightFields, ['siteId', 'date']),
    row: NightRowSchema,
    filters: z.object({
      siteId: optionalId,
      campaignId: optionalId,
      from: dateQuery.openapi({ description: 'first night date, YYYY-MM-DD' }),
      to: dateQuery,
    }),
    where: (q) => [
      q.siteId ? eq(nights.siteId, q.siteId) : undefined,
      q.campaignId ? eq(nights.campaignId, q.campaignId) : undefined,
      q.from ? gte(nights.date, q.from) : undefined,
      q.to ? lte(nights.date, q.to) : undefined,
    ],
    writeRole: 'observer',
  });
}

export function blockRoutes(store: Store) {
  const nightsWhere = (col: typeof nights.siteId | typeof nights.campaignId, id: number) =>
    inArray(blocks.nightId, store.db.select({ id: nights.id }).from(nights).where(eq(col, id)));
  return crudRoutes({
    store,
    path: '/blocks',
    tag: 'blocks',
    repo: store.blocks,
    create: BlockFields.strict(),
    patch: patchOf(BlockFields),
    row: BlockRowSchema,
    filters: z.object({
      nightId: optionalId,
      targetId: optionalId,
      siteId: optionalId,
      campaignId: optionalId,
      from: instantQuery,
      to: instantQuery,
    }),
    where: (q) => [
      q.nightId ? eq(blocks.nightId, q.nightId) : undefined,
      q.targetId ? eq(blocks.targetId, q.targetId) : undefined,
      q.siteId ? nightsWhere(nights.siteId, q.siteId) : undefined,
      q.campaignId ? nightsWhere(nights.campaignId, q.campaignId) : undefined,
      q.from ? gte(blocks.endUtc, isoOf(q.from, 'from')) : undefined,
      q.to ? lt(blocks.startUtc, isoOf(q.to, 'to')) : undefined,
    ],
    writeRole: 'observer',
  });
}
