/** /measurements: astrometry and radial velocities with their uncertainties (observers write). */
import { z } from '@hono/zod-openapi';
import { MEASUREMENT_KIND_NAMES } from '../../../descriptors/measurement-kinds.ts';
import { MeasurementFields, type Store } from '../../store/index.ts';
import { crudRoutes, optionalId, patchOf, rowOf } from './common.ts';

export const MeasurementFilters = z.object({
  targetId: optionalId,
  systemId: optionalId,
  blockId: optionalId,
  kind: z.enum(MEASUREMENT_KIND_NAMES).optional(),
  start: z
    .string()
    .optional()
    .openapi({ description: 'earliest epoch (ISO 8601 with zone, JD, MJD, J…), inclusive' }),
  end: z.string().optional().openapi({ description: 'latest epoch, inclusive' }),
});

export function measurementRoutes(store: Store) {
  return crudRoutes({
    store,
    path: '/measurements',
    tag: 'measurements',
    repo: store.measurements,
    create: MeasurementFields.strict(),
    patch: patchOf(MeasurementFields),
    row: rowOf('MeasurementRow', MeasurementFields, { epochJd: z.number() }),
    filters: MeasurementFilters,
    writeRole: 'observer',
  });
}
