/**
 * The season chart in chromium against the real server and the demo campaign: each strip's
 * cells at the nights the season API gives, one strip for the stars of one sky position with a
 * track each, every periapsis ± 1σ span and planned night where the events and blocks APIs put
 * them, within one screen pixel at the test's width. A solution with a covariance is added to one
 * star for the test (and the star's own solution made current again after it), so a σ span is
 * drawn whatever the demo carries. Screenshots go to test-output/e2e/ for review.
 */
import { join } from 'node:path';
import { DateTime } from 'luxon';
import type { Locator, Page } from 'playwright-core';
import { describe, expect, inject, test } from 'vitest';
import type { OrbitEvent, SolutionRow } from '../../client/src/api/client.ts';
import { SEASON_MARGIN } from '../../client/src/plots/season-grid.ts';
import { svgEdges, svgLineX } from './svg-geometry.ts';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, TEST_NOW, apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const WIDTH = 1100; // the chart's viewBox width (client/src/plots/season-chart.tsx default)
const DAY = 86_400_000;
const open = chartPages();

interface Campaign {
  id: number;
  siteIds: number[];
  targetIds: number[];
  startDate: string;
  endDate: string;
}

/** Nights (local evenings) in a year. */
const nightsIn = (y: number) => (Date.UTC(y + 1, 0, 1) - Date.UTC(y, 0, 1)) / DAY;

describe('the season chart', () => {
  test('cells, periapsis ± σ spans and planned nights sit within 1 px of the APIs’ dates', async () => {
    const campaign = (await api<{ items: Campaign[] }>('/campaigns?limit=500')).items[0]!;
    // The year the season view opens on (its default for the first campaign at TEST_NOW).
    const { page, errors } = await open('/season');
    const yearInput = page.locator('.view-head input[type=number]');
    await yearInput.waitFor();
    const year = Number(await yearInput.inputValue());
    const targets = (await api<{ items: { id: number; name: string }[] }>('/targets?limit=500'))
      .items;
    const events = async (id: number) =>
      (
        await api<{ events: OrbitEvent[] }>(
          `/targets/${id}/events?kinds=periapsis&start=${year - 1}-07-01&end=${year + 1}-07-01`,
        )
      ).events;
    // A star of the campaign (one with no periapsis near the year, if any) gets one at J{year}.6 ± 10 d (invented for the check).
    let quiet = campaign.targetIds[campaign.targetIds.length - 1]!;
    for (const id of campaign.targetIds) if ((await events(id)).length === 0) quiet = id;
    const own = (
      await api<{ items: SolutionRow[] }>(`/orbit-solutions?targetId=${quiet}`)
    ).items.find((s) => s.current)!;
    const added = await api<SolutionRow>('/orbit-solutions', {
      method: 'POST',
      body: {
        targetId: quiet,
        orbit: {
          ...own.orbit,
          elements: { ...own.orbit.elements, periapsis: `J${year}.6` },
          covariance: { parameters: ['periapsisDays'], matrix: [[100]] },
        },
        reference: 'browser test of the season chart (invented)',
      },
    });
    try {
      await page.reload(); // with the added solution
      const siteId = campaign.siteIds[0]!;
      const chart = page.locator(`#season-site-${siteId} svg.season-chart`);
      await chart.locator('.season-row').first().waitFor();
      await checkChart(page, chart, campaign, siteId, year, targets, events);
      await page
        .locator(`#season-site-${siteId}`)
        .screenshot({ path: join(SCREENSHOTS, 'season-chart.png') });
      await page.screenshot({ path: join(SCREENSHOTS, 'season-chart-page.png'), fullPage: true });
      // The year of TEST_NOW carries a mark for today at its instant.
      const nowYear = new Date(TEST_NOW).getUTCFullYear();
      if (nowYear !== year) {
        await yearInput.fill(String(nowYear));
        await yearInput.press('Tab'); // the year takes effect on change
      }
      const mark = page.locator(`#season-site-${siteId} svg.season-chart .now-mark`);
      await mark.waitFor();
      const at = Number(await mark.getAttribute('data-ms'));
      expect(Math.abs(at - Date.parse(TEST_NOW))).toBeLessThan(120_000); // the browser's clock runs on from TEST_NOW
      const site = (
        await api<{ items: { id: number; timeZone: string }[] }>('/sites?limit=500')
      ).items.find((x) => x.id === siteId)!;
      const box = (await page.locator(`#season-site-${siteId} svg.season-chart`).boundingBox())!;
      const noon0 = DateTime.fromISO(`${nowYear}-01-01T12:00:00`, {
        zone: site.timeZone,
      }).toMillis();
      const k = box.width / WIDTH;
      const expected =
        box.x +
        k *
          (SEASON_MARGIN.left +
            ((at - noon0) / DAY / nightsIn(nowYear)) *
              (WIDTH - SEASON_MARGIN.right - SEASON_MARGIN.left));
      const lineX = await svgLineX(mark.locator('line'));
      expect(Math.abs(lineX - expected)).toBeLessThanOrEqual(1);
      expect(errors).toEqual([]);
      await page.close();
    } finally {
      await api(`/orbit-solutions/${own.id}/current`, { method: 'POST' });
      await api(`/orbit-solutions/${added.id}`, { method: 'DELETE' });
    }
  });
});

