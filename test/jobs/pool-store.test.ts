/**
 * The stored views that compute run on the job pool too: a night's visibility, a campaign's flags,
 * a target’s ephemeris as CSV, its relativity forecast and the measurements export. Each gives the answer it gives on this
 * thread, and health is answered while it runs: once each heavy request's job is handed on, health
 * is asked one request after another, and several replies must arrive before the heavy one (an
 * ordering, not a timing; on this thread none can). The demo's data are invented.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { createJobPool, type JobPool } from '../../server/jobs/pool.ts';
import type { Runner } from '../../server/jobs/tasks.ts';
import { inProcess } from '../../server/jobs/tasks.ts';
import type { Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { campaignFlags } from '../../server/store/views/planning.ts';

let dir: string;
let store: Store;
let token: string;
let pool: JobPool;
let paths: string[];
/** The moment of the n-th flags request: a new moment each time, so none is answered from memory. */
let flagsMoment = 0;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-pool-store-'));
  const started = await startStore({ url: `file:${join(dir, 'pool.db')}`, demo: true });
  store = started.store;
  token = started.firstLead!.secret;
  pool = createJobPool({ threads: 2, maxQueue: 8, timeLimitS: 120 });
  const target = (await store.targets.list({})).items[0]!;
  const night = (await store.nights.list({ campaignId: 1 })).items[0]!;
  // 20,000 more measurements of one target, so that the export is large (values invented).
  const { client } = databaseOf(store);
  for (let i = 0; i < 20_000; i += 500) {
    const rows = Array.from({ length: 500 }, (_, k) => {
      const jd = 2460000.5 + (i + k) * 0.01;
      return `(${target.id},'radial-velocity','JD ${jd}',${jd},${(i + k) % 300},5,'load spectrograph','2026-01-01T00:00:00Z','2026-01-01T00:00:00Z')`;
    });
    await client.execute(
      `INSERT INTO measurements (target_id,kind,epoch,epoch_jd,radial_velocity_km_s,sigma_radial_velocity_km_s,instrument,created_at,updated_at) VALUES ${rows.join(',')}`,
    );
  }
  const heavyNight = await crowdedNight(client, night.siteId);
  paths = [
    `/api/nights/${heavyNight}/visibility?curves=true`,
    '/api/campaigns/1/flags?at=', // completed with a fresh moment per request
    `/api/targets/${target.id}/ephemeris?start=2027-01-01T00:00:00Z&end=2029-01-01T00:00:00Z&step=PT6H&format=csv`,
    '/api/exports/measurements',
    // The relativity forecast: a Fisher matrix over the 20,000 measurements and the planned blocks.
    `/api/targets/${target.id}/forecast?at=2027-01-01T00:00:00Z`,
  ];
});
/**
 * A night whose campaign follows 150 stars in 30 systems spread over the sky (invented), so that
 * its report keeps a warm worker busy for long enough to count health replies against: the demo's
 * own night takes a warm worker ~40 ms, too short to order against on a busy machine.
 */
async function crowdedNight(
  client: ReturnType<typeof databaseOf>['client'],
  siteId: number,
): Promise<number> {
  const at = "'2026-01-01T00:00:00Z','2026-01-01T00:00:00Z'";
  const systems = Array.from(
    { length: 30 },
    (_, i) => `('crowd ${i}',${(i * 12.3) % 360},${-60 + ((i * 7.7) % 90)},${at})`,
  );
  await client.execute(
    `INSERT INTO systems (name,ra_deg,dec_deg,created_at,updated_at) VALUES ${systems.join(',')}`,
  );
  await client.execute(
    `INSERT INTO targets (system_id,name,created_at,updated_at)
     SELECT s.id, 'star ' || k.n, ${at} FROM systems s,
       (SELECT 1 n UNION SELECT 2 UNION SELECT 3 UNION SELECT 4 UNION SELECT 5) k
     WHERE s.name LIKE 'crowd %'`,
  );
  const campaign = await client.execute(
    `INSERT INTO campaigns (name,start_date,end_date,goals,limits,created_at,updated_at)
     VALUES ('crowd','2035-01-01','2035-12-31','{}','{}',${at}) RETURNING id`,
  );
  const campaignId = Number(campaign.rows[0]!.id);
  await client.execute(
    `INSERT INTO campaign_targets (campaign_id,target_id)
     SELECT ${campaignId}, t.id FROM targets t JOIN systems s ON s.id = t.system_id WHERE s.name LIKE 'crowd %'`,
  );
  await client.execute(
    `INSERT INTO campaign_sites (campaign_id,site_id) VALUES (${campaignId},${siteId})`,
  );
  const night = await client.execute(
    `INSERT INTO nights (site_id,campaign_id,date,created_at,updated_at)
     VALUES (${siteId},${campaignId},'2035-06-15',${at}) RETURNING id`,
  );
  return Number(night.rows[0]!.id);
}

