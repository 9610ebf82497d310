/**
 * Re-plan after a lost night on the demo campaign (invented log with lost nights,
 * server/store/demo/): the preview names the lost blocks and plans the rest of the season from the
 * night after (or the moment of planning); accepting stores exactly what the preview showed and keeps
 * every obtained block; a night without lost time or a stale digest is refused and writes nothing.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { tableCounts } from '../store/backends.ts';
import { cli } from '../cli/run-cli.ts';

let dir: string;
let url: string;
let store: Store;
let lead: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-replan-'));
  url = `file:${join(dir, 'replan.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  lead = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'l', role: 'lead' })).secret;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const post = (path: string, body: unknown) =>
  createApp({ store }).request(`/api${path}`, {
    method: 'POST',
    headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });

async function reportedNights() {
  const reports = (await store.nightReports.list({}, { limit: 500, offset: 0 })).items;
  const lost = reports.find((r) => r.timeLostHours > 0)!;
  const clear = reports.find((r) => r.timeLostHours === 0)!;
  return { lost: lost.nightId, clear: clear.nightId };
}

const obtained = async () =>
  (await store.blocks.list({}, { limit: 500, offset: 0 })).items
    .filter((b) => b.status === 'obtained')
    .map((b) => b.id)
    .sort((a, b) => a - b);

interface Replan {
  night: { id: number; timeLostHours: number };
  lost: { status: string }[];
  request: { startDate: string; weather: string };
  preview: { digest: string; plan: { epochs: unknown[] }; replaces: number[] };
  written?: unknown[];
}

describe('re-plan after a lost night (demo campaign)', () => {
  it('previews the rest of the season, then stores exactly that, keeping what was obtained', async () => {
    const { lost } = await reportedNights();
    const res = await post(`/nights/${lost}/replan`, {});
    expect(res.status, await res.clone().text()).toBe(200);
    const p = (await res.json()) as Replan;
    expect(p.night.timeLostHours).toBeGreaterThan(0); // the demo's lost night (invented)
    expect(p.request.weather).toBe('aware');
    expect(p.preview.plan.epochs.length).toBeGreaterThan(0);
    const kept = await obtained();
    expect(kept.length).toBeGreaterThan(0);
    const acc = await post(`/nights/${lost}/replan/accept`, { digest: p.preview.digest });
    expect(acc.status, await acc.clone().text()).toBe(201);
    const a = (await acc.json()) as Replan;
    expect(a.written).toHaveLength(p.preview.plan.epochs.length);
    expect(await obtained()).toEqual(kept);
  });

  it('refuses a night without lost time and a stale digest, and writes nothing', async () => {
    const { lost, clear } = await reportedNights();
    const before = await tableCounts(store);
    const none = await post(`/nights/${clear}/replan`, {});
    expect(none.status).toBe(422);
    expect(await none.text()).toMatch(/nightId.*no time lost/);
    const stale = await post(`/nights/${lost}/replan/accept`, { digest: 'not-the-digest' });
    expect(stale.status).toBe(409);
    expect((await post('/nights/99999/replan', {})).status).toBe(404);
    expect((await post(`/nights/${lost}/replan`, { weather: 'foggy' })).status).toBe(422); // an unknown choice breaks a rule (README "HTTP API")
    expect(await tableCounts(store)).toEqual(before);
  });

  it('works from the CLI: preview, then --accept', async () => {
    const { lost } = await reportedNights();
    const r = await cli(['replan', '--night-id', String(lost), '--database', url]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/lost .* h/);
    expect(r.stdout).toMatch(/preview only/);
    const bad = await cli(['replan', '--night-id', 'x', '--database', url]);
    expect(bad.code).toBe(2);
  });
});
