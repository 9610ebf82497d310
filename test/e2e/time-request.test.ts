/**
 * The time request page against the real server and the demo (invented): the total, each site's
 * bar and table rows show what POST /campaigns/{id}/time-request gives for the same semester, and
 * the Markdown is there to copy. Waits on state, never on time.
 */
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, apiCaller, nearPeriapsis } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

interface Answer {
  totals: { requestHours: number };
  sites: { site: string; requestHours: number }[];
}

describe('the semester time request page', () => {
  test('shows the API’s hours per site and in total, print-ready', async () => {
    const startDate = nearPeriapsis(-60),
      endDate = nearPeriapsis(60);
    const campaign = (await api<{ items: { id: number }[] }>('/campaigns?limit=500')).items[0]!;
    const answer = await api<Answer>(`/campaigns/${campaign.id}/time-request`, {
      method: 'POST',
      body: { name: 'E1', startDate, endDate },
    });
    const { page, errors } = await open('/time-request');
    await page.locator('input[name="name"]').fill('E1');
    await page.locator('input[name="startDate"]').fill(startDate);
    await page.locator('input[name="endDate"]').fill(endDate);
    await page.getByRole('button', { name: 'Write the request' }).click();
    const total = page.locator('.request-total');
    await total.waitFor();
    expect(await total.textContent()).toContain(`${answer.totals.requestHours.toFixed(1)} h`);
    for (const s of answer.sites) {
      expect(await page.locator(`.request-bars [data-site="${s.site}"] .value`).textContent()).toBe(
        `${s.requestHours.toFixed(1)} h`,
      );
      expect(
        await page
          .locator(`.request-table tbody[data-site="${s.site}"] .site-total td`)
          .last()
          .textContent(),
      ).toBe(s.requestHours.toFixed(1));
    }
    expect(await page.locator('.request-sheet').textContent()).not.toMatch(/NaN|undefined|null/);
    expect(await page.locator('.request-markdown').inputValue()).toMatch(
      /^# Time request, semester E1/,
    );
    // The CSV download holds the same hours: each site's rows add up to its request.
    const href = await page.locator('a.request-csv').getAttribute('href');
    const csv = decodeURIComponent(href!.replace(/^data:text\/csv;charset=utf-8,/, ''));
    const rows = (parse(csv) as string[][]).slice(1);
    for (const s of answer.sites) {
      const mine = rows.filter((r) => r[1] === s.site && r[2] !== '(site total)');
      expect(mine.reduce((h, r) => h + Number(r[7]), 0)).toBeCloseTo(s.requestHours, 2);
    }
    expect(await page.locator('.request-method').textContent()).toMatch(/Fisher/);
    await page.emulateMedia({ media: 'print' });
    expect(await page.locator('.topbar').isVisible()).toBe(false);
    await page
      .locator('.request-sheet')
      .screenshot({ path: join(SCREENSHOTS, 'time-request-print.png') });
    expect(errors).toEqual([]);
    await page.close();
  });
});
