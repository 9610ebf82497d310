/**
 * The job pool: heavy computations on worker threads (piscina), so the server's event loop keeps
 * answering health and light reads while fits and plans run. Each job has a time limit; a job that
 * hits it is aborted, and piscina terminates the thread running it (a fresh one takes its place).
 * Jobs beyond the queue are refused at once. Both refusals are `JobRefused` with the HTTP
 * status 503 they deserve.
 */
import { availableParallelism } from 'node:os';
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { handOver } from './hand-over.ts';
import { errorFromData, type Runner, type TaskName } from './tasks.ts';
import type { TaskMessage, TaskReply } from './worker.ts';

export interface PoolOptions {
  /** Worker threads (default: the machine's cores, at least 1, at most 4). */
  threads?: number;
  /** Jobs waiting for a thread before new ones are refused (default 8). */
  maxQueue?: number;
  /** Longest a job may run, seconds (default 120). */
  timeLimitS?: number;
  /** Seconds a refused client is asked to wait (Retry-After; default 5). */
  retryAfterS?: number;
}

/** A job refused (queue full) or stopped (time limit): answered as 503. */
export class JobRefused extends Error {
  override readonly name = 'JobRefused';
  constructor(
    readonly code: 'busy' | 'time_limit',
    message: string,
    readonly details: Record<string, unknown>,
    readonly retryAfterS?: number,
  ) {
    super(message);
  }
}

export interface JobPool {
  run: Runner;
  close(): Promise<void>;
  readonly options: Required<PoolOptions>;
}

/** The pool's settings from the environment (EPOCHWRIGHT_WORKERS, _JOB_QUEUE, _JOB_TIME_LIMIT_S). */
export function poolOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): PoolOptions {
  const num = (name: string): number | undefined => {
    const v = env[name];
    if (v === undefined || v === '') return undefined;
    const x = Number(v);
    if (!Number.isFinite(x) || x <= 0)
      throw new Error(`${name}: ${JSON.stringify(v)} must be a positive number`);
    return x;
  };
  const threads = num('EPOCHWRIGHT_WORKERS');
  const maxQueue = num('EPOCHWRIGHT_JOB_QUEUE');
  const timeLimitS = num('EPOCHWRIGHT_JOB_TIME_LIMIT_S');
  return {
    ...(threads === undefined ? {} : { threads: Math.round(threads) }),
    ...(maxQueue === undefined ? {} : { maxQueue: Math.round(maxQueue) }),
    ...(timeLimitS === undefined ? {} : { timeLimitS }),
  };
}

const WORKER = new URL('./worker.ts', import.meta.url).href;

export function createJobPool(options: PoolOptions = {}): JobPool {
  const o: Required<PoolOptions> = {
    threads: options.threads ?? Math.min(4, Math.max(1, availableParallelism())),
    maxQueue: options.maxQueue ?? 8,
    timeLimitS: options.timeLimitS ?? 120,
    retryAfterS: options.retryAfterS ?? 5,
  };
  const piscina = new Piscina<TaskMessage, TaskReply>({
    filename: WORKER,
    // Workers run the TypeScript sources through tsx, as the server does.
    execArgv: ['--import', 'tsx'],
    minThreads: o.threads,
    maxThreads: o.threads,
    maxQueue: o.maxQueue,
  });
  const run = (async (name: TaskName, ...args: unknown[]) => {
    if (piscina.queueSize >= o.maxQueue) throw busy(o);
    const handed = await handOver(args);
    const abort = new AbortController();
    // The limit counts from when a thread takes the job up (the worker says so on this port), not
    // while it waits in the queue or a replacement thread starts.
    const { port1, port2 } = new MessageChannel();
    let timer: NodeJS.Timeout | undefined;
    port1.once('message', () => {
      timer = setTimeout(() => abort.abort(), o.timeLimitS * 1000);
    });
    let reply: TaskReply;
    try {
      reply = await piscina.run(
        { name, args: handed.args, started: port2 },
        { signal: abort.signal, transferList: [port2, ...handed.transferList] },
      );
    } catch (err) {
      if (abort.signal.aborted)
        throw new JobRefused(
          'time_limit',
          `the computation (${name}) ran past the time limit of ${o.timeLimitS} s and was ` +
            `stopped; ask for less (fewer measurements, rounds, targets or nights)`,
          { task: name, timeLimitS: o.timeLimitS },
        );
      if (err instanceof Error && /queue is at limit/i.test(err.message)) throw busy(o);
      throw err;
    } finally {
      clearTimeout(timer);
      port1.close();
    }
    if (!reply.ok) throw errorFromData(reply.error);
    return reply.value;
  }) as Runner;
  return {
    run,
    options: o,
    close: () => piscina.destroy(),
  };
}

function busy(o: Required<PoolOptions>): JobRefused {
  return new JobRefused(
    'busy',
    `the server is busy with ${o.threads} computation(s) and ${o.maxQueue} waiting; try again in ${o.retryAfterS} s`,
    { threads: o.threads, maxQueue: o.maxQueue },
    o.retryAfterS,
  );
}
