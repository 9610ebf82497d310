/**
 * A 100,000-row measurements file in one HTTP request, through the real server (a socket, the
 * import's own body limit, the job pool parsing it, the staged writes): every row is stored, with
 * its values, and the import leaves one audit entry and nothing staged. While it runs, health is
 * answered (an ordering: health replies arrive before the import's, not a timing).
 * Slow but bounded: the import took 6 s on a quiet 2-core machine (npm run bench -- store) and 88 s
 * at load 16; the time limit below is for a crowded machine.
 * The file's values are invented.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ServerType } from '@hono/node-server';
import { serve } from '@hono/node-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_MAX_BODY_BYTES, createApp } from '../../server/http/app.ts';
import { createJobPool, type JobPool } from '../../server/jobs/pool.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';

const ROWS = 100_000;
const HEAD = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';
const velocity = (i: number) => (i % 600) - 300 + 0.25;
const line = (i: number) =>
  `Hollow Deep,Wicket,radial-velocity,JD ${2460000 + i * 0.001},${velocity(i)},${1 + (i % 7)},hollow spectrograph`;

let dir: string;
let store: Store;
let pool: JobPool;
let server: ServerType;
let base: string;
let secret: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-100k-'));
  store = createStore(await openDatabase({ url: `file:${join(dir, 'big.db')}` }));
  const system = await store.systems.create(LOCAL_OPERATOR, {
    name: 'Hollow Deep',
    raDeg: 10,
    decDeg: -20,
  });
  await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Wicket' });
  secret = (
    await store.users.createWithToken(LOCAL_OPERATOR, { name: 'bulk observer', role: 'observer' })
  ).secret;
  pool = createJobPool({ threads: 1, timeLimitS: 600 });
  const app = createApp({ store, run: pool.run });
  await new Promise<void>((done) => {
    server = serve({ fetch: app.fetch, port: 0, hostname: '127.0.0.1' }, (info) => {
      base = `http://127.0.0.1:${info.port}`;
      done();
    });
  });
});
afterAll(async () => {
  await new Promise<void>((done) => server.close(() => done()));
  await pool.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('a 100,000-row measurements file', () => {
  it('is taken in one request, every row stored, with health answered meanwhile', async () => {
    const file = [HEAD, ...Array.from({ length: ROWS }, (_, i) => line(i))].join('\n');
    // Larger than any other request may be: the import's own limit lets it in.
    expect(Buffer.byteLength(file)).toBeGreaterThan(DEFAULT_MAX_BODY_BYTES);
    let importDone = false;
    const importing = fetch(`${base}/api/imports/measurements`, {
      method: 'POST',
      headers: { authorization: `Bearer ${secret}`, 'content-type': 'text/csv' },
      body: file,
    }).then(async (res) => {
      const report = await res.json();
      importDone = true;
      return { status: res.status, report };
    });
    let healthBefore = 0;
    while (!importDone) {
      const res = await fetch(`${base}/api/health`);
      expect(res.status).toBe(200);
      await res.json();
      if (!importDone) healthBefore++;
      // Spaced out so the test does not itself load the machine; the count is what matters.
      await new Promise((next) => setTimeout(next, 25));
    }
    const { status, report } = await importing;
    expect(status).toBe(200);
    expect(report).toMatchObject({ rows: ROWS, written: ROWS, problems: [] });
    expect(healthBefore).toBeGreaterThanOrEqual(3);

    const { client } = databaseOf(store);
    const stored = await client.execute(
      'SELECT count(*) AS n, min(epoch_jd) AS first, max(epoch_jd) AS last, sum(radial_velocity_km_s) AS sum FROM measurements',
    );
    const expectedSum = Array.from({ length: ROWS }, (_, i) => velocity(i)).reduce((a, b) => a + b);
    expect(Number(stored.rows[0]!.n)).toBe(ROWS);
    expect(Number(stored.rows[0]!.first)).toBe(2460000);
    expect(Number(stored.rows[0]!.last)).toBeCloseTo(2460000 + (ROWS - 1) * 0.001, 6);
    // Sums of quarter values are exact in binary floating point.
    expect(Number(stored.rows[0]!.sum)).toBe(expectedSum);
    const last = await client.execute(
      'SELECT radial_velocity_km_s AS v, sigma_radial_velocity_km_s AS s, instrument FROM measurements ORDER BY id DESC LIMIT 1',
    );
    expect(last.rows[0]).toMatchObject({
      v: velocity(ROWS - 1),
      s: 1 + ((ROWS - 1) % 7),
      instrument: 'hollow spectrograph',
    });
    // One audit entry for the whole file, naming the user, the token and the way it came.
    const audit = await client.execute(
      "SELECT user_id, token_id, via, entity FROM audit_trail WHERE action = 'import'",
    );
    expect(audit.rows).toHaveLength(1);
    expect(audit.rows[0]).toMatchObject({ via: 'http', entity: 'measurements' });
    expect(audit.rows[0]!.user_id).not.toBeNull();
    expect(audit.rows[0]!.token_id).not.toBeNull();
    for (const table of ['measurement_staging', 'import_runs']) {
      const left = await client.execute(`SELECT count(*) AS n FROM ${table}`);
      expect(Number(left.rows[0]!.n)).toBe(0);
    }
  }, 600_000);
});
