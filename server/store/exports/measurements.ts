/** Measurements for export, with their system and target names, as JSON rows or CSV (the import layout). */
import { stringify } from 'csv-stringify/sync';
import { and, asc, eq } from 'drizzle-orm';
import { measurements, systems, targets } from '../../../db/schema.ts';
import type { DbOrTx } from '../database.ts';
import { MEASUREMENT_COLUMNS, NUMERIC } from '../csv/columns.ts';
import { escapeFormulaCell } from '../csv/cells.ts';
import {
  measurementWhere,
  type MeasurementFilter,
  type MeasurementRow,
} from '../repos/measurements.ts';

export type ExportedMeasurement = MeasurementRow & { system: string; target: string };

/** Every measurement matching `filter`, ordered by target and epoch (no paging: exports are whole). */
export async function measurementsForExport(
  db: DbOrTx,
  filter: MeasurementFilter = {},
): Promise<ExportedMeasurement[]> {
  const rows = await db
    .select({ m: measurements, system: systems.name, target: targets.name })
    .from(measurements)
    .innerJoin(targets, eq(targets.id, measurements.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(and(...measurementWhere(filter, db)))
    .orderBy(asc(systems.name), asc(targets.name), asc(measurements.epochJd), asc(measurements.id));
  return rows.map((r) => ({ ...r.m, system: r.system, target: r.target }));
}

/**
 * RFC 4180 CSV with the header of MEASUREMENT_COLUMNS; numbers as stored (full precision), text
 * cells safe to open in a spreadsheet (csv/cells.ts; the import reads them back unchanged).
 */
export function measurementsCsv(rows: readonly ExportedMeasurement[]): string {
  const cells = rows.map((r) =>
    MEASUREMENT_COLUMNS.map((c) => {
      const v = (r as Record<string, unknown>)[c];
      if (v === null || v === undefined) return '';
      return NUMERIC.has(c) ? String(v) : escapeFormulaCell(String(v));
    }),
  );
  return stringify([[...MEASUREMENT_COLUMNS], ...cells]);
}
