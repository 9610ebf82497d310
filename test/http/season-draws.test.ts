/**
 * Weather-aware season plans and their draws on the demo campaign (invented log with lost nights
 * and invented priors, server/store/demo/): the preview states each site's clear chance and the
 * night reports it rests on; the draws endpoint answers percentiles, seeded and repeatable, also
 * through a worker thread; the CLI prints them; bad settings are refused naming the field.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { createJobPool, type JobPool } from '../../server/jobs/pool.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { DEMO_DAYS, demoAnchor } from '../../server/store/demo/scenario.ts';
import { nowIso } from '../../server/clock.ts';
import { tableCounts } from '../store/backends.ts';
import { cli } from '../cli/run-cli.ts';

const demo = demoAnchor(nowIso());
const AT = `${demo.today}T00:00:00Z`;
const RANGE = {
  startDate: demo.day(DEMO_DAYS.periapsis - 40),
  endDate: demo.day(DEMO_DAYS.periapsis + 40),
};

let dir: string;
let url: string;
let store: Store;
let token: string;
let pool: JobPool;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-draws-'));
  url = `file:${join(dir, 'draws.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  token = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'v', role: 'viewer' })).secret;
  pool = createJobPool({ threads: 1, maxQueue: 4, timeLimitS: 120 });
});
afterAll(async () => {
  await pool.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const post = (app: ReturnType<typeof createApp>, path: string, body: unknown) =>
  app.request(`/api${path}`, {
    method: 'POST',
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });

interface Draws {
  weather: string;
  sites: { name: string; clearChance: { mean: number | null; nightsLogged: number } }[];
  draws: {
    draws: number;
    targets: {
      target: string;
      periapsisSigmaDays: { percentiles: { p: number; value: number }[] } | null;
      coverage: { distribution: { mean: number } } | null;
      windowCovered: number | null;
    }[];
  };
}

describe('weather-aware season plans and draws (demo campaign)', () => {
  it('previews a weather-aware plan with each site’s clear chance from its log', async () => {
    const app = createApp({ store });
    const res = await post(app, '/campaigns/1/season-plan', { ...RANGE, at: AT, weather: 'aware' });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as Draws;
    expect(body.weather).toBe('aware');
    for (const s of body.sites) {
      expect(s.clearChance.mean).toBeGreaterThan(0); // the demo's priors (invented) and log
      expect(s.clearChance.mean).toBeLessThan(1);
    }
    expect(
      body.sites.find((s) => s.name === 'Tolvane Ridge')!.clearChance.nightsLogged,
    ).toBeGreaterThan(5);
    // The headline star's passage: the nights that cover its date are critical (each takes ≥ 5
    // points of coverage) and lie at the lossy site in its wet months; the plan says which and why
    // each has or has not a backup.
    const ilex = (
      body as unknown as {
        plan: {
          targets: {
            target: string;
            backups: { critical: number; backedUp: number; words: string } | null;
          }[];
        };
      }
    ).plan.targets.find((t) => t.target === 'Ilex')!;
    console.log(`Ilex against the weather: ${ilex.backups?.words}`);
    expect(ilex.backups!.critical).toBeGreaterThan(0);
    expect(ilex.backups!.words).toMatch(/critical epochs? on nights likely lost, \d+ backed up/);
    if (ilex.backups!.backedUp < ilex.backups!.critical)
      expect(ilex.backups!.words).toMatch(/no backup for Tolvane Ridge \S+ \(/);
  });

  it('draws the season: seeded, the same through a worker thread, percentiles in order', async () => {
    const here = createApp({ store });
    const pooled = createApp({ store, run: pool.run });
    const body = { ...RANGE, at: AT, weather: 'aware', draws: 200, seed: 5 };
    const a = await post(here, '/campaigns/1/season-plan/draws', body);
    expect(a.status, await a.clone().text()).toBe(200);
    const b = await post(pooled, '/campaigns/1/season-plan/draws', body);
    const da = (await a.json()) as Draws;
    expect(await b.json()).toEqual(da); // constructed case: same seed, same draws, on any thread
    expect(da.draws.draws).toBe(200);
    // Only the headline star's orbit has the relativistic terms on (the demo's scenario): the
    // others have no factor to draw.
    const factorsOf = (name: string) =>
      (
        da.draws.targets.find((t) => t.target === name) as unknown as {
          factors: { sigma: unknown }[];
        }
      ).factors.map((f) => f.sigma !== null);
    expect(factorsOf('Ilex')).toEqual([true, true]);
    for (const other of ['Morrow', 'Quill', 'Sorrel'])
      expect(factorsOf(other)).toEqual([false, false]);
    const withPassage = da.draws.targets.filter((t) => t.periapsisSigmaDays);
    expect(withPassage.length).toBeGreaterThan(0);
    for (const t of withPassage) {
      const v = t.periapsisSigmaDays!.percentiles.map((q) => q.value);
      expect([...v].sort((x, y) => x - y)).toEqual(v);
      expect(t.coverage!.distribution.mean).toBeGreaterThanOrEqual(0);
      expect(t.windowCovered).toBeLessThanOrEqual(1);
    }
  });

  it('refuses bad settings naming the field, and writes nothing', async () => {
    const app = createApp({ store });
    const before = await tableCounts(store);
    const bad = async (extra: object, field: string) => {
      const res = await post(app, '/campaigns/1/season-plan/draws', {
        ...RANGE,
        at: AT,
        draws: 10,
        seed: 1,
        ...extra,
      });
      expect([400, 422]).toContain(res.status);
      expect(await res.text()).toContain(field);
    };
    await bad({ draws: 0 }, 'draws');
    await bad({ weather: 'cloudy' }, 'weather');
    await bad({ precisionScatter: 5 }, 'precisionScatter');
    await bad({ backupLossAbove: 0 }, 'backupLossAbove');
    expect(await tableCounts(store)).toEqual(before);
  });

  it('prints percentiles in the CLI', async () => {
    const r = await cli([
      'plan-season',
      '--campaign-id',
      '1',
      '--start',
      RANGE.startDate,
      '--end',
      RANGE.endDate,
      '--at',
      AT,
      '--weather',
      'aware',
      '--draws',
      '100',
      '--seed',
      '2',
      '--database',
      url,
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^100 seasons drawn \(seed 2\) of the weather-aware plan/);
    expect(r.stdout).toMatch(/p5 +p16 +p50 +p84 +p95/);
    expect(r.stdout).toMatch(/σ of the \d{4}-\d{2}-\d{2} periapsis date/);
    const bad = await cli([
      'plan-season',
      '--campaign-id',
      '1',
      '--start',
      RANGE.startDate,
      '--end',
      RANGE.endDate,
      '--draws',
      '5',
      '--accept',
      '--database',
      url,
    ]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--draws');
  });
});
