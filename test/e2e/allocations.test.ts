/**
 * A campaign's nights from the client, in chromium against the real server: a pattern, a CSV file
 * and an iCalendar file previewed on the calendar of site-nights, then stored all or none; one
 * night allocated and released from its cell. Dates come from the demo's calendar (DEMO.day);
 * every expected night is the constructed case the test itself types.
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

interface Night {
  id: number;
  siteId: number;
  campaignId: number | null;
  date: string;
  semester: string;
}
interface Campaign {
  id: number;
  name: string;
  siteIds: number[];
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

const nightsAt = async (campaignId: number, siteId: number) =>
  (await api<{ items: Night[] }>(`/nights?campaignId=${campaignId}&siteId=${siteId}&limit=500`))
    .items;

/** The passage campaign (two sites) and its second site, where the demo leaves late dates free. */
async function setting() {
  const campaigns = (await api<{ items: Campaign[] }>('/campaigns')).items;
  const passage = campaigns.find((c) => c.siteIds.length === 2)!;
  const site = await api<{ id: number; name: string }>(`/sites/${passage.siteIds[1]}`);
  return { campaigns, passage, site };
}

async function openNights(page: Page, campaign: Campaign) {
  await page.goto(`${base}/nights?token=${lead}`);
  await page.getByRole('heading', { name: /^Nights of / }).waitFor();
  await page.locator('.view-head select').selectOption(String(campaign.id));
  await page.getByRole('heading', { name: `Nights of ${campaign.name}` }).waitFor();
  await page.locator('.night-cell[data-date]').first().waitFor();
}

const cell = (page: Page, siteId: number, date: string) =>
  page.locator(`.night-cell[data-site="${siteId}"][data-date="${date}"]`);

