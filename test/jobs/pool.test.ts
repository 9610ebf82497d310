/**
 * The job pool: heavy work on worker threads gives the same answers as on the server's thread,
 * leaves the event loop free (health answered while a fit runs), stops a job at its time limit
 * (503 naming the limit; the thread is replaced and the next job runs) and refuses jobs beyond
 * the queue (503 with Retry-After). Orbits and sites here are invented demo values.
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { createJobPool, type JobPool } from '../../server/jobs/pool.ts';
import { TARN_MEASUREMENTS, TARN_TRUTH } from './tarn.ts';

const truth = TARN_TRUTH;
const measurements = TARN_MEASUREMENTS;
const fitBody = (posterior?: { seed: number; rounds: number }) => ({
  stars: [{ name: 'Tarn', measurements, hints: { periodYears: { min: 8, max: 12 } } }],
  ...(posterior ? { posterior } : {}),
});
/** A sampled fit long enough to outlast a health check many times over (~3 s here). */
const LONG = fitBody({ seed: 3, rounds: 300 });
/** A sampled fit far past the one-second limits below (~10 s, when nothing stops it). */
const TOO_LONG = fitBody({ seed: 3, rounds: 1000 });
const site = {
  name: 'Loma Serena',
  latitudeDeg: -24.6,
  longitudeDeg: -70.4,
  elevationM: 2600,
  timeZone: 'America/Santiago',
};
const nightBody = {
  site,
  date: '2027-06-15',
  targets: [
    { name: 'Tern-3', raDeg: 271.3, decDeg: -25.1 },
    { name: 'Kite B', raDeg: 200, decDeg: -60 },
  ],
};

type App = ReturnType<typeof createApp>;
const post = (app: App, path: string, body: unknown) =>
  app.request(`/api${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });

describe('the job pool', () => {
  let pool: JobPool;
  let pooled: App;
  const here = createApp();
  beforeAll(() => {
    pool = createJobPool({ threads: 2, maxQueue: 4, timeLimitS: 120 });
    pooled = createApp({ run: pool.run });
  });
  afterAll(() => pool.close());

  it('gives the same answers on a worker thread as on this one', async () => {
    for (const [path, body] of [
      ['/fit', fitBody()],
      ['/sky/night', nightBody],
      ['/sky/season', { site, targets: nightBody.targets, year: 2027 }],
      ['/ephemeris', { orbit: truth, epochs: ['J2027.5', 'J2030.0'] }],
      ['/events', { orbit: truth, start: '2020-01-01', end: '2040-01-01' }],
    ] as const) {
      const a = await post(here, path, body);
      const b = await post(pooled, path, body);
      expect([path, b.status]).toEqual([path, 200]);
      expect(await b.json()).toEqual(await a.json()); // structured clone there and back changes nothing
    }
  });

  it.runIf(existsSync('/proc/self/task'))(
    'runs its threads at a lower priority than the server’s (EPOCHWRIGHT_WORKER_NICENESS, default 5)',
    async () => {
      await post(pooled, '/ephemeris', { orbit: truth, epochs: ['J2027.5'] }); // the threads are up
      // Field 19 of /proc/<pid>/task/<tid>/stat is the nice value (proc(5), from memory); the
      // command name in parentheses comes first and may hold spaces, so count after its ')'.
      const niceOf = (tid: string) => {
        const stat = readFileSync(`/proc/self/task/${tid}/stat`, 'utf8');
        return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
      };
      const nice = readdirSync('/proc/self/task').map(niceOf);
      expect(niceOf(String(process.pid))).toBe(0); // this thread: as started
      expect(nice.filter((n) => n === 5).length).toBeGreaterThanOrEqual(2); // the pool's two threads
    },
  );

  it('carries a bad value’s 422 back from the worker, naming the field', async () => {
    const res = await post(pooled, '/ephemeris', {
      orbit: { ...truth, elements: { ...truth.elements, eccentricity: 1.5 } },
      epochs: ['J2027.5'],
    });
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { details: { field: string } } };
    expect(body.error.details.field).toContain('eccentricity');
  });

  it('answers health before a long fit that was sent first', async () => {
    const order: string[] = [];
    const fit = Promise.resolve(post(pooled, '/fit', LONG)).then((res) =>
      order.push(`fit ${res.status}`),
    );
    // Let the fit reach its worker, then ask for health.
    await new Promise((done) => setImmediate(done));
    const health = Promise.resolve(pooled.request('/api/health')).then((res) =>
      order.push(`health ${res.status}`),
    );
    await Promise.all([fit, health]);
    expect(order).toEqual(['health 200', 'fit 200']); // the event loop stayed free
  });
});

describe('the job pool at its limits', () => {
  it('stops a job at its time limit with a 503 naming the limit, then runs the next job', async () => {
    const pool = createJobPool({ threads: 1, maxQueue: 4, timeLimitS: 1 });
    try {
      const app = createApp({ run: pool.run });
      const res = await post(app, '/fit', TOO_LONG);
      expect(res.status).toBe(503);
      const body = (await res.json()) as {
        error: { code: string; message: string; details: { timeLimitS: number } };
      };
      expect(body.error.code).toBe('time_limit');
      expect(body.error.details.timeLimitS).toBe(1);
      expect(body.error.message).toContain('time limit of 1 s');
      // The stopped thread is replaced: a small job afterwards succeeds.
      expect((await post(app, '/ephemeris', { orbit: truth, epochs: ['J2027.5'] })).status).toBe(
        200,
      );
    } finally {
      await pool.close();
    }
  });

  it('refuses a job beyond the queue with 503 and Retry-After', async () => {
    const pool = createJobPool({ threads: 1, maxQueue: 1, timeLimitS: 1, retryAfterS: 7 });
    try {
      const app = createApp({ run: pool.run });
      // One running, one waiting: the third finds the queue full.
      const first = post(app, '/fit', TOO_LONG);
      const second = post(app, '/fit', TOO_LONG);
      await new Promise((done) => setTimeout(done, 0));
      const third = await post(app, '/fit', TOO_LONG);
      expect(third.status).toBe(503);
      expect(third.headers.get('retry-after')).toBe('7');
      const body = (await third.json()) as { error: { code: string } };
      expect(body.error.code).toBe('busy');
      await Promise.all([first, second]); // both end at their time limit
    } finally {
      await pool.close();
    }
  });
});
