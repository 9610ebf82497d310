/**
 * Re-plan after a lost night in the report view, against the real server and the demo (invented
 * log with lost nights): the preview shows the epoch count the API's preview gives, and accepting
 * stores that many blocks. Waits on state, never on time.
 */
import { join } from 'node:path';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

describe('re-plan after a lost night', () => {
  test('preview from the report view, then accept', async () => {
    const reports = (
      await api<{ items: { nightId: number; timeLostHours: number }[] }>('/night-reports?limit=500')
    ).items;
    const lost = reports.find((r) => r.timeLostHours > 0)!; // the demo's lost nights (invented)
    const expected = await api<{ preview: { plan: { epochs: unknown[] } } }>(
      `/nights/${lost.nightId}/replan`,
      { method: 'POST', body: {} },
    );
    const { page, errors } = await open(`/nights/${lost.nightId}/report`);
    await page.getByRole('button', { name: 'Re-plan the rest of the season' }).click();
    const summary = page.locator('.replan-preview p').first();
    await summary.waitFor();
    expect(await summary.textContent()).toContain(`${expected.preview.plan.epochs.length} epochs`);
    await page.locator('#replan').screenshot({ path: join(SCREENSHOTS, 'replan.png') });
    await page.getByRole('button', { name: 'Accept the re-plan' }).click();
    const done = page.locator('#replan .notice');
    await done.waitFor();
    expect(await done.textContent()).toContain(
      `${expected.preview.plan.epochs.length} blocks written`,
    );
    expect(errors).toEqual([]);
    await page.close();
  });
});
