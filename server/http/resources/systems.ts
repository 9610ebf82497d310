/** /systems and /targets: the catalogue of primaries and the stars that orbit them (lead edits). */
import { z } from '@hono/zod-openapi';
import { eq } from 'drizzle-orm';
import { systems, targets } from '../../../db/schema.ts';
import type { Store } from '../../store/index.ts';
import { SystemFields, TargetFields } from '../../store/schemas/entities.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export function systemRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/systems',
    tag: 'systems',
    repo: store.systems,
    create: SystemFields.strict(),
    patch: patchOf(SystemFields),
    row: rowOf(SystemFields),
    filters: z.object({ name: z.string().optional() }),
    where: (q) => [q.name ? eq(systems.name, q.name) : undefined],
    writeRole: 'lead',
  });
}

export function targetRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/targets',
    tag: 'targets',
    repo: store.targets,
    create: TargetFields.strict(),
    patch: patchOf(TargetFields),
    row: rowOf(TargetFields),
    filters: z.object({ systemId: optionalId }),
    where: (q) => [q.systemId ? eq(targets.systemId, q.systemId) : undefined],
    writeRole: 'lead',
  });
}
