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
import {
  DEMO_DAYS,
  HEADLINE,
  SITES,
  demoAnchor,
  vesperSystem,
} from '../../server/store/demo/scenario.ts';
import { SEEING_AIRMASS_EXPONENT } from '../../server/science/plan/index.ts';
import { parseEpoch } from '../../server/science/time/index.ts';
import * as Astronomy from 'astronomy-engine';

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
    expect(bad.status).toBe(422); // a negative σ breaks a range: README "HTTP API" (422)
    expect(await bad.text()).toMatch(/astrometryMas/);
    expect((await app.request(`/api/targets/9999/forecast`, auth)).status).toBe(404);
    expect((await app.request(`/api/targets/${deepest}/forecast`)).status).toBe(401);
    const { code } = await cli(['forecast', '--target-id', 'x']);
    expect(code).toBe(2);
  });
});

describe('the precision a planned block is counted at', () => {
  it("is the season planner's: its site's stored model at the block's airmass", async () => {
    const f = await store.plans.forecast(deepest, { atJd: parseEpoch(AT) });
    expect(f.precision.epochs.length).toBeGreaterThan(0);
    const anchor = demoAnchor(nowIso());
    const vesper = vesperSystem(anchor);
    let worst = 0;
    for (const e of f.precision.epochs) {
      const site = SITES.find((s) => s.name === e.site)!;
      const zenith = e.unit === 'mas' ? site.astrometrySigmaMas : site.spectroscopySigmaKmS;
      // The demo's stored zenith σ (invented) × X^0.6 (Roddier 1981, from memory; no night seeing, so the ratio is 1).
      expect(e.sigma).toBeCloseTo(zenith * e.airmass ** SEEING_AIRMASS_EXPONENT, 9);
      // The airmass against astronomy-engine's refracted altitude of the primary at the block's
      // middle, by Kasten & Young, Applied Optics 28, 4735 (1989): X = 1/(sin h + 0.50572 (h + 6.07995°)^−1.6364).
      const t = Astronomy.MakeTime(new Date(e.epoch));
      const obs = new Astronomy.Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
      const h = Astronomy.Horizon(t, obs, vesper.raDeg / 15, vesper.decDeg, 'normal').altitude;
      const x = 1 / (Math.sin((h * Math.PI) / 180) + 0.50572 * (h + 6.07995) ** -1.6364);
      worst = Math.max(worst, Math.abs(x - e.airmass));
    }
    console.log(
      `forecast epochs: worst airmass difference ${worst.toFixed(4)}; ${f.precision.text}`,
    );
    // 0.03: the nearest 10-minute edge of the planners' grid (≤ 5 min away), J2000 vs of-date place, refraction at the site's pressure.
    expect(worst).toBeLessThan(0.03);
    const planned = (await store.blocks.list({}, { limit: 500 })).items.filter(
      (b) => b.targetId === deepest && b.status === 'planned' && b.startUtc >= AT,
    );
    expect(f.precision.epochs.length + f.precision.notCounted.length).toBe(planned.length);
  });
});

describe('the forecast in the flags', () => {
  it('flags the coming epochs the forecast depends on, the same ones the forecast names', async () => {
    const f = await store.plans.forecast(deepest, { atJd: parseEpoch(AT) });
    const { flags } = await store.plans.flags(1, { nowJd: parseEpoch(AT) });
    const flag = flags.find((x) => x.kind === 'relativity-epoch' && x.target === HEADLINE)!;
    expect(flag).toBeDefined();
    const critical = new Set([
      ...f.factors.flatMap((x) => x.topEpochs.filter((t) => t.share >= 0.1).map((t) => t.epoch)),
      ...f.factors.flatMap((x) =>
        x.reaches.filter((r) => !r.already && r.epoch).map((r) => r.epoch!),
      ),
    ]);
    expect(flag.relativity!.epochs.map((e) => e.epoch).sort()).toEqual([...critical].sort());
    expect(flag.relativity!.summary).toEqual(f.summary);
  });
});

describe('the forecast as a season-plan goal', () => {
  it('is asked for by relativityGoal (a boolean, named when wrong)', async () => {
    const app = createApp({ store });
    const lead = (
      await store.users.createWithToken(LOCAL_OPERATOR, { name: 'goal lead', role: 'lead' })
    ).secret;
    const post = (body: unknown) =>
      app.request('/api/campaigns/1/season-plan', {
        method: 'POST',
        headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' },
        body: JSON.stringify(body),
      });
    const anchor = demoAnchor(nowIso());
    const range = {
      startDate: anchor.day(DEMO_DAYS.periapsis - 20),
      endDate: anchor.day(DEMO_DAYS.periapsis + 20),
      at: AT,
    };
    const bad = await post({ ...range, relativityGoal: 'yes' });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toMatch(/relativityGoal/);
    type Preview = {
      plan: {
        epochs: unknown[];
        targets: { target: string; relativity: TargetForecast | null }[];
      };
    };
    const good = await post({ ...range, relativityGoal: true });
    expect(good.status, await good.clone().text()).toBe(200);
    const goal = (await good.json()) as Preview;
    expect(goal.plan.epochs.length).toBeGreaterThan(0);
    const plain = (await (await post({ ...range, relativityGoal: false })).json()) as Preview;
    // Each plan reports the forecast after its own epochs (its sum is checked against the forecast's
    // own in test/science/plan/season-relativity.test.ts, where the goal's effect is measured too).
    const star = (p: Preview) => p.plan.targets.find((t) => t.target === HEADLINE)!.relativity!;
    console.log(
      `deepest star's σ after the plan (redshift, precession): ${star(plain).factors.map((f) => f.sigmaAfter)} without the goal, ${star(goal).factors.map((f) => f.sigmaAfter)} with it`,
    );
    for (const p of [plain, goal]) {
      expect(star(p).factors.map((f) => f.name)).toEqual(['redshiftFactor', 'precessionFactor']);
      expect(star(p).summary[0]).toMatch(/^redshift /);
    }
    expect(star(goal).factors).not.toEqual(star(plain).factors);
  });
});
