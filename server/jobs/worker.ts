/**
 * A worker thread of the job pool: runs one named task of `tasks.ts` and sends back its result, or
 * its error as plain data (class instances do not survive structured cloning).
 */
import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';
import type { MessagePort } from 'node:worker_threads';
import { takeOver } from './hand-over.ts';
import { TASKS, errorToData, type ErrorData, type TaskName } from './tasks.ts';

/**
 * Niceness of a worker thread (EPOCHWRIGHT_WORKER_NICENESS, 0–19, default 5; 0 leaves it as the
 * server's): heavy jobs yield the cores to the server's thread, so health and reads are answered
 * while they run. Higher values answer health faster on a crowded machine but slow the jobs when
 * other programs keep the cores busy (measured with test/bench/jobs.bench.ts, README).
 */
export function workerNiceness(env: NodeJS.ProcessEnv = process.env): number {
  const v = env.EPOCHWRIGHT_WORKER_NICENESS;
  const n = v === undefined || v === '' ? 5 : Number(v);
  return Number.isInteger(n) && n >= 0 && n <= 19 ? n : 5;
}

/**
 * Lower this thread's scheduling priority. On Linux a thread has its own nice value, set through
 * its thread id, which /proc/thread-self names (`<pid>/task/<tid>`); elsewhere (or when refused)
 * the thread keeps the process's priority.
 */
function yieldCores(): void {
  try {
    const nice = workerNiceness();
    const tid = Number(readlinkSync('/proc/thread-self').split('/').pop());
    if (nice > 0 && Number.isInteger(tid) && tid > 0 && tid !== process.pid) setPriority(tid, nice);
  } catch {
    // Not Linux, or not allowed: the same priority as the server's thread.
  }
}
yieldCores();

export interface TaskMessage {
  name: TaskName;
  args: unknown[];
  /** Told once the task starts here (the pool's time limit counts from then). */
  started?: MessagePort;
}
export type TaskReply = { ok: true; value: unknown } | { ok: false; error: ErrorData };

export default function runTask({ name, args, started }: TaskMessage): TaskReply {
  started?.postMessage('started');
  started?.close();
  try {
    return { ok: true, value: (TASKS[name] as (...a: unknown[]) => unknown)(...takeOver(args)) };
  } catch (err) {
    return { ok: false, error: errorToData(err) };
  }
}