async function checkChart(
  page: Page,
  chart: Locator,
  campaign: Campaign,
  siteId: number,
  year: number,
  targets: { id: number; name: string }[],
  events: (id: number) => Promise<OrbitEvent[]>,
) {
  const site = (
    await api<{ items: { id: number; timeZone: string }[] }>('/sites?limit=500')
  ).items.find((s) => s.id === siteId)!;
  const box = (await chart.boundingBox())!;
  const k = box.width / WIDTH;
  const left = SEASON_MARGIN.left;
  const right = WIDTH - SEASON_MARGIN.right;
  // Night i runs from local noon of its date (the sky engine's nights).
  const noon0 = DateTime.fromISO(`${year}-01-01T12:00:00`, { zone: site.timeZone }).toMillis();
  const xNight = (i: number) => box.x + k * (left + (i / nightsIn(year)) * (right - left));
  const xAt = (ms: number) => xNight((ms - noon0) / DAY);
  const nightOf = (date: string) =>
    Math.round((Date.parse(`${date}T00:00:00Z`) - Date.UTC(year, 0, 1)) / DAY);
  let checked = 0;

  // Strips: the stars sharing a strip have the same nightly hours; every cell spans its nights.
  const rows = chart.locator('.season-row');
  const groups = await rows.evaluateAll((rs) =>
    rs.map((r) => r.getAttribute('data-targets')!.split('|')),
  );
  expect(groups.flat().length).toBe(campaign.targetIds.length);
  expect(groups.some((g) => g.length > 1)).toBe(true); // the demo's four stars of one system (invented demo)
  for (const [g, names] of groups.entries()) {
    const cells = rows.nth(g).locator('.target-strip .hours-cell');
    const n = await cells.count();
    for (const j of [0, Math.floor(n / 2), n - 1].filter(
      (v, i, a) => v >= 0 && a.indexOf(v) === i,
    )) {
      const cell = cells.nth(j);
      const first = Number(await cell.getAttribute('data-first'));
      const last = Number(await cell.getAttribute('data-last'));
      const [l, r] = await svgEdges(cell);
      expect(Math.abs(l - xNight(first))).toBeLessThanOrEqual(1);
      expect(Math.abs(r - xNight(last + 1))).toBeLessThanOrEqual(1);
      checked += 2;
    }
    // Each member's periapsis ± σ and planned nights.
    for (const name of names) {
      const t = targets.find((x) => x.name === name)!;
      const track = rows.nth(g).locator(`.member-track[data-target="${name}"]`);
      for (const e of (await events(t.id)).filter((ev) => ev.epoch.startsWith(String(year)))) {
        const span = track.locator(`.periapsis-span[data-epoch="${e.epoch}"]`);
        const [l, r] = await svgEdges(span.locator('rect'));
        const t0 = Date.parse(e.epoch);
        const s = (e.sigmaDays ?? 0) * DAY;
        expect(Math.abs(l - xAt(t0 - s))).toBeLessThanOrEqual(1);
        if (e.sigmaDays !== undefined) expect(Math.abs(r - xAt(t0 + s))).toBeLessThanOrEqual(1);
        const at = await svgLineX(span.locator('line'));
        expect(Math.abs(at - xAt(t0))).toBeLessThanOrEqual(1);
        checked += 3;
      }
      const marks = await track
        .locator('.planned-mark')
        .evaluateAll((ms) => ms.map((m) => m.getAttribute('data-date')!));
      for (const d of marks.slice(0, 3)) {
        const [l, r] = await svgEdges(track.locator(`.planned-mark[data-date="${d}"]`));
        expect(
          Math.abs((l + r) / 2 - (xNight(nightOf(d)) + xNight(nightOf(d) + 1)) / 2),
        ).toBeLessThanOrEqual(1);
        checked++;
      }
    }
  }
  // The σ span added above is drawn, 20 days wide.
  const sigmas = await chart
    .locator('.periapsis-span')
    .evaluateAll((ss) => ss.map((x) => Number(x.getAttribute('data-sigma-days') || 'NaN')));
  const at10 = sigmas.findIndex((v) => Math.abs(v - 10) < 0.01); // σ² = 100 d² on periapsisDays
  expect(at10).toBeGreaterThanOrEqual(0);
  const [l, r] = await svgEdges(chart.locator('.periapsis-span rect').nth(at10));
  expect(Math.abs(r - l - (xAt(20 * DAY) - xAt(0)))).toBeLessThanOrEqual(1);
  await expect(chart.locator('.periapsis-label').allTextContents()).resolves.toEqual(
    expect.arrayContaining([expect.stringContaining('± 10.0 d')]),
  );
  console.log(
    `season ${year} at site ${siteId}: ${checked} edges within 1 px at ${box.width.toFixed(0)} px wide`,
  );
  expect(page.url()).toContain('/season');
}
