/**
 * The semester time request on the demo campaign (invented log and priors, server/store/demo/):
 * the API's hours per site are the blocks of the semester's season plan plus the stated allowance;
 * the CLI's CSV rows add up to the same; a bad semester is refused naming the field.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { DEMO_DAYS, demoAnchor } from '../../server/store/demo/scenario.ts';
import { nowIso } from '../../server/clock.ts';
import { cli } from '../cli/run-cli.ts';

const demo = demoAnchor(nowIso());
const AT = `${demo.today}T00:00:00Z`;
const SEMESTER = {
  name: 'D1',
  startDate: demo.day(DEMO_DAYS.periapsis - 60),
  endDate: demo.day(DEMO_DAYS.periapsis + 60),
};
let dir: string;
let url: string;
let store: Store;
let token: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-request-'));
  url = `file:${join(dir, 'request.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  token = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'v', role: 'viewer' })).secret;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const post = (body: unknown) =>
  createApp({ store }).request('/api/campaigns/1/time-request', {
    method: 'POST',
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });

interface Answer {
  sites: { site: string; hours: number; allowanceHours: number; requestHours: number }[];
  totals: { hours: number; requestHours: number; allowanceHours: number };
  targets: { reason: string }[];
  markdown: string;
}

describe('the semester time request (demo campaign)', () => {
  it('asks for the plan’s blocks plus the allowance, per site and in total, and says why', async () => {
    const res = await post({ ...SEMESTER, at: AT });
    expect(res.status, await res.clone().text()).toBe(200);
    const r = (await res.json()) as Answer;
    const plan = await store.plans.previewSeason(
      1,
      { startDate: SEMESTER.startDate, endDate: SEMESTER.endDate, weather: 'aware' },
      Date.parse(AT) / 864e5 + 2440587.5,
    );
    for (const s of r.sites) {
      const blocks = plan.plan.epochs
        .filter((e) => e.site === s.site)
        .reduce((h, e) => h + e.block.minutes / 60, 0);
      expect(s.hours).toBeCloseTo(blocks, 9); // the season plan's own blocks (constructed by the planner)
      expect(s.requestHours).toBeCloseTo(s.hours + s.allowanceHours, 9);
      expect(s.allowanceHours).toBeGreaterThan(0); // the demo's priors (invented) make every night uncertain
    }
    expect(r.totals.requestHours).toBeCloseTo(r.totals.hours + r.totals.allowanceHours, 9);
    expect(r.markdown).toContain('# Time request, semester D1');
    expect(r.targets.some((t) => /periapsis on \d{4}-\d{2}-\d{2}/.test(t.reason))).toBe(true);
    // With and without are the same linear forecast with and without the blocks: more data never
    // widens a Fisher σ (constructed by the forecast), and the answer says how it was reckoned.
    const answer = r as unknown as {
      method: string;
      targets: {
        periapsisSigmaDays: { with: number | null; without: number | null };
        factors: { with: number | null; without: number | null }[];
      }[];
    };
    expect(answer.method).toMatch(/Fisher/);
    for (const t of answer.targets) {
      const pairs = [t.periapsisSigmaDays, ...t.factors];
      for (const x of pairs)
        if (x.with !== null && x.without !== null)
          expect(x.with).toBeLessThanOrEqual(x.without * (1 + 1e-9));
    }
    expect(answer.targets.some((t) => t.factors.some((f) => f.with !== null))).toBe(true);
  });

  it('gives CSV rows that add up to the same, and refuses a bad semester naming the field', {
    timeout: 120_000,
  }, async () => {
    const args = [
      'time-request',
      '--campaign-id',
      '1',
      '--name',
      'D1',
      '--start',
      SEMESTER.startDate,
      '--end',
      SEMESTER.endDate,
      '--at',
      AT,
      '--database',
      url,
    ];
    const csv = await cli([...args, '--csv']);
    expect(csv.code, csv.stderr).toBe(0);
    const rows = parse(csv.stdout, { columns: true }) as Record<string, string>[];
    const json = (await (await post({ ...SEMESTER, at: AT })).json()) as Answer;
    for (const s of json.sites) {
      const mine = rows.filter((r) => r.site === s.site && r.target !== '(site total)');
      expect(mine.reduce((h, r) => h + Number(r.request_h), 0)).toBeCloseTo(s.requestHours, 2);
    }
    const bad = await post({ ...SEMESTER, name: ' ' });
    expect(bad.status).toBe(422);
    expect(await bad.text()).toContain('name');
  });
});
