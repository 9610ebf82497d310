/**
 * Logging a night that has ended, as an observer does the morning after, in chromium against the
 * real server: record the blocks that ran with their real start and end on the site's clock, edit
 * one of them, write the report (its outcomes start from what was logged) and add a measurement.
 * The stored instants are checked against luxon's reading of the same clock times (constructed
 * case: the test types the times and knows the zone).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { DateTime } from 'luxon';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { DEMO, SCREENSHOTS, apiCaller, launchBrowser, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;

interface Row {
  id: number;
  name: string;
}
interface Night {
  id: number;
  siteId: number;
  date: string;
}
interface Block {
  id: number;
  targetId: number;
  startUtc: string;
  endUtc: string;
  status: string;
  origin: string;
  version: number;
}
interface Visibility {
  darkness: { intervals: { start: { utc: string }; end: { utc: string } }[] };
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** A night at the binary campaign's site four days before the clock, which the demo left unstored. */
async function pastNight(): Promise<{ night: Night; darkStart: DateTime }> {
  const campaigns = await api<{ items: (Row & { siteIds: number[]; targetIds: number[] })[] }>(
    '/campaigns',
  );
  const binary = campaigns.items.find((c) => c.targetIds.length === 1)!;
  const site = await api<Row & { timeZone: string }>(`/sites/${binary.siteIds[0]}`);
  const night = await api<Night>('/nights', {
    method: 'POST',
    body: { siteId: site.id, campaignId: binary.id, date: DEMO.day(-4) },
  });
  const vis = await api<Visibility>(`/nights/${night.id}/visibility`);
  const darkStart = DateTime.fromISO(vis.darkness.intervals[0]!.start.utc, {
    zone: site.timeZone,
  });
  return { night, darkStart: darkStart.plus({ minutes: 30 }).startOf('minute') };
}

const blocksOf = async (nightId: number) =>
  (await api<{ items: Block[] }>(`/blocks?nightId=${nightId}`)).items.sort((a, b) =>
    a.startUtc.localeCompare(b.startUtc),
  );

async function record(page: Page, start: DateTime, end: DateTime, status: string) {
  const form = page.locator('form.block-log-form');
  await form.locator('input[name=start]').fill(start.toFormat('HH:mm'));
  await form.locator('input[name=end]').fill(end.toFormat('HH:mm'));
  await form.locator('select[name=status]').selectOption(status);
  await form.getByRole('button', { name: 'Record this block' }).click();
}

