/** Measurements: astrometric offsets, separation and position angle, or radial velocity, at an epoch. */
import { eq, gte, inArray, lte } from 'drizzle-orm';
import { measurements, targets } from '../../../db/schema.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { nowMs } from '../../clock.ts';
import { blockRefs } from './block-rules.ts';
import {
  checkMeasurementBlock,
  checkMeasurementTime,
  measurementRow,
} from './measurement-rules.ts';
import { refuseStoredTwin } from './measurement-twins.ts';
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
  check: async (tx, next, previous) => {
    await requireRef(tx, targetEntity, 'targetId', next.targetId);
    const now = nowMs();
    checkMeasurementTime(next, now);
    if (next.blockId !== null && next.blockId !== undefined) {
      await requireRef(tx, blockEntity, 'blockId', next.blockId);
      const ref = (await blockRefs(tx, [next.blockId as number])).get(next.blockId as number)!;
      checkMeasurementBlock(next, ref, now);
    }
    await refuseStoredTwin(tx, next, previous?.id);
  },
});

const keys = Object.keys(MeasurementFields.shape);

/** Which measurements to list; `start`/`end` are epochs (ISO 8601 with zone, JD, MJD, J…), inclusive. */
export interface MeasurementFilter {
  targetId?: number | undefined;
  systemId?: number | undefined;
  blockId?: number | undefined;
  kind?: MeasurementRow['kind'] | undefined;
  start?: string | undefined;
  end?: string | undefined;
}

export function measurementWhere(f: MeasurementFilter, db: DbOrTx) {
  return [
    f.targetId ? eq(measurements.targetId, f.targetId) : undefined,
    f.systemId
      ? inArray(
          measurements.targetId,
          db.select({ id: targets.id }).from(targets).where(eq(targets.systemId, f.systemId)),
        )
      : undefined,
    f.blockId ? eq(measurements.blockId, f.blockId) : undefined,
    f.kind ? eq(measurements.kind, f.kind) : undefined,
    f.start ? gte(measurements.epochJd, parseEpoch(f.start, 'start')) : undefined,
    f.end ? lte(measurements.epochJd, parseEpoch(f.end, 'end')) : undefined,
  ];
}

export function measurementRepository(db: Db) {
  return repository(db, {
    entity: measurementEntity,
    where: measurementWhere,
    schema: MeasurementInput,
    keys,
    toRow: measurementRow,
  });
}
