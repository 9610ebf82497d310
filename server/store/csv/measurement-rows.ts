/**
 * A measurements CSV checked without the database: every row through the measurement schema and
 * epoch normalisation, giving plain column values (structured-clonable, so a worker thread can do
 * this part) and every problem with its line. Names (system, target) and block references are
 * resolved afterwards, inside the import's transaction.
 */
import { deserialize, serialize } from 'node:v8';
import { measurementRow } from '../repos/measurement-rules.ts';
import { yieldToOthers } from '../yield.ts';
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

/** Rows per packed chunk: unpacking one holds the server's thread for a few milliseconds. */
const ROWS_PER_CHUNK = 2000;

/**
 * Prepared rows as they travel back from a worker thread: serialized in chunks of ROWS_PER_CHUNK,
 * because a worker's answer is unpacked on the server's thread in one go (100,000 row objects
 * held it for a second or more), while chunks of bytes are copied at once and unpacked one by one.
 */
export interface PackedMeasurements extends Omit<PreparedMeasurements, 'rows'> {
  chunks: Uint8Array[];
}

/** `prepareMeasurements` on a worker thread: its answer packed (see PackedMeasurements). */
export function prepareMeasurementsPacked(text: string): PackedMeasurements {
  const { rows, ...rest } = prepareMeasurements(text);
  const chunks: Uint8Array[] = [];
  for (let i = 0; i < rows.length; i += ROWS_PER_CHUNK)
    chunks.push(serialize(rows.slice(i, i + ROWS_PER_CHUNK)));
  return { ...rest, chunks };
}

/** The prepared rows again, a chunk at a time with the event loop free between chunks. */
export async function unpackMeasurements({
  chunks,
  ...rest
}: PackedMeasurements): Promise<PreparedMeasurements> {
  const rows: PreparedMeasurement[] = [];
  for (const chunk of chunks) {
    for (const row of deserialize(chunk) as PreparedMeasurement[]) rows.push(row);
    await yieldToOthers();
  }
  return { ...rest, rows };
}
