/**
 * Staged measurement imports: the rows of a file go into `measurement_staging` in short write
 * transactions (so the server's other writers and a second process wait at most one batch), then
 * one last transaction checks again what may have changed meanwhile and moves them into
 * `measurements` with a single INSERT … SELECT. Readers never see part of a file: staged rows are
 * in their own table until the move commits.
 *
 * A process killed mid-way leaves staged rows behind, never measurements; `clearAbandonedImports`
 * (run on every open and before every import) deletes them: a run is abandoned when it is
 * finished, when its process on this host is gone (or the pid now belongs to a later process),
 * or when its heartbeat is older than the lease (another host's process that died).
 */
import { randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import type { InValue } from '@libsql/client';
import { eq, getTableColumns } from 'drizzle-orm';
import { importRuns, measurements } from '../../../db/schema.ts';
import { libsqlTransaction, type Db, type Tx } from '../database.ts';
import { yieldToOthers } from '../yield.ts';

/** Stored columns of a measurement in insert order: the table's columns but its generated id. */
export const MEASUREMENT_COLUMNS = Object.entries(getTableColumns(measurements))
  .filter(([k]) => k !== 'id')
  .map(([key, c]) => ({ key, name: c.name }));

/**
 * Rows per staging INSERT (21 bound values each). The driver is synchronous, so one statement holds
 * the server's thread while SQLite parses and runs it: 250 rows take a few milliseconds, and the
 * event loop runs between statements (yield.ts).
 */
const ROWS_PER_STATEMENT = 250;
/** Rows per statement when the staged rows are moved in, or deleted, in the same short steps. */
const ROWS_PER_MOVE = 2500;
/** Rows per staging transaction: the longest this import holds the write lock before the swap. */
export const ROWS_PER_BATCH = 5000;
/** A run whose heartbeat is older than this is taken for dead (a process on another host). */
export const IMPORT_LEASE_MS = 10 * 60_000;

/** This process among the writers of the file (a pid alone can be reused after a restart). */
const OWNER = randomUUID();
const HOST = hostname();
/** Leases run on the machine's clock, never the store's frozen or scoped one (clock.ts). */
const wallIso = () => new Date().toISOString();

const columnList = MEASUREMENT_COLUMNS.map((c) => `"${c.name}"`).join(', ');
const tuple = `(?, ${MEASUREMENT_COLUMNS.map(() => '?').join(', ')})`;
const stageSql = (rows: number) =>
  `insert into measurement_staging ("run_id", ${columnList}) values ${Array(rows).fill(tuple).join(', ')}`;
const FULL_STATEMENT = stageSql(ROWS_PER_STATEMENT);

function rawOf(tx: Tx) {
  const raw = libsqlTransaction(tx);
  // drizzle-orm 0.45 keeps it at session.tx; a version that moves it fails here, in every import test.
  if (!raw) throw new Error('staging needs the libSQL transaction under the drizzle transaction');
  return raw;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Delete the staged rows of every run that can no longer finish; returns how many runs. */
export async function clearAbandonedImports(db: Db, nowMs: number = Date.now()): Promise<number> {
  const runs = await db.select().from(importRuns);
  const dead = runs.filter((r) => {
    if (r.finishedAt !== null) return true;
    if (r.host === HOST && (r.pid === process.pid ? r.owner !== OWNER : !alive(r.pid))) return true;
    return nowMs - Date.parse(r.heartbeatAt) > IMPORT_LEASE_MS;
  });
  for (const r of dead)
    await db.transaction((tx) => tx.delete(importRuns).where(eq(importRuns.id, r.id)));
  return dead.length;
}

/**
 * Stage `rows` (values in MEASUREMENT_COLUMNS order) in batches of ROWS_PER_BATCH, each its own
 * write transaction; `onStaged(i)` after each batch, for each row index. Returns the run id.
 */
export async function stageRows(
  db: Db,
  rows: readonly InValue[][],
  onStaged?: (index: number) => void | Promise<void>,
): Promise<number> {
  const at = wallIso();
  const [run] = await db.transaction((tx) =>
    tx
      .insert(importRuns)
      .values({ host: HOST, pid: process.pid, owner: OWNER, startedAt: at, heartbeatAt: at })
      .returning({ id: importRuns.id }),
  );
  const runId = run!.id;
  try {
    for (let i = 0; i < rows.length; i += ROWS_PER_BATCH) {
      const end = Math.min(rows.length, i + ROWS_PER_BATCH);
      await db.transaction(async (tx) => {
        const raw = rawOf(tx);
        for (let s = i; s < end; s += ROWS_PER_STATEMENT) {
          const n = Math.min(ROWS_PER_STATEMENT, end - s);
          const args: InValue[] = [];
          for (let r = s; r < s + n; r++) args.push(runId, ...rows[r]!);
          await raw.execute({ sql: n === ROWS_PER_STATEMENT ? FULL_STATEMENT : stageSql(n), args });
          await yieldToOthers();
        }
        await tx.update(importRuns).set({ heartbeatAt: wallIso() }).where(eq(importRuns.id, runId));
      });
      if (onStaged) for (let r = i; r < end; r++) await onStaged(r);
    }
  } catch (err) {
    await dropRun(db, runId);
    throw err;
  }
  return runId;
}

/**
 * Inside the swap transaction: move the run's rows into `measurements`, in file order, in steps of
 * ROWS_PER_MOVE rows with the event loop free between them (readers on other connections see
 * none of them until the swap commits).
 */
export async function moveStagedRows(tx: Tx, runId: number): Promise<void> {
  const raw = rawOf(tx);
  for (let after = 0; ; ) {
    const last = await raw.execute({
      sql:
        `select max(rowid) as last from (select rowid from measurement_staging where rowid > ? ` +
        `and "run_id" = ? order by rowid limit ${ROWS_PER_MOVE})`,
      args: [after, runId],
    });
    const upTo = last.rows[0]?.last;
    if (upTo === null || upTo === undefined) break;
    await raw.execute({
      sql:
        `insert into measurements (${columnList}) select ${columnList} from ` +
        `measurement_staging where rowid > ? and rowid <= ? and "run_id" = ? order by rowid`,
      args: [after, upTo, runId],
    });
    after = Number(upTo);
    await yieldToOthers();
  }
  await tx.update(importRuns).set({ finishedAt: wallIso() }).where(eq(importRuns.id, runId));
}

/**
 * Delete a run and its staged rows (after the swap, or when the import failed): the rows in short
 * transactions of ROWS_PER_MOVE, then the run. Killed half-way, the run is left for
 * `clearAbandonedImports`.
 */
export async function dropRun(db: Db, runId: number): Promise<void> {
  for (;;) {
    const { rowsAffected } = await db.transaction((tx) =>
      rawOf(tx).execute({
        sql:
          `delete from measurement_staging where rowid in (select rowid from ` +
          `measurement_staging where "run_id" = ? limit ${ROWS_PER_MOVE})`,
        args: [runId],
      }),
    );
    if (rowsAffected === 0) break;
    await yieldToOthers();
  }
  await db.transaction((tx) => tx.delete(importRuns).where(eq(importRuns.id, runId)));
}
