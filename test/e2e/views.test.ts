/**
 * The light client end to end: the built client served by the real server with the demo
 * campaign, driven in chromium. Every view opens without console errors and leaves a screenshot
 * in test-output/e2e for a person to look at.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import {
  HEADLINE,
  SCREENSHOTS,
  apiCaller,
  launchBrowser,
  nearPeriapsis,
  newContext,
} from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
let browser: Browser;

const api = apiCaller(base, lead);

/** A signed-in page that records console errors and failed requests. */
async function open(
  ctx: BrowserContext,
  path: string,
  token = lead,
): Promise<{ page: Page; errors: string[] }> {
  const page = await ctx.newPage();
  const errors: string[] = [];
  page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
  page.on('pageerror', (e) => errors.push(e.message));
  const sep = path.includes('?') ? '&' : '?';
  await page.goto(`${base}${path}${sep}token=${token}`);
  return { page, errors };
}

const shot = (page: Page, name: string) =>
  page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: true });

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('every view opens, shows its content and logs no console error', () => {
  test('campaign overview with a periapsis flag', async () => {
    const ctx = await newContext(browser, { viewport: { width: 1280, height: 900 } });
    const { page, errors } = await open(ctx, '/');
    await page.locator('.periapsis-flag').first().waitFor();
    // The sign-in link's token leaves the address bar and the role is shown.
    expect(page.url()).not.toContain('token=');
    await expect(page.locator('.role').textContent()).resolves.toContain('lead');
    // The headline star passes periapsis months ahead in the invented demo (server/store/demo/scenario.ts),
    // and its fitted solution gives the date its ± from the first screen.
    const s1 = page.locator('.periapsis-flag', { hasText: HEADLINE });
    await expect(s1.textContent()).resolves.toMatch(/\d{4}-\d\d-\d\d.*± [\d.]+ d/);
    await expect(s1.textContent()).resolves.not.toMatch(/no covariance/);
    await page.locator('#next-nights a').first().waitFor();
    await page.locator('#latest-reports table').waitFor();
    await shot(page, 'overview');
    expect(errors).toEqual([]);
    await ctx.close();
  });
});

describe('views', () => {
  let ctx: BrowserContext;
  beforeAll(async () => {
    ctx = await newContext(browser, { viewport: { width: 1280, height: 900 } });
  });
  afterAll(async () => ctx.close());

  test('target: sky plane, radial velocity, events, solutions, ephemeris', async () => {
    const { page, errors } = await open(ctx, '/targets/1');
    await page.locator('svg.sky-plane .measurement').first().waitFor();
    await page.locator('svg.rv-curve').waitFor();
    await page.locator('#events tbody tr').first().waitFor();
    await page.locator('#ephemeris tbody tr').first().waitFor();
    await expect(page.locator('#events').textContent()).resolves.toContain('periapsis');
    await expect(page.locator('#solutions').textContent()).resolves.toContain('current');
    await shot(page, 'target');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('night: lane chart with darkness and blocks, cautions, times in UTC and local', async () => {
    const nights = await api<{ items: { id: number; date: string; siteId: number }[] }>(
      '/nights?siteId=1&limit=500',
    );
    const night = nights.items.find((n) => n.date >= nearPeriapsis(-105))!;
    const { page, errors } = await open(ctx, `/nights/${night.id}`);
    await page.locator('svg.night-chart .target-lane').first().waitFor();
    expect(await page.locator('svg.night-chart .dark-span').count()).toBeGreaterThan(0);
    expect(await page.locator('svg.night-chart .block-bar').count()).toBeGreaterThan(0);
    // Tolvane Ridge runs a laser guide star (demo scenario): its caution is on the page.
    await expect(page.locator('.caution').allTextContents()).resolves.toEqual(
      expect.arrayContaining([expect.stringContaining('laser')]),
    );
    await expect(page.locator('table.blocks thead').textContent()).resolves.toContain(
      'America/Santiago',
    );
    await shot(page, 'night');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('night report', async () => {
    const reports = await api<{ items: { nightId: number }[] }>('/night-reports?limit=1');
    const { page, errors } = await open(ctx, `/nights/${reports.items[0]!.nightId}/report`);
    await page.locator('form.report-form input[name=seeingArcsec]').waitFor();
    await page.locator('#measurements').waitFor();
    await shot(page, 'report');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('season', async () => {
    const { page, errors } = await open(ctx, '/season');
    await page.locator('svg.season-chart .season-row').first().waitFor();
    await shot(page, 'season');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('records', async () => {
    const { page, errors } = await open(ctx, '/records');
    await page.locator('#sites table tbody tr').first().waitFor();
    await expect(page.locator('#import').count()).resolves.toBe(1);
    await shot(page, 'records');
    expect(errors).toEqual([]);
    await page.close();
  });
});
