/**
 * A double-lined binary in the client, in chromium against the real server: the velocity panel's
 * choice of body (both, primary, secondary, relative) draws that body's measurements with their
 * residuals against that body's prediction, and the ephemeris table shows both bodies; every
 * shown number is checked against the API's own answer for the stored solution.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { apiCaller, launchBrowser, newContext } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

interface Measurement {
  id: number;
  epoch: string;
  kind: string;
  component: string;
  radialVelocityKmS: number | null;
  sigmaRadialVelocityKmS: number | null;
}
interface Prediction {
  epoch: string;
  primaryRadialVelocityKmS: number | null;
  secondaryRadialVelocityKmS: number | null;
}

/** The tooltips of the drawn velocity measurements. */
const tooltips = (page: Page) => page.locator('#rv .rv-measurement title').allTextContents();

/** What each tooltip should say for these measurements, from the API's predictions (sorted). */
function expected(ms: Measurement[], at: Map<number, Prediction>): string[] {
  return ms
    .map((m) => {
      const p = at.get(m.id)!;
      const model =
        m.component === 'primary' ? p.primaryRadialVelocityKmS! : p.secondaryRadialVelocityKmS!;
      return `${m.component} ${m.radialVelocityKmS!.toFixed(1)} ± ${m.sigmaRadialVelocityKmS!.toFixed(1)} km/s, residual ${(m.radialVelocityKmS! - model).toFixed(1)} km/s`;
    })
    .sort();
}
/** A tooltip without its date: "primary 12.3 ± 0.6 km/s, residual 0.4 km/s". */
const strip = (t: string) => t.replace(/^[^:]*: /, '');

describe('a double-lined binary in the client', () => {
  test('the body chosen shows its measurements and residuals as the API predicts them', async () => {
    const targets = (await api<{ items: { id: number; name: string }[] }>('/targets')).items;
    const binary = targets.find((t) => t.name === 'Brindle B')!;
    const sols = (
      await api<{ items: { current: boolean; orbit: Record<string, unknown> }[] }>(
        `/orbit-solutions?targetId=${binary.id}`,
      )
    ).items;
    const orbit = sols.find((s) => s.current)!.orbit;
    expect(orbit.massRatio).toBeGreaterThan(0); // the fit stored its q
    const ms = (
      await api<{ items: Measurement[] }>(`/measurements?targetId=${binary.id}&limit=500`)
    ).items.filter((m) => m.kind === 'radial-velocity');
    const primary = ms.filter((m) => m.component === 'primary');
    const secondary = ms.filter((m) => m.component === 'secondary');
    expect([primary.length, secondary.length]).toEqual([16, 16]);
    const preds = (
      await api<{ predictions: Prediction[] }>('/ephemeris', {
        method: 'POST',
        body: { orbit, epochs: ms.map((m) => m.epoch) },
      })
    ).predictions;
    const at = new Map(ms.map((m, i) => [m.id, preds[i]!]));

    const ctx = await newContext(browser, { viewport: { width: 1280, height: 1000 } });
    const page = await ctx.newPage();
    await page.goto(`${base}/targets/${binary.id}?token=${lead}`);
    const choice = page.locator('#rv select[name="rv-body"]');
    await choice.waitFor();
    await expect(choice.inputValue()).resolves.toBe('both');
    await expect
      .poll(async () => (await tooltips(page)).map(strip).sort(), { timeout: 30_000 })
      .toEqual(expected(ms, at));

    await choice.selectOption('primary');
    await expect
      .poll(async () => (await tooltips(page)).map(strip).sort(), { timeout: 30_000 })
      .toEqual(expected(primary, at));
    await choice.selectOption('secondary');
    await expect
      .poll(async () => (await tooltips(page)).map(strip).sort(), { timeout: 30_000 })
      .toEqual(expected(secondary, at));
    // The relative orbit has no velocities of its own here: none drawn, and the legend says why.
    await choice.selectOption('relative');
    await expect.poll(async () => (await tooltips(page)).length).toBe(0);
    await expect(page.locator('#rv .legend').textContent()).resolves.toContain(
      '32 velocities of another body not drawn',
    );

    // No relativity forecast for a Newtonian binary: a plain sentence, not a refusal.
    await expect(page.locator('#forecast').textContent()).resolves.toContain(
      'No forecast: this solution is a binary of comparable masses',
    );

    // The ephemeris table's two bodies, as the stored target's ephemeris gives them.
    const start = await page.locator('#ephemeris input[type="date"]').first().inputValue();
    const end = await page.locator('#ephemeris input[type="date"]').nth(1).inputValue();
    const table = (
      await api<{ predictions: Prediction[] }>(
        `/targets/${binary.id}/ephemeris?start=${start}T00:00:00Z&end=${end}T00:00:00Z&step=P30D`,
      )
    ).predictions;
    const cells = page.locator('#ephemeris td.rv-primary');
    await expect.poll(() => cells.count(), { timeout: 30_000 }).toBe(table.length);
    expect(await cells.allTextContents()).toEqual(
      table.map((p) => p.primaryRadialVelocityKmS!.toFixed(2)),
    );
    expect(await page.locator('#ephemeris td.rv-secondary').allTextContents()).toEqual(
      table.map((p) => p.secondaryRadialVelocityKmS!.toFixed(2)),
    );
    await ctx.close();
  });
});