afterAll(async () => {
  await pool.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const pathOf = (p: string) =>
  p.endsWith('at=') ? `${p}${encodeURIComponent(`JD ${2461400.5 + flagsMoment++}`)}` : p;

/** A runner that says when a job has been handed on (to a worker, or run here). */
function watched(run: Runner): { run: Runner; handed: Promise<void> } {
  let resolve: () => void = () => {};
  const handed = new Promise<void>((r) => {
    resolve = r;
  });
  return {
    run: ((name, ...args) => {
      const job = run(name, ...args);
      resolve();
      return job;
    }) as Runner,
    handed,
  };
}

/**
 * Send the heavy request, and once its job is handed on, ask for health again and again, one
 * request after the other, until the heavy reply is in: how many health replies came before it.
 */
async function healthRepliesMeanwhile(run: Runner, path: string): Promise<number> {
  const w = watched(run);
  const app = createApp({ store, run: w.run });
  let done = false;
  const heavy = Promise.resolve(
    app.request(path, { headers: { authorization: `Bearer ${token}` } }),
  )
    .then(async (res) => [res.status, await res.text()] as const)
    .finally(() => {
      done = true;
    });
  await w.handed;
  let replies = 0;
  while (!done) {
    // Let other events in between, as requests from a socket would (app.request alone is all
    // microtasks, which would starve the worker's reply).
    await new Promise((next) => setImmediate(next));
    const res = await app.request('/api/health');
    expect(res.status).toBe(200);
    if (!done) replies++;
  }
  const [status, text] = await heavy;
  expect([path, status], text.slice(0, 300)).toEqual([path, 200]);
  return replies;
}

// Generous: each heavy view runs several times, on a 2-core machine other work shares.
describe('stored views on the job pool', { timeout: 300_000 }, () => {
  it('answer as they do on this thread', async () => {
    const headers = { authorization: `Bearer ${token}` };
    const here = createApp({ store });
    const pooled = createApp({ store, run: pool.run });
    // Flags through the store's view itself: the route's answer would come from memory the second time.
    const moment = { nowJd: 2461375.5 };
    const { db } = databaseOf(store);
    const pooledFlags = await campaignFlags(db, 1, moment, pool.run);
    expect(pooledFlags.flags.length).toBeGreaterThan(0);
    expect(pooledFlags).toEqual(await campaignFlags(db, 1, moment));
    // The calendar feed (flags, darkness, passages and text on the pool) as well; its answer is
    // too quick on the demo to order health replies against, so it is compared only.
    const calendar = '/api/campaigns/1/calendar.ics?at=2027-01-01T00:00:00Z';
    for (const path of [...paths.filter((p) => !p.endsWith('at=')), calendar]) {
      const a = await here.request(path, { headers });
      const b = await pooled.request(path, { headers });
      expect([path, b.status]).toEqual([path, 200]);
      expect(await b.text()).toBe(await a.text());
    }
  });

  it('leave health free: several health replies arrive before theirs', async () => {
    for (const p of paths) {
      const path = pathOf(p);
      const replies = await healthRepliesMeanwhile(pool.run, path);
      expect([path, replies >= 3]).toEqual([path, true]);
    }
  });

  it('hold health up when they run on this thread (so the check above can fail)', async () => {
    expect(await healthRepliesMeanwhile(inProcess, pathOf(paths[1]!))).toBeLessThan(3);
  });
});
