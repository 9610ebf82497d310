/**
 * A measurements CSV checked without the database: every row through the measurement schema and
 * epoch normalisation, giving plain column values (structured-clonable, so a worker thread can do
 * this part) and every problem with its line. Names (system, target) and block references are
 * resolved afterwards, inside the import's transaction.
 */
import { measurementRow } from '../repos/measurement-rules.ts';
import { fileDigest } from './repeated-file.ts';
import { MeasurementInput } from '../schemas/entities.ts';
import { problemsOf } from '../schemas/common.ts';
import { cellValues, columnOf, readCsv, rowProblems, type ImportProblem } from './read.ts';

/** One checked row: the names to resolve and the measurement's column values (no targetId yet). */
export interface PreparedMeasurement {
  line: number;
  system: unknown;
  target: unknown;
  row: Record<string, unknown>;
}

export interface PreparedMeasurements {
  rows: PreparedMeasurement[];
  /** Rows in the file (bad ones included). */
  total: number;
  /** The file's digest (repeated-file.ts), recorded by the import. */
  digest: string;
  problems: ImportProblem[];
}

/** Stand-in for the target id while the row's shape is checked; replaced once the name is resolved. */
const UNRESOLVED_TARGET = 1;

/** Parse and check a measurements CSV (throws ImportRejected for a broken file or header). */
export function prepareMeasurements(text: string): PreparedMeasurements {
  const { rows } = readCsv('measurements', text);
  const out: PreparedMeasurement[] = [];
  const problems: ImportProblem[] = [];
  for (const { line, cells } of rows) {
    let values: Record<string, unknown>;
    try {
      values = cellValues(cells);
    } catch (err) {
      problems.push(...rowProblems(err, line));
      continue;
    }
    const { system, target, ...rest } = values;
    const input = { ...rest, targetId: UNRESOLVED_TARGET };
    const r = MeasurementInput.safeParse(input);
    if (!r.success) {
      for (const p of problemsOf(r.error, input))
        problems.push({ line, column: columnOf(p.field), value: p.value, rule: p.rule });
      continue;
    }
    const { targetId: _t, ...row } = measurementRow(r.data);
    out.push({ line, system, target, row });
  }
  return { rows: out, total: rows.length, problems, digest: fileDigest(text) };
}
