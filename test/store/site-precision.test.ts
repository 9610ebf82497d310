/**
 * Each site's stored precision model: validated on write (field, value, rule; nothing written on a
 * refusal), editable through the API and the CLI, and the one the season planner uses for every
 * epoch at the site (σ = zenith σ × X^0.6 when the night's seeing is the reference; Roddier 1981,
 * from memory, as server/science/plan/precision.ts states it).
 *
 * Demo scenario (server/store/demo/scenario.ts, invented): site 1 Tolvane Ridge, site 2 Ostrel Summit.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nowIso } from '../../server/clock.ts';
import { main } from '../../server/cli/main.ts';
import { createApp } from '../../server/http/app.ts';
import { DEFAULT_PRECISION, SEEING_AIRMASS_EXPONENT } from '../../server/science/plan/index.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { DEMO_DAYS, demoAnchor } from '../../server/store/demo/scenario.ts';
import { tableCounts } from './backends.ts';

const demo = demoAnchor(nowIso());
const near = (n: number) => demo.day(DEMO_DAYS.periapsis + n);

describe('stored precision model per site', () => {
  // A file database, so the CLI (its own connection through --database) sees the same rows.
  const dir = mkdtempSync(join(tmpdir(), 'epochwright-precision-'));
  const url = `file:${join(dir, 'test.db')}`;
  const env = {} as { store: Store };
  let call: (method: string, path: string, body?: unknown) => Response | Promise<Response>;
  beforeAll(async () => {
    env.store = createStore(await openDatabase({ url }));
    await env.store.loadDemo(LOCAL_OPERATOR, {});
    const { secret } = await env.store.users.createWithToken(LOCAL_OPERATOR, {
      name: 'precision lead',
      role: 'lead',
    });
    const app = createApp({ store: env.store });
    call = (method, path, body) =>
      app.request(path, {
        method,
        headers: { authorization: `Bearer ${secret}`, 'content-type': 'application/json' },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
      });
  });
  afterAll(() => {
    env.store.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('refuses a bad value naming the field, value and rule, and writes nothing', async () => {
    const before = await tableCounts(env.store);
    const row = await env.store.sites.get(1);
    for (const [field, value] of [
      ['astrometrySigmaMas', -0.5],
      ['spectroscopySigmaKmS', 0],
      ['referenceSeeingArcsec', 12],
    ] as const) {
      const res = await call('PATCH', '/api/sites/1', { [field]: value });
      expect(res.status).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
      const text = await res.text();
      expect(text).toContain(field);
    }
    expect(await env.store.sites.get(1)).toEqual(row);
    expect(await tableCounts(env.store)).toEqual(before);
  });

  it('stores a model through the API and the season plan uses it at each epoch’s airmass', async () => {
    const res = await call('PATCH', '/api/sites/1', {
      astrometrySigmaMas: 0.25,
      spectroscopySigmaKmS: null,
      referenceSeeingArcsec: null,
    });
    expect(res.status, await res.clone().text()).toBe(200);
    expect(await res.json()).toMatchObject({
      astrometrySigmaMas: 0.25,
      spectroscopySigmaKmS: null,
    });
    const plan = await call('POST', '/api/campaigns/1/season-plan', {
      startDate: near(-4),
      endDate: near(4),
      nights: 'all', // every night of the range, so both sites have some
      at: `${demo.today}T00:00:00Z`,
    });
    expect(plan.status, await plan.clone().text()).toBe(200);
    const epochs = ((await plan.json()) as { plan: { epochs: PlanEpoch[] } }).plan.epochs;
    const at = (site: string, kind: string) =>
      epochs.filter((e) => e.site === site && e.kind === kind);
    const tolvane = at('Tolvane Ridge', 'astrometry');
    const ostrel = at('Ostrel Summit', 'spectroscopy');
    expect(tolvane.length).toBeGreaterThan(0);
    expect(ostrel.length).toBeGreaterThan(0);
    for (const e of tolvane) {
      // constructed case: the stored zenith value × X^0.6 (the seeing ratio is 1 with no reference seeing)
      expect(e.precision.sigma).toBeCloseTo(
        0.25 * e.precision.airmass ** SEEING_AIRMASS_EXPONENT,
        9,
      );
      expect(e.precision.unit).toBe('mas');
    }
    for (const e of at('Tolvane Ridge', 'spectroscopy'))
      expect(e.precision.sigma).toBeCloseTo(
        DEFAULT_PRECISION.spectroscopyKmS * e.precision.airmass ** SEEING_AIRMASS_EXPONENT,
        9,
      ); // a field set back to null takes the default (constructed case)
    for (const e of ostrel)
      expect(e.precision.sigma).toBeCloseTo(4 * e.precision.airmass ** SEEING_AIRMASS_EXPONENT, 9); // the demo's stored 4 km/s (invented)
  });

  it('the CLI shows each model with its defaults, and changes one (a bad value: exit 2, nothing written)', async () => {
    const run = async (args: string[]) => {
      const out: string[] = [];
      const err: string[] = [];
      const [o, e] = [process.stdout.write, process.stderr.write];
      process.stdout.write = ((s: string) => out.push(String(s)) > 0) as typeof o;
      process.stderr.write = ((s: string) => err.push(String(s)) > 0) as typeof e;
      try {
        const code = await main(['site-precision', '--database', url, ...args]);
        return { code, stdout: out.join(''), stderr: err.join('') };
      } finally {
        process.stdout.write = o;
        process.stderr.write = e;
      }
    };
    const shown = await run([]);
    expect(shown.code).toBe(0);
    expect(shown.stdout).toMatch(/Ostrel Summit\s+1\.5\s+4\s+0\.9/); // the demo's stored values (invented)
    expect(shown.stdout).toContain(`${DEFAULT_PRECISION.spectroscopyKmS} (default)`); // site 1's RV σ was set back to null above
    const bad = await run(['--site-id', '2', '--astrometry-mas=-1']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/astrometrySigmaMas.*-1/);
    expect((await env.store.sites.get(2)).astrometrySigmaMas).toBe(1.5);
    const changed = await run(['--site-id', '2', '--spectroscopy-km-s', 'default', '--json']);
    expect(changed.code).toBe(0);
    expect(JSON.parse(changed.stdout).sites[0].spectroscopySigmaKmS).toBeNull();
    expect((await env.store.sites.get(2)).spectroscopySigmaKmS).toBeNull();
  });
});

interface PlanEpoch {
  site: string;
  kind: string;
  precision: { sigma: number; unit: string; airmass: number };
}
