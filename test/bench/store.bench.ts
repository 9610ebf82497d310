/**
 * Store benchmarks, both against baselines run in this process on the same data:
 * - a checked CSV import of 20,000 measurement rows (parsed and checked outside the write loop,
 *   then batched inserts and one audit entry, in one transaction) against plain drizzle inserts of
 *   the same rows in one transaction;
 * - one request importing 100,000 rows through the HTTP API (parsing on the job pool, staged
 *   writes on the server's thread) against the store's import of the same file in this process;
 * - a page of 50 blocks through the HTTP API (auth, validation, JSON) against the repository call.
 */
import { measurements } from '../../db/schema.ts';
import { createApp } from '../../server/http/app.ts';
import { createJobPool } from '../../server/jobs/pool.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';
import { benchLine, isMain } from './timing.ts';
import { databaseOf } from '../../server/store/testing.ts';

async function freshStore(): Promise<{ store: Store; targetId: number }> {
  const store = createStore(await openDatabase({ url: ':memory:' }));
  const system = await store.systems.create(LOCAL_OPERATOR, {
    name: 'Bench Deep',
    raDeg: 1,
    decDeg: 1,
  });
  const target = await store.targets.create(LOCAL_OPERATOR, {
    systemId: system.id,
    name: 'Bramble',
  });
  return { store, targetId: target.id };
}

async function seconds(f: () => Promise<unknown>): Promise<number> {
  const t0 = process.hrtime.bigint();
  await f();
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

const measurementFile = (n: number) =>
  [
    'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument',
    ...Array.from(
      { length: n },
      (_, i) =>
        `Bench Deep,Bramble,radial-velocity,JD ${2461000 + i * 0.001},${i % 300},5,bench spectrograph`,
    ),
  ].join('\n');

/** One 100,000-row file in one HTTP request (the pool parses it) vs the store's import here. */
async function import100k(): Promise<string> {
  const n = 100_000;
  const csv = measurementFile(n);
  const pool = createJobPool({ threads: 1 });
  const a = await freshStore();
  const { secret } = await a.store.users.createWithToken(LOCAL_OPERATOR, {
    name: 'bench observer',
    role: 'observer',
  });
  const app = createApp({ store: a.store, run: pool.run });
  const http = await seconds(async () => {
    const res = await app.request('/api/imports/measurements', {
      method: 'POST',
      headers: { authorization: `Bearer ${secret}`, 'content-type': 'text/csv' },
      body: csv,
    });
    const report = (await res.json()) as { written?: number };
    if (res.status !== 200 || report.written !== n)
      throw new Error(`import answered ${res.status}: ${JSON.stringify(report).slice(0, 300)}`);
  });
  a.store.close();
  await pool.close();
  const b = await freshStore();
  const direct = await seconds(() => b.store.importCsv(LOCAL_OPERATOR, 'measurements', csv));
  b.store.close();
  return benchLine(
    'store-import-100k-http',
    n / http,
    'rows/s',
    direct / http,
    'in-process-import',
  );
}

export async function run(): Promise<string[]> {
  // The size the import must take at ≥ 20,000 rows/s: 20,000 rows.
  const n = 20_000;
  const csv = measurementFile(n);
  let ours = Infinity;
  let base = Infinity;
  for (let r = 0; r < 2; r++) {
    const a = await freshStore();
    ours = Math.min(
      ours,
      await seconds(() => a.store.importCsv(LOCAL_OPERATOR, 'measurements', csv)),
    );
    a.store.close();
    const b = await freshStore();
    const now = new Date().toISOString();
    const rows = Array.from({ length: n }, (_, i) => ({
      targetId: b.targetId,
      kind: 'radial-velocity' as const,
      epoch: now,
      epochJd: 2461000 + i * 0.001,
      radialVelocityKmS: i % 300,
      sigmaRadialVelocityKmS: 5,
      instrument: 'bench spectrograph',
      createdAt: now,
      updatedAt: now,
    }));
    base = Math.min(
      base,
      await seconds(() =>
        databaseOf(b.store).db.transaction(async (tx) => {
          for (let i = 0; i < rows.length; i += 500)
            await tx.insert(measurements).values(rows.slice(i, i + 500));
        }),
      ),
    );
    b.store.close();
  }
  const lines = [
    benchLine('store-import-measurements', n / ours, 'rows/s', base / ours, 'plain-drizzle-insert'),
  ];

  lines.push(await import100k());

  const { store, firstLead } = await startStore({
    url: ':memory:',
    demo: true,
  });
  const app = createApp({ store });
  const headers = { authorization: `Bearer ${firstLead!.secret}` };
  const reps = 200;
  let http = Infinity;
  let direct = Infinity;
  for (let r = 0; r < 3; r++) {
    http = Math.min(
      http,
      await seconds(async () => {
        for (let i = 0; i < reps; i++)
          await (await app.request('/api/blocks?limit=50', { headers })).json();
      }),
    );
    direct = Math.min(
      direct,
      await seconds(async () => {
        for (let i = 0; i < reps; i++) await store.blocks.list({}, { limit: 50 });
      }),
    );
  }
  lines.push(
    benchLine(
      'store-http-list-blocks',
      (http / reps) * 1e6,
      'us',
      direct / http,
      'repository-call',
    ),
  );
  store.close();
  return lines;
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
