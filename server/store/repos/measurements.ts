/** Measurements: astrometric offsets, separation and position angle, or radial velocity, at an epoch. */
import { measurements } from '../../../db/schema.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { checkMeasurementBlock, measurementRow } from './measurement-rules.ts';
import { MeasurementFields, MeasurementInput } from '../schemas/entities.ts';
import { targetEntity } from './catalogue.ts';
import { blockEntity } from './nights.ts';

export type MeasurementRow = typeof measurements.$inferSelect;

export const measurementEntity = entity<MeasurementRow>({
  name: 'measurement',
  table: measurements,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [measurements.targetId, measurements.epochJd],
  check: async (tx, next) => {
    await requireRef(tx, targetEntity, 'targetId', next.targetId);
    if (next.blockId === null || next.blockId === undefined) return;
    checkMeasurementBlock(next, await requireRef(tx, blockEntity, 'blockId', next.blockId));
  },
});

const keys = Object.keys(MeasurementFields.shape);

export function measurementRepository(db: Db) {
  return repository(db, {
    entity: measurementEntity,
    schema: MeasurementInput,
    keys,
    toRow: measurementRow,
  });
}
