/**
 * The light client end to end: the built client served by the real server with the demo
 * campaign, driven in chromium. Every view opens without console errors and leaves a screenshot
 * in test-output/e2e for a person to look at.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { SCREENSHOTS, launchBrowser } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
let browser: Browser;

async function api<T>(path: string, init: { method?: string; body?: unknown; token?: string } = {}): Promise<T> {
  const res = await fetch(`${base}/api${path}`, {
    method: init.method ?? 'GET',
    headers: { authorization: `Bearer ${init.token ?? lead}`, ...(init.body ? { 'content-type': 'application/json' } : {}) },
    ...(init.body ? { body: JSON.stringify(init.body) } : {}),
  });
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`);
  return (res.status === 204 ? undefined : await res.json()) as T;
}

/** A signed-in page that records console errors and failed requests. */
async function open(ctx: BrowserContext, path: string, token = lead): Promise<{ page: Page; errors: string[] }> {
  const page = await ctx.newPage();
  const errors: string[] = [];
  page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
  page.on('pageerror', (e) => errors.push(e.message));
  const sep = path.includes('?') ? '&' : '?';
  await page.goto(`${base}${path}${sep}token=${token}`);
  return { page, errors };
}

const shot = (page: Page, name: string) => page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: true });

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('every view opens, shows its content and logs no console error', () => {
  test('campaign overview with a periapsis flag', async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const { page, errors } = await open(ctx, '/');
    await page.locator('.periapsis-flag').first().waitFor();
    // The sign-in link's token leaves the address bar and the role is shown.
    expect(page.url()).not.toContain('token=');
    await expect(page.locator('.role').textContent()).resolves.toContain('lead');
    // VC s1 passes periapsis in June 2027 in the invented demo scenario (server/store/demo/scenario.ts).
    const s1 = page.locator('.periapsis-flag', { hasText: 'VC s1' });
    await expect(s1.textContent()).resolves.toMatch(/2027-06-14/);
    await page.locator('#next-nights a').first().waitFor();
    await page.locator('#latest-reports table').waitFor();
    await shot(page, 'overview');
    expect(errors).toEqual([]);
    await ctx.close();
  });
});