describe('logging a night that has ended', () => {
  test('record what ran, edit a block, then the report and a measurement', async () => {
    const { night, darkStart } = await pastNight();
    const ctx = await newContext(browser, { viewport: { width: 1280, height: 1000 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
    await page.goto(`${base}/nights/${night.id}?token=${lead}`);
    await page.getByRole('heading', { name: 'Record what ran' }).waitFor();
    // The scheduler does not offer to plan a night that is over (the old dead end: a 409).
    await expect(page.getByRole('button', { name: 'Propose a schedule' }).count()).resolves.toBe(0);

    // 1. Two blocks as they ran, on the site's clock.
    const a = [darkStart, darkStart.plus({ minutes: 50 })] as const;
    const b = [darkStart.plus({ minutes: 60 }), darkStart.plus({ minutes: 95 })] as const;
    await record(page, a[0], a[1], 'obtained');
    await page.getByText(/Added: .* obtained\./).waitFor();
    await expect.poll(async () => (await blocksOf(night.id)).length).toBe(1);
    await record(page, b[0], b[1], 'lost');
    await expect.poll(async () => (await blocksOf(night.id)).length).toBe(2);
    const stored = await blocksOf(night.id);
    // Stored UTC instants are the typed clock times read in the site's zone.
    expect(stored.map((x) => [Date.parse(x.startUtc), Date.parse(x.endUtc), x.status])).toEqual([
      [a[0].toMillis(), a[1].toMillis(), 'obtained'],
      [b[0].toMillis(), b[1].toMillis(), 'lost'],
    ]);
    expect(stored.every((x) => x.origin === 'by-hand')).toBe(true);
    await page.locator(`table.blocks tr[data-block="${stored[1]!.id}"]`).waitFor();

    // 2. The first block really ended ten minutes early, and only partly: edit it in place.
    const first = stored[0]!;
    await page
      .locator(`table.blocks tr[data-block="${first.id}"]`)
      .getByRole('button', { name: /^edit/ })
      .click();
    const editor = page.locator('form.block-editor');
    await expect(editor.locator('input[name=start]').inputValue()).resolves.toBe(
      a[0].toFormat('HH:mm'),
    );
    await editor.locator('input[name=end]').fill(a[1].minus({ minutes: 10 }).toFormat('HH:mm'));
    await editor.locator('select[name=status]').selectOption('partial');
    await editor.getByRole('button', { name: 'Save block' }).click();
    await editor.waitFor({ state: 'detached' });
    await expect
      .poll(async () => {
        const x = await api<Block>(`/blocks/${first.id}`);
        return [Date.parse(x.endUtc), x.status, x.version];
      })
      .toEqual([a[1].minus({ minutes: 10 }).toMillis(), 'partial', first.version + 1]);
    // A time that is not a clock time is named beside its field, and nothing is written.
    await page.locator('form.block-log-form input[name=start]').fill(a[0].toFormat('HH:mm'));
    await page.locator('form.block-log-form input[name=end]').fill('25:70');
    await page.getByRole('button', { name: 'Record this block' }).click();
    await page.locator('form.block-log-form .field.invalid .field-msg').waitFor();
    await expect(page.locator('form.block-log-form .field-msg').textContent()).resolves.toMatch(
      /not a clock time/,
    );
    await page.screenshot({ path: join(SCREENSHOTS, 'past-night-logged.png'), fullPage: true });
    expect((await blocksOf(night.id)).length).toBe(2);

    // 3. The report: the outcomes start from what was logged.
    await page.getByRole('link', { name: 'Write the night report →' }).click();
    const seeing = page.locator('input[name=seeingArcsec]');
    await seeing.waitFor();
    await expect(page.locator(`select[name="outcome-${first.id}"]`).inputValue()).resolves.toBe(
      'partial',
    );
    await expect(
      page.locator(`select[name="outcome-${stored[1]!.id}"]`).inputValue(),
    ).resolves.toBe('lost');
    await seeing.fill('0.82');
    // A decimal comma is named beside its field and nothing is sent (it used to vanish).
    await page.locator('input[name=timeLostHours]').fill('0,6');
    await page.getByRole('button', { name: 'Save report' }).click();
    await page.getByText('“0,6” has a comma: use a decimal point: 0.6').waitFor();
    expect((await api<{ items: unknown[] }>(`/night-reports?nightId=${night.id}`)).items).toEqual(
      [],
    );
    await page.locator('input[name=timeLostHours]').fill('0.6');
    await page.locator('input[name=timeLostReason]').fill('cirrus after the first block');
    await page.getByRole('button', { name: 'Save report' }).click();
    await page.getByText('Saved as version 1').waitFor();
    const reports = await api<{
      items: { seeingArcsec: number; outcomes: { status: string }[] }[];
    }>(`/night-reports?nightId=${night.id}`);
    expect(reports.items[0]).toMatchObject({ seeingArcsec: 0.82 });
    expect(reports.items[0]!.outcomes.map((o) => o.status).sort()).toEqual(['lost', 'partial']);

    // 4. A measurement of the block that ran.
    const m = page.locator('form.measurement-form');
    await m.locator('input[name=dRaMas]').fill('312.5');
    await m.locator('input[name=dDecMas]').fill('-270.1');
    await m.locator('input[name=sigmaDRaMas]').fill('0.6');
    await m.locator('input[name=sigmaDDecMas]').fill('0.7');
    await m.locator('input[name=instrument]').fill('night camera');
    await m.getByRole('button', { name: 'Add measurement' }).click();
    await expect
      .poll(
        async () =>
          (await api<{ items: unknown[] }>(`/measurements?blockId=${first.id}`)).items.length,
      )
      .toBe(1);
    await page.screenshot({ path: join(SCREENSHOTS, 'past-night-report.png'), fullPage: true });
    expect(errors).toEqual([]);
    await ctx.close();
  });
});
