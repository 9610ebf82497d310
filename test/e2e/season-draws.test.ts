/**
 * The season draws in the season view against the real server and the demo (invented log and
 * priors): a weather-aware proposal drawn 200 times shows, per target, the bands and percentiles
 * that POST /campaigns/{id}/season-plan/draws gives for the same request. Waits on state, never on time.
 */
import { join } from 'node:path';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

interface Draws {
  draws: {
    targets: {
      target: string;
      periapsisSigmaDays: { percentiles: { value: number }[] } | null;
    }[];
  };
}

describe('season draws in the season view', () => {
  test('a weather-aware plan drawn 200 times shows the API’s percentiles', {
    timeout: 300_000,
  }, async () => {
    const { page, errors } = await open('/season');
    await page.locator('#season-plan select[name="weather"]').selectOption('aware');
    await page.getByRole('button', { name: 'Propose a season plan' }).click();
    const proposed = page.locator('.season-draws form, #season-plan .error-line');
    await proposed.first().waitFor({ timeout: 150_000 });
    expect(await page.locator('#season-plan .error-line').allInnerTexts()).toEqual([]);
    const startDate = await page.locator('#season-plan input[name="startDate"]').inputValue();
    const endDate = await page.locator('#season-plan input[name="endDate"]').inputValue();
    await page.locator('.season-draws input[name="draws"]').fill('200');
    await page.getByRole('button', { name: 'Draw this season under the learned weather' }).click();
    // A weather-aware plan, then 200 draws on a job-pool thread: minutes on a crowded machine,
    // within the pool's 120 s job limit each.
    const shown = page.locator('.draws-table tbody[data-target], .season-draws .error-line');
    await shown.first().waitFor({ timeout: 150_000 });
    // A refusal fails here with its words, not as a wait that runs out.
    expect(await page.locator('.season-draws .error-line').allInnerTexts()).toEqual([]);
    const campaign = (await api<{ items: { id: number }[] }>('/campaigns?limit=500')).items[0]!;
    const answer = await api<Draws>(`/campaigns/${campaign.id}/season-plan/draws`, {
      method: 'POST',
      body: { startDate, endDate, nights: 'allocated', weather: 'aware', draws: 200, seed: 1 },
    });
    const withPassage = answer.draws.targets.filter((t) => t.periapsisSigmaDays);
    expect(withPassage.length).toBeGreaterThan(0);
    for (const t of withPassage) {
      const row = page.locator(`.draws-table tbody[data-target="${t.target}"] tr.draw-row`).first();
      const cells = await row.locator('td.num').allTextContents();
      const median = t.periapsisSigmaDays!.percentiles[2]!.value * 24; // hours, as the view shows it
      expect(Math.abs(Number(cells[2]) - median)).toBeLessThanOrEqual(
        Math.max(0.01, median * 0.01),
      );
    }
    expect(await page.locator('.season-draws').textContent()).not.toMatch(/NaN|undefined|null/);
    await page.locator('.season-draws').screenshot({ path: join(SCREENSHOTS, 'season-draws.png') });
    expect(errors).toEqual([]);
    await page.close();
  });
});
