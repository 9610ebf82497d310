/**
 * Pinning a stored block from the night view, end to end in chromium against the real server with
 * the demo campaign: the blocks table says where each block came from and whether it is pinned;
 * pin one, reload and find it pinned; a stale unpin (someone else saved the block first) shows the
 * server's message and reloads; unpin it. The block ends unpinned, as the demo left it.
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { TEST_NOW, apiCaller, launchBrowser, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;

interface Block {
  id: number;
  nightId: number;
  startUtc: string;
  status: string;
  notes: string;
  version: number;
  origin: string;
  pinned: boolean;
}

/** The table's words for each origin (our own wording, no source: it is what the view promises to show). */
const LABEL: Record<string, string> = {
  'season-plan': 'season plan',
  'night-schedule': 'night schedule',
  'by-hand': 'by hand',
};

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

describe('pinning stored blocks', () => {
  test('pin a block, reload and see it pinned; a stale unpin is refused and reloads; unpin it', async () => {
    const all = (await api<{ items: Block[] }>(`/blocks?start=${TEST_NOW}&limit=500`)).items;
    // Keep clear of the night other browser tests move blocks on (the first with two or more blocks).
    const counts = new Map<number, number>();
    for (const b of all) counts.set(b.nightId, (counts.get(b.nightId) ?? 0) + 1);
    const busyNight = [...counts].find(([, n]) => n >= 2)?.[0];
    const candidates = all.filter(
      (b) => b.status === 'planned' && !b.pinned && b.nightId !== busyNight,
    );
    const block = candidates.find((b) => b.origin !== 'by-hand') ?? candidates[0];
    expect(block, 'the demo has an unpinned planned block on a quiet night').toBeDefined();
    const b = block!;

    const ctx = await newContext(browser, { viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on(
      'console',
      (m) => m.type() === 'error' && !/status of 409/.test(m.text()) && errors.push(m.text()),
    );
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(`${base}/nights/${b.nightId}?token=${lead}`);
    const row = page.locator(`table.blocks tr[data-block="${b.id}"]`);
    await row.waitFor();
    await expect(row.locator('td.origin').textContent()).resolves.toBe(LABEL[b.origin]);
    await expect(row.locator('td.pin-state').textContent()).resolves.toBe('no');
    await expect(page.locator('.pin-note').textContent()).resolves.toMatch(
      /never replaces a pinned block or one made by hand/,
    );

    // Pin it: the server stores it pinned with the next version.
    await row.getByRole('button', { name: /^pin / }).click();
    await expect.poll(async () => (await api<Block>(`/blocks/${b.id}`)).pinned).toBe(true);
    await page.reload();
    await row.waitFor();
    await expect(row.locator('td.pin-state').textContent()).resolves.toBe('pinned');
    await row.getByRole('button', { name: /^unpin / }).waitFor();

    // Someone else saves the block while this page holds the version it read: the unpin is refused.
    const pinned = await api<Block>(`/blocks/${b.id}`);
    expect(pinned).toMatchObject({ pinned: true, version: b.version + 1, origin: b.origin });
    await api(`/blocks/${b.id}`, {
      method: 'PATCH',
      body: { notes: pinned.notes, version: pinned.version },
    });
    await row.getByRole('button', { name: /^unpin / }).click();
    await page
      .getByRole('alert')
      .filter({ hasText: /changed by someone else/ })
      .waitFor();
    await page
      .getByText('Someone changed this block first; the table now shows it as stored.')
      .waitFor();
    expect((await api<Block>(`/blocks/${b.id}`)).pinned).toBe(true);

    // After the reload the page holds the stored version, and the unpin goes through.
    await expect.poll(() => row.getAttribute('data-version')).toBe(String(pinned.version + 1));
    await row.getByRole('button', { name: /^unpin / }).click();
    await expect.poll(async () => (await api<Block>(`/blocks/${b.id}`)).pinned).toBe(false);
    await expect.poll(() => row.locator('td.pin-state').textContent()).toBe('no');
    await page.getByRole('alert').waitFor({ state: 'detached' });
    expect(errors).toEqual([]);
    await ctx.close();
  });
});
