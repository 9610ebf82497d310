/** /nights and /blocks: the planned nights at each site and their blocks (observers write). */
import { z } from '@hono/zod-openapi';
import { BLOCK_ORIGINS, BlockFields, NightFields, type Store } from '../../store/index.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

const dateQuery = z.iso.date().optional();
const instantQuery = z
  .string()
  .optional()
  .openapi({ description: 'epoch (ISO 8601 with zone, JD, MJD, J…)' });

export const NightRowSchema = rowOf('NightRow', NightFields);
export const BlockRowSchema = rowOf('BlockRow', BlockFields, {
  version: z.number().int(),
  origin: z.enum(BLOCK_ORIGINS).openapi({
    description:
      'who made the block: an accepted season plan, night schedule, or a person; set once',
  }),
});

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
      start: dateQuery.openapi({ description: 'first night date, YYYY-MM-DD' }),
      end: dateQuery.openapi({ description: 'last night date, YYYY-MM-DD' }),
    }),
    writeRole: 'observer',
  });
}

export function blockRoutes(store: Store) {
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
      start: instantQuery,
      end: instantQuery,
    }),
    writeRole: 'observer',
  });
}
