/**
 * The client's follow-ups, end to end in chromium against the real server with the demo campaign:
 * the Moon's altitude curve on the night chart (checked against astronomy-engine and against the
 * drawn path), the forms that add systems, sites and campaigns (field messages from the server,
 * nothing stored on failure), a site's horizon mask drawn on the night chart, and the sky calls
 * carrying each system's position epoch and each site's horizon mask. Records this file adds are
 * deleted again at its end; invented names sort after the demo's so no other view's default moves.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { Body, Equator, Horizon, MakeTime, Observer } from 'astronomy-engine';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { DETAIL_BOX, nightLayout } from '../../client/src/plots/night-layout.ts';
import { HEADLINE, SCREENSHOTS, launchBrowser, nearPeriapsis, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
let browser: Browser;
let ctx: BrowserContext;

interface Site {
  id: number;
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
  horizonMask: { azimuthDeg: number; altitudeDeg: number }[];
}
interface Vis {
  site: { name: string };
  sun: { set: { utc: string } | null; rise: { utc: string } | null };
  moon: { illuminatedFraction: number; curve: { utc: string[]; altitudeDeg: number[] } | null };
  limits: { altitudeLimitDeg: number; horizonMask: boolean };
  targets: {
    name: string;
    curve: { utc: string[]; altitudeDeg: number[]; horizonMaskDeg?: number[] } | null;
  }[];
}

async function api<T>(path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(`${base}/api${path}`, {
    method: init.method ?? 'GET',
    headers: {
      authorization: `Bearer ${lead}`,
      ...(init.body ? { 'content-type': 'application/json' } : {}),
    },
    ...(init.body ? { body: JSON.stringify(init.body) } : {}),
  });
  if (!res.ok)
    throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`);
  return (res.status === 204 ? undefined : await res.json()) as T;
}

/** A signed-in page that records console errors (refused writes this file makes on purpose aside). */
async function open(
  path: string,
  before?: (page: Page) => void,
): Promise<{ page: Page; errors: string[] }> {
  const page = await ctx.newPage();
  before?.(page);
  const errors: string[] = [];
  page.on(
    'console',
    (m) => m.type() === 'error' && !/status of (400|422)/.test(m.text()) && errors.push(m.text()),
  );
  page.on('pageerror', (e) => errors.push(e.message));
  await page.goto(`${base}${path}?token=${lead}`);
  return { page, errors };
}
const shot = (page: Page, name: string) =>
  page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: true });

/** The Moon lane's height scale (client/src/plots/night-layout.ts: 0–90° over the lane's height). */
const LAYOUT = nightLayout([0, 1], 1, false);
const moonAltOfY = (y: number) => ((LAYOUT.moon.y + LAYOUT.moon.h - y) * 90) / LAYOUT.moon.h;
/** The altitude detail's scale (client/src/plots/night-layout.ts DETAIL_BOX: 0–90° upwards). */
const altOfY = (y: number) => ((DETAIL_BOX.top + DETAIL_BOX.plotH - y) * 90) / DETAIL_BOX.plotH;
const pathYs = (d: string) => [...d.matchAll(/[ML]([-\d.]+),([-\d.]+)/g)].map((m) => Number(m[2]));

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
  ctx = await newContext(browser, { viewport: { width: 1280, height: 900 } });
});
afterAll(async () => {
  await ctx?.close();
  await browser?.close();
});

