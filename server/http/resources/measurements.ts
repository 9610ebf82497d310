/** /measurements: astrometry and radial velocities with their uncertainties (observers write). */
import { z } from '@hono/zod-openapi';
import { eq, gte, inArray, lte } from 'drizzle-orm';
import { measurements, targets } from '../../../db/schema.ts';
import { parseEpoch } from '../../science/time/index.ts';
import type { Store } from '../../store/index.ts';
import { MeasurementFields } from '../../store/schemas/entities.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export const MeasurementFilters = z.object({
  targetId: optionalId,
  systemId: optionalId,
  blockId: optionalId,
  kind: z.enum(['offsets', 'separation', 'radial-velocity']).optional(),
  from: z
    .string()
    .optional()
    .openapi({ description: 'earliest epoch (ISO 8601 with zone, JD, MJD, J…)' }),
  to: z.string().optional(),
});

export function measurementWhere(store: Store, q: z.output<typeof MeasurementFilters>) {
  return [
    q.targetId ? eq(measurements.targetId, q.targetId) : undefined,
    q.systemId
      ? inArray(
          measurements.targetId,
          store.db.select({ id: targets.id }).from(targets).where(eq(targets.systemId, q.systemId)),
        )
      : undefined,
    q.blockId ? eq(measurements.blockId, q.blockId) : undefined,
    q.kind ? eq(measurements.kind, q.kind) : undefined,
    q.from ? gte(measurements.epochJd, parseEpoch(q.from, 'from')) : undefined,
    q.to ? lte(measurements.epochJd, parseEpoch(q.to, 'to')) : undefined,
  ];
}

export function measurementRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/measurements',
    tag: 'measurements',
    repo: store.measurements,
    create: MeasurementFields.strict(),
    patch: patchOf(MeasurementFields),
    row: rowOf(MeasurementFields, { epochJd: z.number() }),
    filters: MeasurementFilters,
    where: (q) => measurementWhere(store, q),
    writeRole: 'observer',
  });
}
