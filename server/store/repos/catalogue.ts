/** Systems (a primary with its position) and targets (the stars that orbit it). */
import { eq } from 'drizzle-orm';
import { systems, targets } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { validateTarget } from '../../science/sky/index.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { normaliseEpoch } from '../schemas/common.ts';
import { SystemFields, TargetFields } from '../schemas/entities.ts';

export type SystemRow = typeof systems.$inferSelect;
export type TargetRow = typeof targets.$inferSelect;

/** A system's position as the sky engine's target input: ICRS at `positionEpoch`, carried by its proper motion. */
export function systemSkyPosition(
  s: Pick<SystemRow, 'raDeg' | 'decDeg' | 'pmRaMasYr' | 'pmDecMasYr' | 'positionEpoch'>,
) {
  return {
    raDeg: s.raDeg,
    decDeg: s.decDeg,
    pmRaMasYr: s.pmRaMasYr,
    pmDecMasYr: s.pmDecMasYr,
    epoch: s.positionEpoch,
  };
}

export const systemEntity = entity<SystemRow>({
  name: 'system',
  table: systems,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [systems.name],
  // The sky engine's validateTarget is the gate: a stored position is one the sky engine can place.
  check: async (_tx, next) => {
    try {
      validateTarget({ name: next.name, ...systemSkyPosition(next as SystemRow) }, 'system');
    } catch (err) {
      if (err instanceof InputError)
        throw new InputError(
          err.field.replace(/^system\./, '').replace(/^epoch$/, 'positionEpoch'),
          err.value,
          err.rule,
        );
      throw err;
    }
  },
});
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

/** Which systems to list: by exact name. */
export interface SystemFilter {
  name?: string | undefined;
}
/** Which targets to list: those of one system. */
export interface TargetFilter {
  systemId?: number | undefined;
}

export function systemRepository(db: Db) {
  return repository(db, {
    entity: systemEntity,
    where: (f: SystemFilter) => [f.name ? eq(systems.name, f.name) : undefined],
    schema: SystemFields,
    keys: Object.keys(SystemFields.shape),
    toRow: (input) => ({
      ...input,
      positionEpoch: normaliseEpoch(input.positionEpoch, 'positionEpoch').iso,
    }),
  });
}

export function targetRepository(db: Db) {
  return repository(db, {
    entity: targetEntity,
    where: (f: TargetFilter) => [f.systemId ? eq(targets.systemId, f.systemId) : undefined],
    schema: TargetFields,
    keys: Object.keys(TargetFields.shape),
  });
}
