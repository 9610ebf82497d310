/** Measurements for export, with their system and target names, as JSON rows or CSV (the import layout). */
import { stringify } from 'csv-stringify/sync';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { measurements, systems, targets } from '../../../db/schema.ts';
import type { DbOrTx } from '../database.ts';
import { MEASUREMENT_COLUMNS, NUMERIC } from '../csv/columns.ts';
import { escapeFormulaCell } from '../csv/cells.ts';
import {
  measurementsInEpochOrder,
  measurementWhere,
  type MeasurementFilter,
  type MeasurementRow,
} from '../repos/measurements.ts';

export type ExportedMeasurement = MeasurementRow & { system: string; target: string };

/**
 * Every measurement matching `filter`, ordered by system, target and epoch, then id (no paging:
 * exports are whole). The targets come in name order from SQLite (BINARY collation: UTF-8 bytes),
 * and each target's rows in epoch order along its index, in pages with the event loop free between
 * them (yield.ts): no sort of every row on the server's thread.
 */
export async function measurementsForExport(
  db: DbOrTx,
  filter: MeasurementFilter = {},
): Promise<ExportedMeasurement[]> {
  const { targetId, systemId, kind, blockId, ...epochs } = filter;
  const named = await db
    .select({ id: targets.id, target: targets.name, system: systems.name })
    .from(targets)
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(
      and(
        targetId ? eq(targets.id, targetId) : undefined,
        systemId ? eq(targets.systemId, systemId) : undefined,
        // A block's measurements are of its target alone (found along the block index).
        blockId
          ? inArray(
              targets.id,
              db
                .select({ id: measurements.targetId })
                .from(measurements)
                .where(eq(measurements.blockId, blockId)),
            )
          : undefined,
      ),
    )
    .orderBy(asc(systems.name), asc(targets.name), asc(targets.id));
  // The epoch range in SQL (along the index); kind and block a page at a time (see
  // measurementsInEpochOrder).
  const where = measurementWhere(epochs, db);
  const out: ExportedMeasurement[] = [];
  for (const { id, system, target } of named) {
    const rows = await measurementsInEpochOrder(db, id, where, (m) =>
      (kind && m.kind !== kind) || (blockId && m.blockId !== blockId)
        ? undefined
        : { ...m, system, target },
    );
    for (const r of rows) out.push(r);
  }
  return out;
}

/**
 * RFC 4180 CSV with the header of MEASUREMENT_COLUMNS; numbers as stored (full precision), text
 * cells safe to open in a spreadsheet (csv/cells.ts; the import reads them back unchanged).
 * `withHeader: false` gives the lines alone, to follow an earlier part of the same file.
 */
export function measurementsCsv(rows: readonly ExportedMeasurement[], withHeader = true): string {
  const cells = rows.map((r) =>
    MEASUREMENT_COLUMNS.map((c) => {
      const v = (r as Record<string, unknown>)[c];
      if (v === null || v === undefined) return '';
      return NUMERIC.has(c) ? String(v) : escapeFormulaCell(String(v));
    }),
  );
  return stringify(withHeader ? [[...MEASUREMENT_COLUMNS], ...cells] : cells);
}
