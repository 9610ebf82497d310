/** /systems and /targets: the catalogue of primaries and the stars that orbit them (lead edits). */
import { z } from '@hono/zod-openapi';
import { SystemFields, TargetFields, type Store } from '../../store/index.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export function systemRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/systems',
    tag: 'systems',
    repo: store.systems,
    create: SystemFields.strict(),
    patch: patchOf(SystemFields),
    row: rowOf('SystemRow', SystemFields, { raDeg: z.number(), decDeg: z.number() }),
    filters: z.object({ name: z.string().optional() }),
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
    row: rowOf('TargetRow', TargetFields),
    filters: z.object({ systemId: optionalId }),
    writeRole: 'lead',
  });
}
