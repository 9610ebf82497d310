/**
 * `BENCH flags-cached`: the median time of `GET /api/campaigns/1/flags` on the demo when nothing
 * has changed (the answer kept by the store, server/store/views/flags-cache.ts), through the whole
 * HTTP app (token, validation, JSON). Baseline, in this process on the same campaign: computing
 * the flags afresh (`campaignFlags`, what every request did before the cache).
 */
import { createApp } from '../../server/http/app.ts';
import { startStore } from '../../server/store/startup.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { campaignFlags } from '../../server/store/views/planning.ts';
import { nowJd } from '../../server/clock.ts';
import { benchLine, isMain } from './timing.ts';

async function seconds(f: () => Promise<unknown>): Promise<number> {
  const t0 = process.hrtime.bigint();
  await f();
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

export async function run(): Promise<string[]> {
  const { store, firstLead } = await startStore({ url: ':memory:', demo: true });
  const app = createApp({ store });
  const headers = { authorization: `Bearer ${firstLead!.secret}` };
  const { db } = databaseOf(store);
  const get = async () => {
    const res = await app.request('/api/campaigns/1/flags', { headers });
    if (res.status !== 200) throw new Error(`flags answered ${res.status}: ${await res.text()}`);
    await res.json();
  };
  await get(); // the first request of the minute computes; the rest are what a dashboard sees
  const cached: number[] = [];
  const fresh: number[] = [];
  for (let r = 0; r < 30; r++) {
    cached.push(await seconds(get));
    fresh.push(await seconds(() => campaignFlags(db, 1, { nowJd: nowJd() })));
  }
  store.close();
  const c = median(cached);
  return [benchLine('flags-cached', c * 1e3, 'ms', median(fresh) / c, 'flags-computed-afresh')];
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
