/**
 * The detection forecast of the demo's deepest star (its headline star, invented; periapsis months
 * after the clock in the demo scenario) through the API and the CLI: the same numbers from the same store function, and
 * errors that name the field. The forecast's numbers are checked against refits in
 * test/science/plan/forecast.test.ts.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../server/cli/main.ts';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import type { TargetForecast } from '../../server/store/views/forecast.ts';
import { nowIso } from '../../server/clock.ts';
import { HEADLINE } from '../../server/store/demo/scenario.ts';

const AT = `${nowIso().slice(0, 10)}T00:00:00Z`;

let store: Store;
let dir: string;
let token: string;
let deepest: number;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-forecast-'));
  store = createStore(await openDatabase({ url: `file:${join(dir, 'f.db')}` }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  token = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'viewer', role: 'viewer' }))
    .secret;
  deepest = (await store.targets.list({})).items.find((t) => t.name === HEADLINE)!.id;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

async function cli(args: string[]): Promise<{ code: number; out: string }> {
  const out: string[] = [];
  const write = process.stdout.write.bind(process.stdout);
  process.stdout.write = ((s: string) => {
    out.push(s);
    return true;
  }) as typeof process.stdout.write;
  try {
    const code = await main([...args, '--database', `file:${join(dir, 'f.db')}`]);
    return { code, out: out.join('') };
  } finally {
    process.stdout.write = write;
  }
}

describe('GET /api/targets/{id}/forecast', () => {
  it("forecasts the deepest star's redshift and precession from its planned blocks", async () => {
    const app = createApp({ store });
    const res = await app.request(`/api/targets/${deepest}/forecast?at=${AT}`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as TargetForecast;
    expect(body.plannedEpochs).toBeGreaterThan(0);
    expect(body.factors.map((f) => f.name)).toEqual(['redshiftFactor', 'precessionFactor']);
    for (const f of body.factors) {
      if (f.sigmaNow !== null) expect(f.sigmaAfter!).toBeLessThanOrEqual(f.sigmaNow);
      expect(f.topEpochs.length).toBeGreaterThan(0);
    }
    expect(body.summary[0]).toMatch(/^redshift /);
    console.log(body.summary.join('\n'));

    const { code, out } = await cli(['forecast', '--target-id', String(deepest), '--at', AT]);
    expect(code).toBe(0);
    expect(out).toContain(body.summary[0]!);
    expect(out).toMatch(/redshiftFactor\s/);
  });

  it('names the field of a bad request and needs a token', async () => {
    const app = createApp({ store });
    const auth = { headers: { authorization: `Bearer ${token}` } };
    const bad = await app.request(`/api/targets/${deepest}/forecast?astrometryMas=-1`, auth);
    expect(bad.status).toBe(400);
    expect(await bad.text()).toMatch(/astrometryMas/);
    expect((await app.request(`/api/targets/9999/forecast`, auth)).status).toBe(404);
    expect((await app.request(`/api/targets/${deepest}/forecast`)).status).toBe(401);
    const { code } = await cli(['forecast', '--target-id', 'x']);
    expect(code).toBe(2);
  });
});