describe('the Moon on the night chart', () => {
  test("the stored night's Moon curve agrees with astronomy-engine within 1′, and the chart draws it at that altitude", async () => {
    const sites = (await api<{ items: Site[] }>('/sites?limit=500')).items;
    const nights = (
      await api<{ items: { id: number; siteId: number; date: string }[] }>('/nights?limit=500')
    ).items;
    // A demo night on which the Moon is up between sunset and sunrise (the chart's span).
    let found: { id: number; vis: Vis; site: Site } | null = null;
    for (const n of nights.slice(0, 30)) {
      const vis = await api<Vis>(`/nights/${n.id}/visibility?curves=true`);
      const c = vis.moon.curve!;
      const [t0, t1] = [Date.parse(vis.sun.set!.utc), Date.parse(vis.sun.rise!.utc)];
      if (
        c.utc.some((u, i) => Date.parse(u) > t0 && Date.parse(u) < t1 && c.altitudeDeg[i]! > 20)
      ) {
        found = { id: n.id, vis, site: sites.find((s) => s.id === n.siteId)! };
        break;
      }
    }
    expect(found).not.toBeNull();
    const { id, vis, site } = found!;
    const c = vis.moon.curve!;
    // Reference: astronomy-engine's topocentric Moon, centre, no refraction, at every fifth sample.
    const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
    const errs = c.utc
      .filter((_, i) => i % 5 === 0)
      .map((u) => {
        const t = MakeTime(new Date(u));
        const eq = Equator(Body.Moon, t, observer, true, true);
        return Math.abs(
          c.altitudeDeg[c.utc.indexOf(u)]! - Horizon(t, observer, eq.ra, eq.dec).altitude,
        );
      });
    console.log(
      `stored night ${id}: Moon altitude vs astronomy-engine, worst ${(Math.max(...errs) * 3600).toFixed(1)}″ over ${errs.length} instants`,
    );
    expect(Math.max(...errs)).toBeLessThan(1 / 60); // 1′: the brief's tolerance for a plotted curve

    const { page, errors } = await open(`/nights/${id}`);
    const path = page.locator('svg.night-chart .moon-lane .moon-up path').first();
    await path.waitFor();
    const ys = pathYs((await path.getAttribute('d'))!);
    expect(ys.length).toBeGreaterThan(3);
    // The drawn peak is the highest sample inside the chart's span (sunset − 30 min to sunrise + 30 min);
    // 0.1 px rounding on a 26 px lane is 0.35°.
    const [s0, s1] = [
      Date.parse(vis.sun.set!.utc) - 1_800_000,
      Date.parse(vis.sun.rise!.utc) + 1_800_000,
    ];
    const inSpan = c.altitudeDeg.filter(
      (_, i) => Date.parse(c.utc[i]!) >= s0 && Date.parse(c.utc[i]!) <= s1,
    );
    expect(Math.abs(moonAltOfY(Math.min(...ys)) - Math.max(...inSpan))).toBeLessThan(0.5);
    // Nothing drawn below the horizon.
    expect(Math.max(...ys)).toBeLessThanOrEqual(LAYOUT.moon.y + LAYOUT.moon.h + 0.05);
    const key = page.locator('svg.night-chart .moon-lane');
    await expect(key.textContent()).resolves.toContain(
      `${Math.round(vis.moon.illuminatedFraction * 100)}% lit`,
    );
    await page
      .locator('svg.night-chart')
      .screenshot({ path: join(SCREENSHOTS, 'night-moon-curve.png') });
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('adding records, and a horizon mask on the night chart', () => {
  const made: string[] = [];
  afterAll(async () => {
    for (const p of made.reverse()) await api(p, { method: 'DELETE' });
  });

  test('refused values are named beside their fields with nothing stored; corrected, each record is added', async () => {
    const count = async (p: string) => (await api<{ total: number }>(`${p}?limit=1`)).total;
    const before = {
      systems: await count('/systems'),
      sites: await count('/sites'),
      campaigns: await count('/campaigns'),
    };
    const { page, errors } = await open('/records');
    const sys = page.locator('form[aria-label="New system"]');
    await sys.waitFor();

    // System: RA out of range (400 from the schema: [0, 360)).
    await sys.locator('[name=name]').fill('Yarrow Pair');
    await sys.locator('[name=raDeg]').fill('400');
    await sys.locator('[name=decDeg]').fill('-30.5');
    await sys.locator('[name=positionEpoch]').fill('J2016.0');
    await sys.getByRole('button', { name: 'Add' }).click();
    await sys.locator('.field.invalid [name=raDeg]').waitFor();
    await expect(sys.locator('.field.invalid').count()).resolves.toBe(1);
    expect(await count('/systems')).toBe(before.systems);
    await sys.locator('[name=raDeg]').fill('201.25');
    await sys.getByRole('button', { name: 'Add' }).click();
    await sys.locator('.created').waitFor();
    const system = (
      await api<{ items: { id: number; positionEpoch: string }[] }>('/systems?name=Yarrow%20Pair')
    ).items[0]!;
    made.push(`/systems/${system.id}`);
    expect(system.positionEpoch.startsWith('2016-01-01')).toBe(true); // J2016.0 = 2016-01-01T12:00 TT (Lieske 1979 Julian epochs, from memory)

    // Site: a mask point above the zenith (422 from the sky engine's site rules), named beside the mask.
    const form = page.locator('form[aria-label="New site"]');
    await form.locator('[name=name]').fill('Wexmoor Shelf');
    await form.locator('[name=latitudeDeg]').fill('-24.931');
    await form.locator('[name=longitudeDeg]').fill('-69.517');
    await form.locator('[name=elevationM]').fill('2710');
    await form.locator('[name=timeZone]').fill('America/Santiago');
    await form.locator('[name=lowestAltitudeDeg]').fill('30');
    await form.locator('[name=horizonMask]').fill('0 5, 60 5, 80 60, 130 95, 150 5');
    await form.getByRole('button', { name: 'Add' }).click();
    const maskMsg = form.locator('.field.invalid .field-msg');
    await maskMsg.waitFor();
    await expect(maskMsg.textContent()).resolves.toMatch(/^horizon mask point 4, altitude: 95 /);
    await expect(form.locator('.field.invalid textarea').getAttribute('name')).resolves.toBe(
      'horizonMask',
    );
    expect(await count('/sites')).toBe(before.sites);
    // Corrected: a ridge of 60° between azimuths 80° and 130°, where the demo's Vesper Core rises (invented).
    await form.locator('[name=horizonMask]').fill('0 5, 60 5, 80 60, 130 60, 150 5');
    await form.getByRole('button', { name: 'Add' }).click();
    await form.locator('.created').waitFor();
    const site = (await api<{ items: Site[] }>('/sites?limit=500')).items.find(
      (s) => s.name === 'Wexmoor Shelf',
    )!;
    made.push(`/sites/${site.id}`);
    expect(site.horizonMask).toHaveLength(5);
    await page.locator('#sites tr', { hasText: 'Wexmoor Shelf' }).waitFor();

    // Campaign: last night before the first (400, the store's cross-field rule).
    const camp = page.locator('form[aria-label="New campaign"]');
    await camp.locator('[name=name]').fill('Zephyr shelf trial');
    await camp.locator('[name=startDate]').fill(nearPeriapsis(-13));
    await camp.locator('[name=endDate]').fill(nearPeriapsis(-44));
    await camp.locator('[name="goals.cadenceDays"]').fill('7');
    await camp
      .locator('[role=group][aria-label=targets] label', { hasText: HEADLINE })
      .locator('input')
      .check();
    await camp
      .locator('[role=group][aria-label=sites] label', { hasText: 'Wexmoor Shelf' })
      .locator('input')
      .check();
    await camp.getByRole('button', { name: 'Add' }).click();
    await camp.locator('.field.invalid [name=endDate]').waitFor();
    expect(await count('/campaigns')).toBe(before.campaigns);
    await camp.locator('[name=endDate]').fill(nearPeriapsis(108));
    await camp.getByRole('button', { name: 'Add' }).click();
    await camp.locator('.created').waitFor();
    const campaign = (
      await api<{ items: { id: number; name: string; siteIds: number[]; targetIds: number[] }[] }>(
        '/campaigns?limit=500',
      )
    ).items.find((c) => c.name === 'Zephyr shelf trial')!;
    made.push(`/campaigns/${campaign.id}`);
    expect(campaign.siteIds).toEqual([site.id]);
    expect(campaign.targetIds).toHaveLength(1);
    await shot(page, 'records-create');
    expect(errors).toEqual([]);
    await page.close();

    // A night of the new campaign at the new site: the mask stands above the 30° limit where the target rises.
    const night = await api<{ id: number }>('/nights', {
      method: 'POST',
      body: { siteId: site.id, campaignId: campaign.id, date: nearPeriapsis(0) },
    });
    made.push(`/nights/${night.id}`);
    const vis = await api<Vis>(`/nights/${night.id}/visibility?curves=true`);
    expect(vis.limits.horizonMask).toBe(true);
    const curve = vis.targets[0]!.curve!;
    expect(curve.horizonMaskDeg!.some((m, i) => m > 30 && curve.altitudeDeg[i]! > 0)).toBe(true);
    const n = await open(`/nights/${night.id}`);
    const band = n.page.locator('svg.night-detail .mask-ground').first();
    await band.waitFor();
    // The ground's top in the altitude detail is the ridge: 60° (the mask typed above); 0.1 px is 0.06°.
    expect(altOfY(Math.min(...pathYs((await band.getAttribute('d'))!)))).toBeCloseTo(60, 1);
    // The lane is closed by the mask where the target stands behind it, and says so.
    await n.page.locator('svg.night-chart .closed-span[data-limit=horizon-mask]').first().waitFor();
    await n.page
      .locator('#night-chart')
      .screenshot({ path: join(SCREENSHOTS, 'night-horizon-mask.png') });
    expect(n.errors).toEqual([]);
    await n.page.close();
  });
});

describe('sky calls from the client', () => {
  test("the season view sends each system's position epoch and each site's horizon mask", async () => {
    const systems = (
      await api<{ items: { id: number; positionEpoch: string }[] }>('/systems?limit=500')
    ).items;
    const targets = (
      await api<{ items: { id: number; name: string; systemId: number }[] }>('/targets?limit=500')
    ).items;
    const sites = (await api<{ items: Site[] }>('/sites?limit=500')).items;
    const bodies: {
      site: { name: string; horizonMask?: unknown };
      targets: { name: string; epoch?: string }[];
    }[] = [];
    const isSeason = (r: { method(): string; url(): string }) =>
      r.method() === 'POST' && r.url().endsWith('/api/sky/season');
    const { page, errors } = await open('/season', (p) =>
      p.on('request', (r) => isSeason(r) && bodies.push(JSON.parse(r.postData()!))),
    );
    await page.locator('svg.season-chart .season-row').first().waitFor();
    // The other campaigns too, so both demo systems (one at J2016.0) are sent.
    const select = page.locator('.view-head .toolbar select').first();
    const current = await select.inputValue();
    const options = await select
      .locator('option')
      .evaluateAll((os) => os.map((o) => (o as HTMLOptionElement).value));
    for (const v of options.filter((o) => o !== current))
      await Promise.all([page.waitForRequest(isSeason), select.selectOption(v)]);
    await page.waitForLoadState('networkidle');
    expect(bodies.length).toBeGreaterThan(0);
    const epochs = new Set<string>();
    for (const b of bodies) {
      const stored = sites.find((s) => s.name === b.site.name)!;
      expect(b.site.horizonMask).toEqual(stored.horizonMask);
      for (const t of b.targets) {
        const row = targets.find((x) => x.name === t.name)!;
        expect(t.epoch).toBe(systems.find((s) => s.id === row.systemId)!.positionEpoch);
        epochs.add(t.epoch!);
      }
    }
    expect(bodies.some((b) => (b.site.horizonMask as unknown[]).length > 0)).toBe(true);
    expect(epochs.size).toBeGreaterThan(1); // the demo's systems sit at J2000.0 and J2016.0 (invented demo values)
    expect(errors).toEqual([]);
    await page.close();
  });
});
