/**
 * The target view shows the relativity forecast of the demo's deepest star (its headline star, invented): the
 * same summary lines the API gives, and a row per factor. Waits on state, never on time.
 */
import type { Browser, BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { HEADLINE, SCREENSHOTS, apiCaller, launchBrowser, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;
let ctx: BrowserContext;

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
  ctx = await newContext(browser, { viewport: { width: 1280, height: 900 } });
});
afterAll(async () => {
  await ctx?.close();
  await browser?.close();
});

describe('the relativity forecast and light-time in the target view', () => {
  test("shows the deepest star's redshift and precession forecast as the API gives it", async () => {
    const targets = (await api<{ items: { id: number; name: string }[] }>('/targets?limit=500'))
      .items;
    const deepest = targets.find((t) => t.name === HEADLINE)!;
    const forecast = await api<{ summary: string[] }>(`/targets/${deepest.id}/forecast`);
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(`${base}/targets/${deepest.id}?token=${lead}`);
    const items = page.locator('.forecast-summary li');
    await items.first().waitFor();
    expect(await items.allTextContents()).toEqual(forecast.summary);
    const rows = page.locator('.forecast-table tbody tr');
    expect(await rows.count()).toBe(2);
    expect(await rows.nth(0).textContent()).toMatch(/redshift factor/);
    expect(await page.locator('.forecast-table').textContent()).not.toMatch(/NaN|undefined/);
    // Its solution has the Rømer delay on: the events table shows observed and emitted times.
    await page.locator('#events tbody tr').first().waitFor();
    const head = await page.locator('#events thead').textContent();
    expect(head).toMatch(/observed \(UTC, light-time included\)/);
    expect(head).toMatch(/emitted at the star/);
    await page.locator('#forecast').screenshot({ path: join(SCREENSHOTS, 'forecast.png') });
    expect(errors).toEqual([]);
    await page.close();
  });
});
