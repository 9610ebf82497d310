/** Measurements for export, with their system and target names, as JSON rows or CSV (the import layout). */
import { stringify } from 'csv-stringify/sync';
import { and, asc, eq, gt } from 'drizzle-orm';
import { measurements, systems, targets } from '../../../db/schema.ts';
import type { DbOrTx } from '../database.ts';
import { readInPages } from '../yield.ts';
import { MEASUREMENT_COLUMNS, NUMERIC } from '../csv/columns.ts';
import { escapeFormulaCell } from '../csv/cells.ts';
import {
  measurementWhere,
  type MeasurementFilter,
  type MeasurementRow,
} from '../repos/measurements.ts';

export type ExportedMeasurement = MeasurementRow & { system: string; target: string };

/**
 * Every measurement matching `filter`, ordered by system, target and epoch (no paging: exports are
 * whole). Read in pages by id with the event loop free between them (yield.ts), then put in order
 * here: names as SQLite's BINARY collation orders them (UTF-8 bytes), then epoch, then id.
 */
export async function measurementsForExport(
  db: DbOrTx,
  filter: MeasurementFilter = {},
): Promise<ExportedMeasurement[]> {
  const rows = await readInPages(
    (after, limit) =>
      db
        .select({ m: measurements, system: systems.name, target: targets.name })
        .from(measurements)
        .innerJoin(targets, eq(targets.id, measurements.targetId))
        .innerJoin(systems, eq(systems.id, targets.systemId))
        .where(and(gt(measurements.id, after), ...measurementWhere(filter, db)))
        .orderBy(asc(measurements.id))
        .limit(limit),
    (r) => r.m.id,
  );
  const rank = byteOrderRanks(rows.flatMap((r) => [r.system, r.target]));
  rows.sort(
    (a, b) =>
      rank.get(a.system)! - rank.get(b.system)! ||
      rank.get(a.target)! - rank.get(b.target)! ||
      a.m.epochJd - b.m.epochJd ||
      a.m.id - b.m.id,
  );
  return rows.map((r) => ({ ...r.m, system: r.system, target: r.target }));
}

/** Each distinct name's place in UTF-8 byte order (how SQLite compares text by default). */
function byteOrderRanks(names: string[]): Map<string, number> {
  const distinct = [...new Set(names)].sort((a, b) =>
    Buffer.compare(Buffer.from(a), Buffer.from(b)),
  );
  return new Map(distinct.map((n, i) => [n, i]));
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
