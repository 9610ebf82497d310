/**
 * Store benchmarks, both against baselines run in this process on the same data:
 * - a checked CSV import of 20,000 measurement rows (parsed and checked outside the write loop,
 *   then batched inserts and one audit entry, in one transaction) against plain drizzle inserts of
 *   the same rows in one transaction;
 * - a page of 50 blocks through the HTTP API (auth, validation, JSON) against the repository call.
 */
import { measurements } from '../../db/schema.ts';
import { createApp } from '../../server/http/app.ts';
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

export async function run(): Promise<string[]> {
  // The size the import must take at ≥ 20,000 rows/s: 20,000 rows.
  const n = 20_000;
  const csv = [
    'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument',
    ...Array.from(
      { length: n },
      (_, i) =>
        `Bench Deep,Bramble,radial-velocity,JD ${2461000 + i * 0.01},${i % 300},5,bench spectrograph`,
    ),
  ].join('\n');
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
      epochJd: 2461000 + i * 0.01,
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
