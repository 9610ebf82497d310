/** Systems (a primary with its position) and targets (the stars that orbit it). */
import { systems, targets } from '../../../db/schema.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { SystemInput, TargetInput } from '../schemas/entities.ts';

export type SystemRow = typeof systems.$inferSelect;
export type TargetRow = typeof targets.$inferSelect;

export const systemEntity = entity<SystemRow>({ name: 'system', table: systems, hasUpdatedAt: true, versioned: false, orderBy: [systems.name] });
export const targetEntity = entity<TargetRow>({
  name: 'target',
  table: targets,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [targets.systemId, targets.name],
  check: async (tx, next) => {
    await requireRef(tx, systemEntity, 'systemId', next.systemId);
  },
});

export function systemRepository(db: Db) {
  return repository(db, { entity: systemEntity, schema: SystemInput, keys: Object.keys(SystemInput.shape) });
}

export function targetRepository(db: Db) {
  return repository(db, { entity: targetEntity, schema: TargetInput, keys: Object.keys(TargetInput.shape) });
}
