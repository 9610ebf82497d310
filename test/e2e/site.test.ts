/**
 * The site page against the real server and the demo (invented log and priors): the month tiles
 * and table say what GET /sites/{id}/statistics says, and a lead's new prior is stored and drawn.
 * Waits on state, never on time.
 */
import { join } from 'node:path';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

interface Stats {
  site: string;
  year: { nights: number };
  months: { month: number; nights: number; clearProbability: number }[];
  priors: ({ clearFraction: number; strengthNights: number } | null)[];
  precision: {
    bySeeingAndAirmass: { byAirmass: { n: number; medianSigma: number | null }[] }[];
  }[];
}

describe('the site page', () => {
  test('shows each month’s clear chance and nights as the API gives them, and saves a prior', async () => {
    const sites = (await api<{ items: { id: number; name: string }[] }>('/sites?limit=500')).items;
    const site = sites[0]!;
    const stats = await api<Stats>(`/sites/${site.id}/statistics`);
    const { page, errors } = await open('/sites');
    await page.locator('.site-list a', { hasText: site.name }).click();
    await page.locator('.month-ribbon [data-month="12"]').waitFor();
    expect(await page.locator('h1').textContent()).toBe(stats.site);
    for (const m of stats.months) {
      const tile = page.locator(`.month-ribbon [data-month="${m.month}"]`);
      expect(await tile.locator('.pct').textContent()).toBe((100 * m.clearProbability).toFixed(0));
      expect(await tile.locator('.n').textContent()).toBe(`${m.nights} n`);
    }
    expect(await page.locator('.site-months tbody tr').count()).toBe(12);
    expect(await page.locator('.site-view').textContent()).not.toMatch(/NaN|undefined|null/);
    // The joint seeing × airmass table shows the API's cells, an instrument per table.
    const joint = stats.precision.filter((p) =>
      p.bySeeingAndAirmass.some((r) => r.byAirmass.some((c) => c.n > 0)),
    );
    expect(joint.length).toBeGreaterThan(0); // the demo's site has measurements with seeing logged
    expect(await page.locator('.joint-precision').count()).toBe(joint.length);
    expect(
      await page.locator('.joint-precision').first().locator('tbody td').allTextContents(),
    ).toEqual(
      joint[0]!.bySeeingAndAirmass.flatMap((r) =>
        r.byAirmass.map((c) =>
          c.n > 0 && c.medianSigma !== null ? `${c.medianSigma.toFixed(2)} (${c.n})` : '—',
        ),
      ),
    );
    expect(await page.locator('.site-summary').textContent()).toContain(
      `${stats.year.nights} night reports`,
    );
    await page.locator('#site-months').screenshot({ path: join(SCREENSHOTS, 'site-months.png') });

    // A lead sets January to 0.95 clear; the stored prior and the tile follow.
    const jan = page.locator('input[name="clear-1"]');
    await jan.fill('0.95');
    await page.locator('.prior-form button[type=submit]').click();
    await page.waitForFunction(
      () =>
        document.querySelector('input[name="clear-1"]') &&
        !document.querySelector('.prior-form button[disabled]'),
    );
    const after = await api<Stats>(`/sites/${site.id}/statistics`);
    await page
      .locator('.month-ribbon [data-month="1"] .pct', {
        hasText: (100 * after.months[0]!.clearProbability).toFixed(0),
      })
      .waitFor();
    expect(after.priors[0]!.clearFraction).toBe(0.95);
    // A bad value is refused in words tied to its month, and nothing changes. With January left
    // empty, March is the second month sent ("months.1" to the server).
    await jan.fill('');
    await page.locator('input[name="clear-3"]').fill('1.5');
    await page.locator('.prior-form button[type=submit]').click();
    await page.locator('.prior-form .error-line').first().waitFor();
    const refusal = await page.locator('.prior-form .error-line').first().textContent();
    expect(refusal).toMatch(/^March, clear fraction: 1\.5 must be at most 1/);
    expect(refusal).not.toMatch(/months|clearFraction|\.\d\./);
    expect((await api<Stats>(`/sites/${site.id}/statistics`)).priors[0]!.clearFraction).toBe(0.95);
    expect(errors.filter((e) => !/422|400/.test(e))).toEqual([]);
    await page.close();
  });
});
