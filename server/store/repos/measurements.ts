/** Measurements: astrometric offsets, separation and position angle, or radial velocity, at an epoch. */
import { measurements } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { normaliseEpoch } from '../schemas/common.ts';
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
    const block = await requireRef(tx, blockEntity, 'blockId', next.blockId);
    if (block.targetId !== next.targetId)
      throw new InputError(
        'blockId',
        next.blockId,
        `observed target ${block.targetId}, not target ${String(next.targetId)}`,
      );
  },
});

const keys = Object.keys(MeasurementFields.shape);

export function measurementRow(
  m: ReturnType<typeof MeasurementInput.parse>,
): Record<string, unknown> {
  const { iso, jd } = normaliseEpoch(m.epoch, 'epoch');
  const row: Record<string, unknown> = {};
  for (const k of keys) row[k] = (m as Record<string, unknown>)[k] ?? null;
  return { ...row, notes: m.notes, epoch: iso, epochJd: jd };
}

export function measurementRepository(db: Db) {
  return repository(db, {
    entity: measurementEntity,
    schema: MeasurementInput,
    keys,
    toRow: measurementRow,
  });
}
