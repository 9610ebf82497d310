/**
 * A worker thread of the job pool: runs one named task of `tasks.ts` and sends back its result, or
 * its error as plain data (class instances do not survive structured cloning).
 */
import type { MessagePort } from 'node:worker_threads';
import { TASKS, errorToData, type ErrorData, type TaskName } from './tasks.ts';

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
    return { ok: true, value: (TASKS[name] as (...a: unknown[]) => unknown)(...args) };
  } catch (err) {
    return { ok: false, error: errorToData(err) };
  }
}
