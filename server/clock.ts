/**
 * The one clock of the server and the CLI. EPOCHWRIGHT_NOW (an ISO 8601 instant with its zone)
 * freezes it, so that a demo, a plan "as of" a date, or a test suite gives the same answer on any day.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import { parseEpoch, unixMsToJd } from './science/time/index.ts';

/** An instant set for one piece of work and everything it awaits (`asOf`). */
const scoped = new AsyncLocalStorage<number>();

/**
 * Run `work` with the clock at `ms` (Unix ms): the demo is written as of its own instant, so its
 * past nights are over and its measurements made, whatever the process's clock says.
 */
export function asOf<R>(ms: number, work: () => Promise<R>): Promise<R> {
  return scoped.run(ms, work);
}

const FROZEN = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

/**
 * Milliseconds since 1970-01-01T00:00Z: the instant set by `asOf`, else the frozen one when
 * EPOCHWRIGHT_NOW is set, else the system clock.
 */
export function nowMs(env: NodeJS.ProcessEnv = process.env): number {
  const set = scoped.getStore();
  if (set !== undefined) return set;
  const frozen = env.EPOCHWRIGHT_NOW;
  if (frozen === undefined || frozen === '') return Date.now();
  const ms = FROZEN.test(frozen) ? Date.parse(frozen) : Number.NaN;
  if (Number.isNaN(ms)) {
    throw new Error(
      `EPOCHWRIGHT_NOW: ${JSON.stringify(frozen)} must be an ISO 8601 instant with its zone, e.g. 2026-12-01T12:00:00Z`,
    );
  }
  return ms;
}

/** The clock as an ISO 8601 UTC string. */
export function nowIso(env: NodeJS.ProcessEnv = process.env): string {
  return new Date(nowMs(env)).toISOString();
}

/** The clock as a Julian Date. */
export function nowJd(env: NodeJS.ProcessEnv = process.env): number {
  return unixMsToJd(nowMs(env));
}

/** A moment a user may give (`at`: any epoch form) as JD, or the clock's when none is given. */
export function momentJd(value: unknown, field: string): number {
  return value === undefined ? nowJd() : parseEpoch(value, field);
}
