/**
 * One writer at a time, without freezing the event loop.
 *
 * libSQL's local driver is synchronous: when a write finds the file locked, its busy handler
 * sleeps on the calling thread. Two connections of our own pool contending therefore deadlock —
 * the transaction holding the lock cannot run its next statement while the other connection's
 * wait blocks the thread — and a wait for another process (the CLI importing) stalls every
 * request. So this process opens one write transaction at a time (a queue), and when another
 * process holds the lock, BEGIN IMMEDIATE fails after a short busy timeout and is retried after an
 * asynchronous pause, up to a deadline. (SQLite: one writer per database file, sqlite.org "File
 * Locking And Concurrency", from memory.)
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { sqliteCode } from './errors.ts';

/**
 * A transaction begun inside another of the same database. It would wait in the queue behind the
 * one that holds it, forever; so it fails at once, naming the fix. An internal error (a 500): no
 * request can cause it, only code that calls `db.transaction` where it was handed a `tx`.
 */
export class NestedTransaction extends Error {
  override readonly name = 'NestedTransaction';
  constructor() {
    super(
      'db.transaction was called inside a transaction of the same database: it would wait behind ' +
        'itself forever; use the tx you were given',
    );
  }
}

/** Busy timeout of each connection, ms: short, since the thread sleeps through it. */
export const CONNECTION_BUSY_MS = 50;
/** How long a write transaction may wait for another process's write, ms, before SQLITE_BUSY. */
export const WRITE_WAIT_MS = 30_000;

/** Fresh starts a transaction gets after failing busy once begun. */
const MAX_RESETS = 3;
const BUSY = new Set(['SQLITE_BUSY', 'SQLITE_LOCKED', 'SQLITE_BUSY_SNAPSHOT']);
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

type Transaction<Tx, C> = <R>(fn: (tx: Tx) => Promise<R>, config?: C) => Promise<R>;

/**
 * Wrap a transaction method: queued in this process, BEGIN retried while another process writes,
 * a nested call refused at once (NestedTransaction).
 * A transaction that failed busy after it began (a statement left half-run, which would otherwise
 * keep its connection on an old snapshot and fail every later commit) makes `reset` drop the
 * pool's connections (none is in use: this is the only open transaction) and runs it again (a few
 * times, within the deadline).
 */
export function gatedTransaction<Tx, C>(
  original: Transaction<Tx, C>,
  reset: () => Promise<void>,
  waitMs: number = WRITE_WAIT_MS,
): Transaction<Tx, C> {
  let tail: Promise<unknown> = Promise.resolve();
  // Set for everything a transaction of this gate runs and awaits, so a nested call is seen.
  const inside = new AsyncLocalStorage<true>();
  const begin = async <R>(fn: (tx: Tx) => Promise<R>, config?: C): Promise<R> => {
    const deadline = Date.now() + waitMs;
    let resets = 0;
    for (let attempt = 0; ; attempt++) {
      let begun = false;
      try {
        return await original((tx) => {
          begun = true;
          return inside.run(true, () => fn(tx));
        }, config);
      } catch (err) {
        if (!BUSY.has(sqliteCode(err) ?? '') || Date.now() > deadline) throw err;
        if (begun) {
          if (resets++ >= MAX_RESETS) throw err;
          await reset();
        } else await pause(Math.min(5 * 2 ** attempt, 200));
      }
    }
  };
  return (fn, config) => {
    if (inside.getStore()) return Promise.reject(new NestedTransaction());
    const run = tail.then(() => begin(fn, config));
    tail = run.catch(() => undefined);
    return run;
  };
}