describe('allocated nights from the client', () => {
  test('a pattern previewed on the calendar, then stored with its semester label', async () => {
    const { passage, site } = await setting();
    const ctx = await newContext(browser, { viewport: { width: 1400, height: 1000 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await openNights(page, passage);
    // Fridays and Saturdays of a fortnight late in the campaign (constructed case).
    const start = DateTime.fromISO(DEMO.day(300));
    const end = start.plus({ days: 13 });
    const expected = Array.from({ length: 14 }, (_, k) => start.plus({ days: k }))
      .filter((d) => d.weekday === 5 || d.weekday === 6)
      .map((d) => d.toISODate()!);
    const form = page.locator('.allocation-form');
    await form.locator('select[name=allocation-site]').selectOption(String(site.id));
    await form.locator('input[name=start]').fill(start.toISODate()!);
    await form.locator('input[name=end]').fill(end.toISODate()!);
    for (const w of ['Mon', 'Tue', 'Wed', 'Thu', 'Sun'])
      await form.locator(`input[name=weekday-${w}]`).uncheck();
    await form.locator('input[name=semester]').fill('2027B');
    const before = await nightsAt(passage.id, site.id);
    await form.getByRole('button', { name: 'Preview' }).click();
    await form
      .getByText(`${expected.length} new nights, 0 nights already allocated, 0 refused`)
      .waitFor();
    for (const d of expected)
      await expect(cell(page, site.id, d).getAttribute('class')).resolves.toContain('proposed-new');
    expect(await nightsAt(passage.id, site.id)).toEqual(before);
    await page.screenshot({ path: join(SCREENSHOTS, 'nights-preview.png'), fullPage: true });
    await form.getByRole('button', { name: `Store ${expected.length} new nights` }).click();
    await form.getByText(`Stored ${expected.length} new nights.`).waitFor();
    const after = (await nightsAt(passage.id, site.id)).filter((n) => expected.includes(n.date));
    expect(after.map((n) => [n.date, n.semester]).sort()).toEqual(
      expected.map((d) => [d, '2027B']),
    );
    // The calendar refreshes from the store: the cells are now allocated.
    await expect
      .poll(() => cell(page, site.id, expected[0]!).getAttribute('class'))
      .toContain('cell-ours');
    expect(errors).toEqual([]);
    await ctx.close();
  });

  test('a CSV file with one refused night stores nothing; mended, it stores all', async () => {
    const { passage, site } = await setting();
    const ctx = await newContext(browser, { viewport: { width: 1400, height: 1000 } });
    const page = await ctx.newPage();
    await openNights(page, passage);
    const a = DEMO.day(318);
    const b = DEMO.day(319);
    const late = DEMO.day(400); // after the campaign's last night
    const form = page.locator('.allocation-form');
    await form.locator('input[value=csv]').check();
    const text = form.locator('textarea[name=allocation-text]');
    await text.fill(
      `site,date,semester\n${site.name},${a},2027B\n${site.name},${b},2027B\n${site.name},${late},2027B\n`,
    );
    await form.getByRole('button', { name: 'Preview' }).click();
    await form.getByText(/2 new nights, 0 nights already allocated, 1 refused/).waitFor();
    await form
      .locator('tr.allocation-refused')
      .getByText(/outside the campaign’s dates/)
      .waitFor();
    await expect(form.getByRole('button', { name: /^Store/ }).isDisabled()).resolves.toBe(true);
    expect((await nightsAt(passage.id, site.id)).some((n) => n.date === a)).toBe(false);
    await text.fill(`site,date,semester\n${site.name},${a},2027B\n${site.name},${b},2027B\n`);
    await form.getByRole('button', { name: 'Preview' }).click();
    await form.getByRole('button', { name: 'Store 2 new nights' }).click();
    await form.getByText('Stored 2 new nights.').waitFor();
    const dates = (await nightsAt(passage.id, site.id)).map((n) => n.date);
    expect(dates).toEqual(expect.arrayContaining([a, b]));
    await ctx.close();
  });

  test('the telescope’s iCalendar schedule, then one night allocated and released by its cell', async () => {
    const { passage, site } = await setting();
    const ctx = await newContext(browser, { viewport: { width: 1400, height: 1000 } });
    const page = await ctx.newPage();
    await openNights(page, passage);
    const first = DateTime.fromISO(DEMO.day(322));
    const ics = [
      'BEGIN:VCALENDAR',
      'VERSION:2.0',
      'PRODID:-//constructed telescope schedule//EN',
      'BEGIN:VEVENT',
      'UID:block-a@test',
      'DTSTAMP:20260101T000000Z',
      'SUMMARY:Vesper follow-up',
      `DTSTART;VALUE=DATE:${first.toFormat('yyyyLLdd')}`,
      `DTEND;VALUE=DATE:${first.plus({ days: 2 }).toFormat('yyyyLLdd')}`,
      'END:VEVENT',
      'END:VCALENDAR',
      '',
    ].join('\r\n');
    const form = page.locator('.allocation-form');
    await form.locator('input[value=calendar]').check();
    await form.locator('select[name=allocation-site]').selectOption(String(site.id));
    await form.locator('textarea[name=allocation-text]').fill(ics);
    await form.getByRole('button', { name: 'Preview' }).click();
    // An all-day event covers the evenings of its dates, its end date excluded (RFC 5545 §3.6.1).
    await form.getByRole('button', { name: 'Store 2 new nights' }).click();
    await form.getByText('Stored 2 new nights.').waitFor();
    const dates = (await nightsAt(passage.id, site.id)).map((n) => n.date);
    expect(dates).toEqual(
      expect.arrayContaining([first.toISODate(), first.plus({ days: 1 }).toISODate()]),
    );
    expect(dates).not.toContain(first.plus({ days: 2 }).toISODate());

    // One free night, allocated from its cell and released again.
    const free = DEMO.day(326);
    await cell(page, site.id, free).click();
    const detail = page.locator('.cell-detail');
    await detail.getByText('not allocated').waitFor();
    await detail.getByRole('button', { name: 'Allocate this night' }).click();
    await expect
      .poll(async () => (await nightsAt(passage.id, site.id)).some((n) => n.date === free))
      .toBe(true);
    await expect.poll(() => cell(page, site.id, free).getAttribute('class')).toContain('cell-ours');
    await cell(page, site.id, free).click();
    await detail.getByRole('button', { name: 'Release this night' }).click();
    await expect
      .poll(async () => (await nightsAt(passage.id, site.id)).some((n) => n.date === free))
      .toBe(false);
    await ctx.close();
  });

  test('the chosen campaign is the one the Season view opens on', async () => {
    const { campaigns } = await setting();
    const other = campaigns.find((c) => c.siteIds.length === 1)!;
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await openNights(page, other);
    await page
      .getByRole('navigation', { name: 'views' })
      .getByRole('link', { name: 'Season' })
      .click();
    await page.locator('.view-head select').first().waitFor();
    await expect(page.locator('.view-head select').first().inputValue()).resolves.toBe(
      String(other.id),
    );
    await page
      .getByRole('navigation', { name: 'views' })
      .getByRole('link', { name: 'Campaign' })
      .click();
    await page.getByRole('heading', { name: other.name, level: 1 }).waitFor();
    await ctx.close();
  });
});
