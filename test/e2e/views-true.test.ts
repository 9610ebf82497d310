/**
 * Views that stay true, in chromium against the real server: a write refreshes what depends on
 * it (making an older solution current redraws the events without a reload), one laser-guide-star
 * caution per page however many parts raise it, no code names or raw validation wording on
 * screen, counts in words ("1 block"), and no blank cell without its reason.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { HEADLINE, TEST_NOW, apiCaller, launchBrowser, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** Words a reader should never meet: request field names, zod's wording, event codes, raw floats. */
const CODE_WORDS =
  /gravitationalRedshift|transverseDoppler|site_id|Too big|Too small|expected number|rv-maximum|ascending-node|closest-separation|\d\.\d{9,}/;
const BAD_PLURAL = /(?<![\d.])1 (blocks|days|nights|epochs|measurements)\b/;

async function open(page: Page, path: string) {
  await page.goto(`${base}${path}${path.includes('?') ? '&' : '?'}token=${lead}`);
  await page.locator('main h1').first().waitFor();
}

describe('views that stay true', () => {
  test('one laser-guide-star caution on a night page, also with a proposal open', async () => {
    const blocks = (
      await api<{ items: { nightId: number; laserGuideStar: boolean }[] }>(
        `/blocks?start=${TEST_NOW}&limit=500`,
      )
    ).items;
    const nightId = blocks.find((b) => b.laserGuideStar)!.nightId;
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await open(page, `/nights/${nightId}`);
    await page.locator('table.blocks').waitFor();
    const laser = page.locator('.caution').filter({ hasText: /laser/i });
    await expect(laser.count()).resolves.toBe(1);
    await page.getByRole('button', { name: 'Propose a schedule' }).click();
    await page.locator('table.proposal tbody tr').first().waitFor();
    await expect(laser.count()).resolves.toBe(1);
    // biome-ignore lint/performance/useDomNodeTextContent: a playwright locator; its rendered text keeps the table cells apart
    const text = await page.locator('main').innerText();
    expect(text).not.toMatch(CODE_WORDS);
    expect(text).not.toMatch(BAD_PLURAL);
    // Every cell of the Sun and Moon table says something.
    for (const cell of await page.locator('#sun-moon td').allTextContents())
      expect(cell.trim()).not.toMatch(/^–?$/);
    await ctx.close();
  });

  test('making an older solution current redraws the events at once', async () => {
    const targets = (await api<{ items: { id: number; name: string }[] }>('/targets')).items;
    const ilex = targets.find((t) => t.name === HEADLINE)!;
    const sols = (
      await api<{ items: { id: number; version: number; current: boolean }[] }>(
        `/orbit-solutions?targetId=${ilex.id}`,
      )
    ).items;
    const current = sols.find((s) => s.current)!;
    const older = sols.find((s) => !s.current)!;
    const ctx = await newContext(browser, { viewport: { width: 1280, height: 1000 } });
    const page = await ctx.newPage();
    await open(page, `/targets/${ilex.id}`);
    const periRow = page.locator('#events tr.row-periapsis').first();
    await periRow.waitFor();
    const before = await periRow.textContent();
    await page
      .locator('#solutions tr', { hasText: `v${older.version}` })
      .getByRole('button', { name: 'Make current' })
      .click();
    await expect.poll(() => periRow.textContent(), { timeout: 30_000 }).not.toBe(before);
    // biome-ignore lint/performance/useDomNodeTextContent: a playwright locator; its rendered text keeps the table cells apart
    const text = await page.locator('main').innerText();
    expect(text).not.toMatch(CODE_WORDS);
    expect(text).not.toMatch(BAD_PLURAL);
    // Put the demo back as it was.
    await api(`/orbit-solutions/${current.id}/current`, { method: 'POST' });
    await ctx.close();
  });

  test('overview, records and nights read in words', async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    for (const path of ['/', '/records', '/nights']) {
      await open(page, path);
      await page.locator('main section').first().waitFor();
      await page
        .locator('.loading')
        .first()
        .waitFor({ state: 'detached' })
        .catch(() => undefined);
      // biome-ignore lint/performance/useDomNodeTextContent: a playwright locator; its rendered text keeps the table cells apart
      const text = await page.locator('main').innerText();
      expect(text, path).not.toMatch(CODE_WORDS);
      expect(text, path).not.toMatch(BAD_PLURAL);
    }
    await ctx.close();
  });
});
