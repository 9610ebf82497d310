/**
 * The site page against the real server and the demo (invented log and priors): the month tiles
 * and table say what GET /sites/{id}/statistics says, and a lead's new prior, typed or from a CSV
 * file, is stored and drawn.
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
        r.byAirmass.map(
          (c) => (c.n > 0 && c.medianSigma !== null ? `${c.medianSigma.toFixed(2)} (${c.n})` : '–'), // a dash titled with its reason (no measurement in the bin)
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

    // A prior from a CSV file replaces the whole prior; the month fields and tiles follow.
    await page.locator('.prior-csv-form input[name="prior-file"]').setInputFiles({
      name: 'prior.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('month,clear_fraction,strength_nights\n6,0.35,12\n7,0.45\n'),
    });
    await page.waitForFunction(() =>
      document
        .querySelector<HTMLTextAreaElement>('.prior-csv-form textarea')
        ?.value.includes('6,0.35,12'),
    );
    await page.locator('.prior-csv-form input[name="prior-csv-strength"]').fill('5');
    await page.locator('.prior-csv-form button[type=submit]').click();
    await page.waitForFunction(
      () =>
        (document.querySelector('input[name="clear-6"]') as HTMLInputElement | null)?.value ===
        '0.35',
    );
    const fromCsv = await api<Stats>(`/sites/${site.id}/statistics`);
    expect(fromCsv.priors[5]).toEqual({ month: 6, clearFraction: 0.35, strengthNights: 12 });
    expect(fromCsv.priors[6]).toEqual({ month: 7, clearFraction: 0.45, strengthNights: 5 });
    expect(fromCsv.priors.filter((p) => p !== null)).toHaveLength(2); // January's 0.95 is gone
    expect(await page.locator('input[name="clear-1"]').inputValue()).toBe('');
    await page
      .locator('.month-ribbon [data-month="6"] .pct', {
        hasText: (100 * fromCsv.months[5]!.clearProbability).toFixed(0),
      })
      .waitFor();
    // A bad row is refused by its line and column in the file's own words; nothing changes.
    await page.locator('.prior-csv-form textarea').fill('month,clear_fraction\n6,0.3\n8,1.4\n');
    await page.locator('.prior-csv-form button[type=submit]').click();
    const csvRefusal = page.locator('.prior-csv-form .error-line');
    await csvRefusal.waitFor();
    expect(await csvRefusal.textContent()).toMatch(
      /line 3 clear_fraction: 1\.4 must lie in \[0, 1\]/,
    );
    expect((await api<Stats>(`/sites/${site.id}/statistics`)).priors).toEqual(fromCsv.priors);
    expect(errors.filter((e) => !/422|400/.test(e))).toEqual([]);
    await page.close();
  });
});
