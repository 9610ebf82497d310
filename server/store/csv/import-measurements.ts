/**
 * The write half of a measurements import, all or nothing for the user but never one long write:
 * names, blocks, duplicates and the clock are checked with reads (no write lock), the rows are
 * staged in short batches (staging.ts), and one last transaction checks again whatever another
 * writer may have changed meanwhile (targets, blocks, new twins, the same file) and moves the
 * rows in, with the import's one audit entry. The rows come checked from `prepareMeasurements`
 * (possibly run in a worker thread). The writes run on the server's thread, so every long loop and
 * every bulk statement is cut into short steps with the event loop free between them (yield.ts).
 */
import type { InValue } from '@libsql/client';
import { and, gt, inArray, max } from 'drizzle-orm';
import { measurements, systems, targets } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { recordAudit, type Actor } from '../audit.ts';
import { nowMs } from '../../clock.ts';
import type { Db, DbOrTx } from '../database.ts';
import { yieldToOthers } from '../yield.ts';
import {
  MEASUREMENT_COLUMNS,
  clearAbandonedImports,
  dropRun,
  moveStagedRows,
  stageRows,
} from './staging.ts';
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

/** Rows of the file resolved against the store as it was read: what the swap checks again. */
interface ResolvedRows {
  /** Column values in MEASUREMENT_COLUMNS order, in file order. */
  values: InValue[][];
  /** The twin key and file line of each row of `values`. */
  keys: string[];
  lines: number[];
  /** Rows on a block, with the block as it was read. */
  onBlocks: { next: Record<string, unknown>; line: number }[];
  blocks: Map<number, BlockRef>;
  targetIds: Set<number>;
  /** The newest measurement id when the file was checked: later rows may be new twins. */
  lastMeasurementId: number;
  problems: ImportProblem[];
}

/** Let other requests run between slices of a long loop on the server's thread. */
const SLICE = 1000;

/** Each row with its target id, the clock and its block checked; problems for those that fail. */
async function resolveRows(db: DbOrTx, prepared: PreparedMeasurements): Promise<ResolvedRows> {
  const [newest] = await db.select({ id: max(measurements.id) }).from(measurements);
  const ids = await targetIdsByName(db, prepared.rows);
  const knownSystems = new Set([...ids.keys()].map((k) => (JSON.parse(k) as unknown[])[0]));
  const blockIds = [
    ...new Set(prepared.rows.map((r) => r.row.blockId).filter((b) => typeof b === 'number')),
  ];
  const out: ResolvedRows = {
    values: [],
    keys: [],
    lines: [],
    onBlocks: [],
    blocks: await blockRefs(db, blockIds as number[]),
    targetIds: new Set(),
    lastMeasurementId: newest?.id ?? 0,
    problems: [],
  };
  const clock = nowMs();
  const now = new Date(clock).toISOString();
  for (const [i, r] of prepared.rows.entries()) {
    if (i % SLICE === SLICE - 1) await yieldToOthers();
    const targetId = ids.get(nameKey(r.system, r.target));
    if (targetId === undefined) {
      out.problems.push(nameProblem(r, knownSystems));
      continue;
    }
    // The prepared row is this import's own copy: completed in place rather than copied.
    const next = r.row;
    next.targetId = targetId;
    next.createdAt = now;
    next.updatedAt = now;
    try {
      checkMeasurementTime(next, clock);
      if (next.blockId !== null && next.blockId !== undefined) {
        checkOnBlock(next, out.blocks, clock);
        out.onBlocks.push({ next, line: r.line });
      }
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      out.problems.push({ line: r.line, column: err.field, value: err.value, rule: err.rule });
      continue;
    }
    out.targetIds.add(targetId);
    out.values.push(MEASUREMENT_COLUMNS.map(({ key }) => (next[key] ?? null) as InValue));
    out.keys.push(twinKey(next));
    out.lines.push(r.line);
  }
  return out;
}

function checkOnBlock(next: Record<string, unknown>, blocks: Map<number, BlockRef>, clock: number) {
  const block = blocks.get(next.blockId as number);
  if (!block) throw new InputError('blockId', next.blockId, 'does not name an existing block');
  checkMeasurementBlock(next, block, clock);
}

