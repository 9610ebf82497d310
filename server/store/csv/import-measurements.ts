/**
 * The write half of a measurements import: names and block references resolved with a few
 * queries, then the rows inserted in batches, all inside one transaction with one audit entry.
 * The rows come checked from `prepareMeasurements` (possibly run in a worker thread).
 */
import type { InValue } from '@libsql/client';
import { and, getTableColumns, inArray } from 'drizzle-orm';
import { measurements, systems, targets } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { recordAudit, type Actor } from '../audit.ts';
import { nowMs } from '../../clock.ts';
import { libsqlTransaction, type DbOrTx } from '../database.ts';
import { blockRefs } from '../repos/block-rules.ts';
import {
  checkMeasurementBlock,
  checkMeasurementTime,
  type BlockRef,
} from '../repos/measurement-rules.ts';
import { TWIN_RULE, storedTwins, twinKey } from '../repos/measurement-twins.ts';
import { repeatedFileProblem } from './repeated-file.ts';
import type { PreparedMeasurement, PreparedMeasurements } from './measurement-rows.ts';
import type { ImportProblem } from './read.ts';

/** Rows per INSERT: 20 columns × 500 stays well under SQLite's 32,766 bound parameters. */
const INSERT_BATCH = 500;

/** Lookups by lists of keys, in slices so that no statement carries too many parameters. */
async function inSlices<K, R>(keys: K[], fetch: (slice: K[]) => Promise<R[]>): Promise<R[]> {
  const out: R[] = [];
  for (let i = 0; i < keys.length; i += INSERT_BATCH)
    out.push(...(await fetch(keys.slice(i, i + INSERT_BATCH))));
  return out;
}

const nameKey = (system: unknown, target: unknown) => JSON.stringify([system, target]);

/** Target ids by (system, target) name, for the names that exist. */
async function targetIdsByName(
  tx: DbOrTx,
  rows: PreparedMeasurement[],
): Promise<Map<string, number>> {
  const systemNames = [...new Set(rows.map((r) => r.system).filter((s) => typeof s === 'string'))];
  const sys = await inSlices(systemNames, (s) =>
    tx.select({ id: systems.id, name: systems.name }).from(systems).where(inArray(systems.name, s)),
  );
  const systemName = new Map(sys.map((s) => [s.id, s.name]));
  const tgt = await inSlices([...systemName.keys()], (ids) =>
    tx
      .select({ id: targets.id, systemId: targets.systemId, name: targets.name })
      .from(targets)
      .where(and(inArray(targets.systemId, ids))),
  );
  return new Map(tgt.map((t) => [nameKey(systemName.get(t.systemId), t.name), t.id]));
}

function nameProblem(r: PreparedMeasurement, known: Set<unknown>): ImportProblem {
  if (typeof r.system !== 'string')
    return {
      line: r.line,
      column: 'system',
      value: r.system ?? null,
      rule: 'is required: the name of a stored system',
    };
  if (!known.has(r.system))
    return {
      line: r.line,
      column: 'system',
      value: r.system,
      rule: 'does not name a stored system',
    };
  if (typeof r.target !== 'string')
    return {
      line: r.line,
      column: 'target',
      value: r.target ?? null,
      rule: 'is required: the name of a target of the system',
    };
  return {
    line: r.line,
    column: 'target',
    value: r.target,
    rule: `is not a target of system ${JSON.stringify(r.system)}`,
  };
}

/** Each row with its target id and block checked; problems for those that fail. */
/** The file line of a resolved row (a symbol key: not a column, never inserted). */
const LINE = Symbol('line');

async function resolveRows(
  tx: DbOrTx,
  prepared: PreparedMeasurements,
): Promise<{ values: Record<string, unknown>[]; problems: ImportProblem[] }> {
  const ids = await targetIdsByName(tx, prepared.rows);
  const knownSystems = new Set([...ids.keys()].map((k) => (JSON.parse(k) as unknown[])[0]));
  const blockIds = [
    ...new Set(prepared.rows.map((r) => r.row.blockId).filter((b) => typeof b === 'number')),
  ];
  const blockById: Map<unknown, BlockRef> = await blockRefs(tx, blockIds as number[]);
  const problems: ImportProblem[] = [];
  const values: Record<string, unknown>[] = [];
  const clock = nowMs();
  const now = new Date(clock).toISOString();
  for (const r of prepared.rows) {
    const targetId = ids.get(nameKey(r.system, r.target));
    if (targetId === undefined) {
      problems.push(nameProblem(r, knownSystems));
      continue;
    }
    const next: Record<string, unknown> = {
      ...r.row,
      targetId,
      createdAt: now,
      updatedAt: now,
      [LINE]: r.line,
    };
    try {
      checkMeasurementTime(next, clock);
      if (next.blockId !== null && next.blockId !== undefined) {
        const block = blockById.get(next.blockId);
        if (!block)
          throw new InputError('blockId', next.blockId, 'does not name an existing block');
        checkMeasurementBlock(next, block, clock);
      }
      values.push(next);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      problems.push({ line: r.line, column: err.field, value: err.value, rule: err.rule });
    }
  }
  return { values, problems };
}

