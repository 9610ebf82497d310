/**
 * `BENCH health-under-load`: the 99th percentile of `GET /api/health`, due every 5 ms and
 * counted from when it was due, while two sampled fits (a few seconds each) run on the job pool's
 * two threads.
 * Baseline, in this process: the same two fits and health requests with the fits on the server's
 * own thread (what every request did before the pool). The line also gives health's p99 with no
 * job running, measured between the two, and the load average: on a shared machine most of what
 * is left is the wait for a core (the server's thread is idle over 90 % of the time while the fits
 * run). The orbit is an invented demo value.
 */
import { availableParallelism, loadavg } from 'node:os';
import { createApp } from '../../server/http/app.ts';
import { createJobPool } from '../../server/jobs/pool.ts';
import { inProcess, type Runner } from '../../server/jobs/tasks.ts';
import { TARN_MEASUREMENTS } from '../jobs/tarn.ts';
import { isMain } from './timing.ts';

const HEAVY = JSON.stringify({
  stars: [
    { name: 'Tarn', measurements: TARN_MEASUREMENTS, hints: { periodYears: { min: 8, max: 12 } } },
  ],
  posterior: { seed: 3, rounds: 300 },
});

/** Health latencies (ms) while two heavy fits run through `run`. */
async function healthWhileBusy(run: Runner): Promise<number[]> {
  const app = createApp({ run });
  let busy = 2;
  // The fits arrive a few milliseconds after health is first asked, as requests from two clients
  // would (on the server's thread a fit then holds every health request behind it).
  const fits = [0, 1].map(
    (k) =>
      new Promise<void>((resolve, reject) =>
        setTimeout(
          () => {
            Promise.resolve(
              app.request('/api/fit', {
                method: 'POST',
                headers: { 'content-type': 'application/json' },
                body: HEAVY,
              }),
            )
              .then(async (res) => {
                if (res.status !== 200)
                  throw new Error(`fit answered ${res.status}: ${await res.text()}`);
                busy--;
              })
              .then(resolve, reject);
          },
          5 * (k + 1),
        ),
      ),
  );
  // Health is due every 5 ms; each latency counts from when it was due, not from when it could be
  // sent, so time the server spends blocked counts against it.
  const latencies: number[] = [];
  const start = performance.now();
  let i = 0;
  do {
    const due = start + 5 * i++;
    const wait = due - performance.now();
    await new Promise((next) => (wait > 0 ? setTimeout(next, wait) : setImmediate(next)));
    const res = await app.request('/api/health');
    await res.text();
    latencies.push(performance.now() - due);
  } while (busy > 0);
  await Promise.all(fits);
  return latencies;
}

/**
 * Health latencies (ms) with no job running, the same schedule for `count` requests: what the
 * machine itself gives the server's thread at this moment (other programs' load), for comparison.
 */
async function healthIdle(count: number): Promise<number[]> {
  const app = createApp({ run: inProcess });
  const latencies: number[] = [];
  const start = performance.now();
  for (let i = 0; i < count; i++) {
    const due = start + 5 * i;
    const wait = due - performance.now();
    await new Promise((next) => (wait > 0 ? setTimeout(next, wait) : setImmediate(next)));
    await (await app.request('/api/health')).text();
    latencies.push(performance.now() - due);
  }
  return latencies;
}

const p99 = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil(0.99 * s.length) - 1)]!;
};

export async function run(): Promise<string[]> {
  const pool = createJobPool({ threads: 2, maxQueue: 8, timeLimitS: 300 });
  let pooled: number[];
  try {
    await healthWhileBusy(pool.run); // the threads start and load their modules
    pooled = await healthWhileBusy(pool.run);
  } finally {
    await pool.close();
  }
  const idle = await healthIdle(pooled.length);
  const here = await healthWhileBusy(inProcess);
  const ours = p99(pooled);
  const load = loadavg()[0]!.toFixed(1);
  return [
    `BENCH health-under-load p99=${ours.toFixed(1)} ms ratio=${(p99(here) / ours).toFixed(1)} vs fits-on-the-server-thread (${pooled.length} health requests during two fits; with no job running p99=${p99(idle).toFixed(1)} ms; load average ${load} on ${availableParallelism()} cores)`,
  ];
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