/** A problem for each row that repeats a stored measurement (`stored`: key → id) or an earlier line. */
async function twinProblems(
  rows: ResolvedRows,
  stored: Map<string, number>,
): Promise<ImportProblem[]> {
  const seen = new Map<string, number>();
  const problems: ImportProblem[] = [];
  for (const [i, key] of rows.keys.entries()) {
    if (i % SLICE === SLICE - 1) await yieldToOthers();
    const line = rows.lines[i]!;
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

/** Stored twins among the measurements written after `afterId` (by another writer, mid-import). */
async function twinsSince(tx: DbOrTx, rows: ResolvedRows): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  const recent = await tx
    .select()
    .from(measurements)
    .where(
      and(
        gt(measurements.id, rows.lastMeasurementId),
        inArray(measurements.targetId, [...rows.targetIds]),
      ),
    );
  for (const m of recent) {
    const key = twinKey(m as Record<string, unknown>);
    if (!out.has(key)) out.set(key, m.id);
  }
  return out;
}

/**
 * At the swap, what may have changed since the rows were checked: a target deleted, a block
 * edited or deleted, a twin stored, the same file imported by another writer.
 */
async function problemsSinceChecked(
  tx: DbOrTx,
  rows: ResolvedRows,
  prepared: PreparedMeasurements,
  allowDuplicates: boolean,
): Promise<ImportProblem[]> {
  const problems: ImportProblem[] = [];
  if (!allowDuplicates) {
    const repeated = await repeatedFileProblem(tx, 'measurements', prepared.digest);
    if (repeated) return [repeated];
  }
  const present = new Set(
    (
      await tx
        .select({ id: targets.id })
        .from(targets)
        .where(inArray(targets.id, [...rows.targetIds]))
    ).map((t) => t.id),
  );
  const gone = [...rows.targetIds].filter((id) => !present.has(id));
  for (const id of gone)
    problems.push({
      line: rows.lines[rows.values.findIndex((v) => v[TARGET_INDEX] === id)] ?? 1,
      column: 'target',
      value: id,
      rule: `target ${id} was deleted while the file was imported; nothing was written`,
    });
  const fresh = await blockRefs(tx, [...rows.blocks.keys()]);
  const clock = nowMs();
  for (const { next, line } of rows.onBlocks) {
    const id = next.blockId as number;
    if (JSON.stringify(fresh.get(id)) === JSON.stringify(rows.blocks.get(id))) continue;
    try {
      checkOnBlock(next, fresh, clock);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      problems.push({
        line,
        column: err.field,
        value: err.value,
        rule: `${err.rule} (block ${id} changed while the file was imported)`,
      });
    }
  }
  if (!allowDuplicates) problems.push(...(await twinProblems(rows, await twinsSince(tx, rows))));
  return problems;
}

const TARGET_INDEX = MEASUREMENT_COLUMNS.findIndex((c) => c.key === 'targetId');

export interface MeasurementWriteOptions {
  dryRun: boolean;
  /** Store rows that repeat a stored measurement or an earlier line (default: each one refused). */
  allowDuplicates?: boolean;
  /** Called for every row once its batch is staged (progress; tests kill the writer mid-way). */
  onRow?: (index: number) => void | Promise<void>;
}

/** Thrown inside the swap to roll it back with the problems found there. */
class SwapRefused extends Error {
  constructor(readonly problems: ImportProblem[]) {
    super('the import was refused at the swap');
  }
}

/**
 * Check and write prepared rows. Returns every problem (file, references, duplicates; sorted by
 * line); writes only when there is none and it is not a dry run, and then all rows at once.
 */
export async function writeMeasurements(
  db: Db,
  actor: Actor,
  prepared: PreparedMeasurements,
  options: MeasurementWriteOptions,
): Promise<ImportProblem[]> {
  const rows = await resolveRows(db, prepared);
  const problems = [...rows.problems, ...prepared.problems];
  if (!options.allowDuplicates) {
    const repeated = await repeatedFileProblem(db, 'measurements', prepared.digest);
    // A repeated file is one problem, not one per row.
    if (repeated) problems.push(repeated);
    else
      problems.push(...(await twinProblems(rows, await storedTwins(db, rowsForTwins(prepared)))));
  }
  problems.sort((a, b) => a.line - b.line);
  if (problems.length > 0 || options.dryRun) return problems;
  await clearAbandonedImports(db);
  const runId = await stageRows(db, rows.values, options.onRow);
  try {
    await db.transaction(async (tx) => {
      const late = await problemsSinceChecked(tx, rows, prepared, options.allowDuplicates ?? false);
      if (late.length > 0) throw new SwapRefused(late.sort((a, b) => a.line - b.line));
      await moveStagedRows(tx, runId);
      await recordAudit(tx, actor, 'import', 'measurements', null, {
        rows: rows.values.length,
        digest: prepared.digest,
      });
    });
  } catch (err) {
    if (err instanceof SwapRefused) return err.problems;
    throw err;
  } finally {
    await dropRun(db, runId);
  }
  return [];
}

/** The resolved rows of the file (those with a target), as the twin search reads them. */
function rowsForTwins(prepared: PreparedMeasurements): Record<string, unknown>[] {
  return prepared.rows.map((r) => r.row).filter((row) => row.targetId !== undefined);
}
