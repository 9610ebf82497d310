/**
 * The relativity goal in the season view against the real server and the demo (invented): a plan
 * proposed without the goal and then with it shows, for the demo's deepest star, the forecast after
 * each plan that POST /campaigns/{id}/season-plan gives for the same request, and the two differ.
 * Waits on state, never on time.
 */
import { join } from 'node:path';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { HEADLINE, SCREENSHOTS, apiCaller, nearPeriapsis } from './harness.ts';
import { factorSigmaText } from '../../client/src/lib/numbers.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

interface Preview {
  plan: {
    targets: {
      target: string;
      relativity: {
        summary: string[];
        factors: { name: string; sigmaAfter: number | null }[];
      } | null;
    }[];
  };
}

/** The shown 1σ after the plan, per factor, as the table prints it (3 decimals). */
const shown = (p: Preview) =>
  p.plan.targets
    .find((t) => t.target === HEADLINE)!
    .relativity!.factors.map((f) =>
      f.sigmaAfter === null ? 'not determined' : factorSigmaText(f.sigmaAfter),
    );

describe('the relativity goal in the season view', () => {
  test('setting it shows the forecast after the plan the API gives with it', async () => {
    // Three weeks around the deepest star's passage, every night of them, each counted clear: the
    // goal moves epochs within the nights towards the moments that tell the precession most.
    const range = {
      startDate: nearPeriapsis(-10),
      endDate: nearPeriapsis(10),
      nights: 'all',
      weather: 'blind',
    };
    const campaign = (await api<{ items: { id: number }[] }>('/campaigns?limit=500')).items[0]!;
    const ask = (relativityGoal: boolean) =>
      api<Preview>(`/campaigns/${campaign.id}/season-plan`, {
        method: 'POST',
        body: { ...range, relativityGoal },
      });
    const [plain, goal] = [await ask(false), await ask(true)];
    console.log(
      `deepest star's 1σ after the plan: ${shown(plain)} without the goal, ${shown(goal)} with it`,
    );
    expect(shown(goal)).not.toEqual(shown(plain)); // the goal changes the plan's forecast

    const { page, errors } = await open('/season');
    const form = page.locator('#season-plan form');
    await form.locator('input[name="startDate"]').fill(range.startDate);
    await form.locator('input[name="endDate"]').fill(range.endDate);
    await form.locator('select[name="nights"]').selectOption('all');
    await form.locator('select[name="weather"]').selectOption('blind');
    const box = form.locator('input[name="relativityGoal"]');
    expect(await box.isChecked()).toBe(false); // the campaign's own setting: off
    const star = (goal: boolean) =>
      page.locator(`.plan-relativity[data-goal="${goal}"] [data-target="${HEADLINE}"]`);
    const cells = (goal: boolean) => star(goal).locator('.forecast-table td.sigma-after');
    const propose = page.getByRole('button', { name: 'Propose a season plan' });

    await propose.click();
    await cells(false).first().waitFor();
    expect(await cells(false).allTextContents()).toEqual(shown(plain));
    expect(await star(false).locator('.forecast-summary li').allTextContents()).toEqual(
      plain.plan.targets.find((t) => t.target === HEADLINE)!.relativity!.summary,
    );

    await box.check();
    await propose.click();
    await cells(true).first().waitFor();
    expect(await cells(true).allTextContents()).toEqual(shown(goal));
    expect(await star(true).locator('.forecast-summary li').allTextContents()).toEqual(
      goal.plan.targets.find((t) => t.target === HEADLINE)!.relativity!.summary,
    );
    expect(await page.locator('.plan-relativity').textContent()).not.toMatch(/NaN|undefined|null/);
    await page
      .locator('.plan-relativity')
      .screenshot({ path: join(SCREENSHOTS, 'season-relativity-goal.png') });
    expect(errors).toEqual([]);
    await page.close();
  });
});