/** A problem for each row that repeats a stored measurement or an earlier line of the file. */
async function twinProblems(
  tx: DbOrTx,
  values: Record<string, unknown>[],
): Promise<ImportProblem[]> {
  const stored = await storedTwins(tx, values);
  const seen = new Map<string, number>();
  const problems: ImportProblem[] = [];
  for (const v of values) {
    const key = twinKey(v);
    const line = (v as Record<symbol, unknown>)[LINE] as number;
    const id = stored.get(key);
    const earlier = seen.get(key);
    if (id !== undefined)
      problems.push({
        line,
        column: '(row)',
        value: null,
        rule: `${TWIN_RULE} as stored measurement ${id}`,
      });
    else if (earlier !== undefined)
      problems.push({
        line,
        column: '(row)',
        value: null,
        rule: `${TWIN_RULE} as line ${earlier}`,
      });
    else seen.set(key, line);
  }
  return problems;
}

/** Stored columns in insert order: the table's columns but its generated id. */
const COLUMNS = Object.entries(getTableColumns(measurements)).filter(([k]) => k !== 'id');
const INSERT_HEAD = `insert into measurements (${COLUMNS.map(([, c]) => `"${c.name}"`).join(', ')}) values `;
const TUPLE = `(${COLUMNS.map(() => '?').join(', ')})`;

/**
 * One multi-row INSERT with bound parameters on the transaction's libSQL handle. drizzle's insert
 * builder (and its sql template) map each cell through column objects, which cost four to six times
 * the statement itself at 20,000 rows (measured with the import bench); the values here are already
 * checked and in column form.
 */
async function insertBatch(tx: DbOrTx, batch: Record<string, unknown>[]): Promise<void> {
  const args: InValue[] = [];
  for (const r of batch) for (const [k] of COLUMNS) args.push((r[k] ?? null) as InValue);
  const sql = INSERT_HEAD + batch.map(() => TUPLE).join(', ');
  const raw = libsqlTransaction(tx);
  if (raw) await raw.execute({ sql, args });
  else await tx.insert(measurements).values(batch as (typeof measurements.$inferInsert)[]);
}

export interface MeasurementWriteOptions {
  dryRun: boolean;
  /** Store rows that repeat a stored measurement or an earlier line (default: each one refused). */
  allowDuplicates?: boolean;
  /** Called for every row once its batch is written (progress; tests crash the writer mid-way). */
  onRow?: (index: number) => void | Promise<void>;
}

/**
 * Resolve and write checked rows inside `tx`. Returns every problem (file and references, sorted
 * by line); writes only when there is none and it is not a dry run.
 */
export async function writeMeasurementsIn(
  tx: DbOrTx,
  actor: Actor,
  prepared: PreparedMeasurements,
  options: MeasurementWriteOptions,
): Promise<ImportProblem[]> {
  const { values, problems } = await resolveRows(tx, prepared);
  if (!options.allowDuplicates) {
    const repeated = await repeatedFileProblem(tx, 'measurements', prepared.digest);
    // A repeated file is one problem, not one per row.
    if (repeated) problems.push(repeated);
    else problems.push(...(await twinProblems(tx, values)));
  }
  problems.push(...prepared.problems);
  problems.sort((a, b) => a.line - b.line);
  if (problems.length > 0 || options.dryRun) return problems;
  for (let i = 0; i < values.length; i += INSERT_BATCH) {
    const batch = values.slice(i, i + INSERT_BATCH);
    await insertBatch(tx, batch);
    if (options.onRow) for (let j = 0; j < batch.length; j++) await options.onRow(i + j);
  }
  await recordAudit(tx, actor, 'import', 'measurements', null, {
    rows: values.length,
    digest: prepared.digest,
  });
  return problems;
}
