/**
 * `BENCH stall-*`: the longest the server's thread is held (the most it ran between two ticks of a
 * 1 ms interval; beside it the largest wall-clock gap and perf_hooks' event-loop delay maximum,
 * which count the waits for a core too) while one big request runs
 * with its job on the pool, each over 100,000 stored measurements of one target:
 * - `stall-fit` a stored target fit (preview) whose request the worker refuses at once (an unknown
 *   fixed parameter), so what is timed is the server's side: gathering the rows and handing them on;
 * - `stall-export`, `stall-export-json` the measurements export of that target, as CSV and JSON;
 * - `stall-import` a 100,000-row measurements file imported over HTTP into a second target;
 * - `stall-idle` the same watch over three idle seconds: what waiting for a core alone gives.
 * Run once each (a stall is a maximum, not an average); the load average is on the line, since on a
 * shared machine a thread that waits for a core shows as a stall too. Values are invented.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { createApp } from '../../server/http/app.ts';
import { createJobPool } from '../../server/jobs/pool.ts';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { isMain } from './timing.ts';

const ROWS = 100_000;

/**
 * Time this thread has run, ms (Linux: the first field of its schedstat, in ns, brought up to date
 * at each scheduler tick), or NaN elsewhere. Unlike the wall clock it leaves out the waits for a
 * core, which on a crowded machine are longer than the holds looked for.
 */
const SCHEDSTAT = `/proc/${process.pid}/task/${process.pid}/schedstat`;
function threadRunMs(): number {
  try {
    return Number(readFileSync(SCHEDSTAT, 'utf8').split(' ')[0]) / 1e6;
  } catch {
    return Number.NaN;
  }
}

interface Stall {
  /** The most this thread ran between two ticks of a 1 ms interval: the longest hold of its loop. */
  holdMs: number;
  /** The longest wall-clock gap between two ticks (holds and waits for a core alike). */
  gapMs: number;
  /** perf_hooks' event-loop delay maximum (wall clock, as gapMs). */
  delayMs: number;
}

/** The longest stall of this thread while `work` runs. */
async function longestStall<T>(work: () => Promise<T>): Promise<Stall & { value: T }> {
  const delay = monitorEventLoopDelay({ resolution: 1 });
  let last = performance.now();
  let lastRun = threadRunMs();
  let gapMs = 0;
  let holdMs = 0;
  const tick = setInterval(() => {
    const now = performance.now();
    const ran = threadRunMs();
    gapMs = Math.max(gapMs, now - last);
    holdMs = Math.max(holdMs, ran - lastRun);
    last = now;
    lastRun = ran;
  }, 1);
  delay.enable();
  try {
    const value = await work();
    return { holdMs, gapMs, delayMs: delay.max / 1e6, value };
  } finally {
    delay.disable();
    clearInterval(tick);
  }
}

export async function run(): Promise<string[]> {
  const dir = mkdtempSync(join(tmpdir(), 'epochwright-stall-'));
  const store = createStore(await openDatabase({ url: `file:${join(dir, 'stall.db')}` }));
  const pool = createJobPool({ threads: 2, timeLimitS: 600 });
  try {
    const system = await store.systems.create(LOCAL_OPERATOR, {
      name: 'Sallow Reach',
      raDeg: 40,
      decDeg: 10,
    });
    const held = await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Quill' });
    await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Ember' });
    const { secret } = await store.users.createWithToken(LOCAL_OPERATOR, {
      name: 'bench lead',
      role: 'lead',
    });
    const auth = { authorization: `Bearer ${secret}` };
    const { client } = databaseOf(store);
    const at = "'2026-01-01T00:00:00Z'";
    for (let i = 0; i < ROWS; i += 500) {
      const rows = Array.from({ length: 500 }, (_, k) => {
        const n = i + k;
        const jd = 2460000.5 + ((n * 7919) % ROWS) * 0.01;
        return `(${held.id},'offsets','JD ${jd}',${jd},${(n % 900) - 450},${(n % 700) - 350},1,1,'bench camera',${at},${at})`;
      });
      await client.execute(
        `INSERT INTO measurements (target_id,kind,epoch,epoch_jd,d_ra_mas,d_dec_mas,sigma_d_ra_mas,sigma_d_dec_mas,instrument,created_at,updated_at) VALUES ${rows.join(',')}`,
      );
    }
    const app = createApp({ store, run: pool.run });
    // Warm the workers (their first job loads the modules).
    await app.request(`/api/exports/measurements?targetId=${held.id}&kind=separation`, {
      headers: auth,
    });
    const lines: string[] = [];
    const load = () => `load=${loadavg()[0]!.toFixed(1)}`;
    const line = (name: string, s: Stall) =>
      `BENCH ${name} ${s.holdMs.toFixed(0)} ms held (longest gap ${s.gapMs.toFixed(0)} ms, ` +
      `event-loop delay max ${s.delayMs.toFixed(0)} ms) ${load()}`;

    // The same watch over a few idle seconds: what waiting for a core alone gives at this load.
    const idle = await longestStall(() => new Promise((r) => setTimeout(r, 3000)));
    lines.push(line('stall-idle', idle));

    const fit = await longestStall(async () => {
      const res = await app.request(`/api/targets/${held.id}/fit`, {
        method: 'POST',
        headers: { ...auth, 'content-type': 'application/json' },
        body: JSON.stringify({ fixed: { noSuchParameter: 1 } }),
      });
      return `${res.status} ${(await res.text()).slice(0, 120)}`;
    });
    lines.push(`${line('stall-fit', fit)} answer ${fit.value}`);

    const exported = await longestStall(async () => {
      const res = await app.request(`/api/exports/measurements?targetId=${held.id}`, {
        headers: auth,
      });
      return `${res.status} ${(await res.arrayBuffer()).byteLength} bytes`;
    });
    lines.push(`${line('stall-export', exported)} answer ${exported.value}`);

    const json = await longestStall(async () => {
      const res = await app.request(`/api/exports/measurements?targetId=${held.id}&format=json`, {
        headers: auth,
      });
      return `${res.status} ${(await res.arrayBuffer()).byteLength} bytes`;
    });
    lines.push(`${line('stall-export-json', json)} answer ${json.value}`);

    const head = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';
    const file = [
      head,
      ...Array.from(
        { length: ROWS },
        (_, i) =>
          `Sallow Reach,Ember,radial-velocity,JD ${2460000 + i * 0.001},${(i % 600) - 300},2,bench spectrograph`,
      ),
    ].join('\n');
    const imported = await longestStall(async () => {
      const res = await app.request('/api/imports/measurements', {
        method: 'POST',
        headers: { ...auth, 'content-type': 'text/csv' },
        body: file,
      });
      return `${res.status} ${(await res.text()).slice(0, 120)}`;
    });
    lines.push(`${line('stall-import', imported)} answer ${imported.value}`);
    return lines;
  } finally {
    await pool.close();
    store.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

if (isMain(import.meta.url)) for (const l of await run()) console.log(l);
