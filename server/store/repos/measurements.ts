/** Measurements: astrometric offsets, separation and position angle, or radial velocity, at an epoch. */
import { and, asc, eq, gte, inArray, lte, sql, type SQL } from 'drizzle-orm';
import { measurements, targets } from '../../../db/schema.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { entity, requireRef } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { readInPages } from '../yield.ts';
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

/**
 * A target's measurements (those `where` keeps) in epoch order, then id, read in pages along the
 * (target, epoch) index: SQLite gives them in order, so no sort of every row holds the server's
 * thread (a JavaScript sort of 100,000 rows did for a second under load). `keep` maps each row,
 * a page at a time, or drops it (undefined): a rare kind or block is better picked there than in
 * `where`, where one statement would walk every row of the target to fill a page.
 */
export function measurementsInEpochOrder<T = MeasurementRow>(
  db: DbOrTx,
  targetId: number,
  where: (SQL | undefined)[] = [],
  keep?: (row: MeasurementRow) => T | undefined,
): Promise<T[]> {
  return readInPages(
    (after: [number, number] | undefined, limit) =>
      db
        .select()
        .from(measurements)
        .where(
          and(
            eq(measurements.targetId, targetId),
            after
              ? sql`(${measurements.epochJd}, ${measurements.id}) > (${after[0]}, ${after[1]})`
              : undefined,
            ...where,
          ),
        )
        .orderBy(asc(measurements.epochJd), asc(measurements.id))
        .limit(limit),
    (r): [number, number] => [r.epochJd, r.id],
    keep,
  );
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
