/**
 * The night chart in chromium against the real server and the demo campaign: every lane, limit,
 * block, darkness span and window drawn where the visibility API the view reads says, each edge
 * within one screen pixel of its computed time at the test's width; one lane for the four stars
 * of one system; the now mark; the UTC clock; the text twin; the altitude detail. Screenshots go
 * to test-output/e2e/ for review.
 */
import { join } from 'node:path';
import { createClient } from '@libsql/client';
import { DateTime } from 'luxon';
import type { Page } from 'playwright-core';
import { describe, expect, inject, test } from 'vitest';
import type { BlockRow, Visibility } from '../../client/src/api/client.ts';
import { NIGHT_MARGIN } from '../../client/src/plots/night-layout.ts';
import { svgEdges, svgLineX } from './svg-geometry.ts';
import { chartPages } from './chart-page.ts';
import { SCREENSHOTS, TEST_NOW, apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const WIDTH = 1100; // the chart's viewBox width (client/src/plots/night-chart.tsx default)
const LIMITS = ['darkness', 'altitude', 'horizon-mask', 'sun-distance', 'moon', 'night-edge'];
const open = chartPages();

/**
 * Screen x of an instant, computed here from the API's times: the chart spans sunset − 30 min to
 * sunrise + 30 min between its left and right margins, scaled to the drawn width.
 */
async function screenX(page: Page, vis: Visibility) {
  const box = (await page.locator('svg.night-chart').boundingBox())!;
  const t0 = Date.parse(vis.sun.set!.utc) - 1_800_000;
  const t1 = Date.parse(vis.sun.rise!.utc) + 1_800_000;
  const k = box.width / WIDTH;
  const left = NIGHT_MARGIN.left;
  const right = WIDTH - NIGHT_MARGIN.right;
  return (ms: number) => box.x + k * (left + ((ms - t0) / (t1 - t0)) * (right - left));
}

/**
 * A demo night ahead with the Vesper Core stars, one window and one block: ahead, because only a night that has
 * not ended can be scheduled (a night that has ended is recorded instead).
 */
async function nightWithWindows(): Promise<{ id: number; vis: Visibility; blocks: BlockRow[] }> {
  const nights = (
    await api<{ items: { id: number; siteId: number; date: string }[] }>(
      `/nights?start=${TEST_NOW.slice(0, 10)}&limit=500`,
    )
  ).items;
  for (const n of nights.slice(0, 60)) {
    const vis = await api<Visibility>(`/nights/${n.id}/visibility?curves=true`);
    const blocks = (await api<{ items: BlockRow[] }>(`/blocks?nightId=${n.id}`)).items;
    const vesper = vis.targets.filter((t) => t.name.includes('Vesper Core'));
    if (blocks.length && vesper.length > 1 && vesper.some((t) => t.windows.length))
      return { id: n.id, vis, blocks };
  }
  throw new Error('no demo night with a window and a block');
}

/** A new night of a campaign, on a free date of its first site, and a demo target outside that campaign. */
async function strayNight(): Promise<{ night: { id: number }; outsider: number }> {
  const campaigns = (
    await api<{ items: { id: number; siteIds: number[]; targetIds: number[] }[] }>(
      '/campaigns?limit=500',
    )
  ).items;
  const host = campaigns.find((c) =>
    campaigns.some((o) => o.targetIds.some((t) => !c.targetIds.includes(t))),
  )!;
  const outsider = campaigns.flatMap((c) => c.targetIds).find((t) => !host.targetIds.includes(t))!;
  const taken = new Set(
    (await api<{ items: { siteId: number; date: string }[] }>('/nights?limit=500')).items
      .filter((n) => n.siteId === host.siteIds[0])
      .map((n) => n.date),
  );
  let date = '2027-01-10';
  while (taken.has(date)) date = new Date(Date.parse(date) + 86_400_000).toISOString().slice(0, 10);
  const night = await api<{ id: number }>('/nights', {
    method: 'POST',
    body: { siteId: host.siteIds[0], campaignId: host.id, date },
  });
  return { night, outsider };
}

describe('the night chart', () => {
  test('windows, closed stretches, darkness and blocks sit within 1 px of the computed times', async () => {
    const { id, vis, blocks } = await nightWithWindows();
    const { page, errors } = await open(`/nights/${id}`);
    await page.locator('svg.night-chart .target-lane').first().waitFor();
    const x = await screenX(page, vis);
    const px = (await page.locator('svg.night-chart').boundingBox())!.width / WIDTH;
    let checked = 0;

    // The demo's four Vesper Core stars sit within 1″ of each other: one lane for all of them (invented demo).
    const lanes = page.locator('svg.night-chart .target-lane');
    const laneTargets = await lanes.evaluateAll((ls) =>
      ls.map((l) => l.getAttribute('data-targets')!.split('|')),
    );
    expect(laneTargets.flat().sort()).toEqual(vis.targets.map((t) => t.name).sort());
    const vesper = laneTargets.find((l) => l.some((n) => n.includes('Vesper Core')))!;
    expect(vesper.length).toBe(vis.targets.filter((t) => t.name.includes('Vesper Core')).length);
    expect(vesper.length).toBeGreaterThan(1);

    for (const [i, names] of laneTargets.entries()) {
      const lane = lanes.nth(i);
      const t = vis.targets.find((v) => v.name === names[0])!;
      const open = lane.locator('.open-span');
      expect(await open.count()).toBe(t.windows.length);
      for (const [k, w] of t.windows.entries()) {
        const [l, r] = await svgEdges(open.nth(k));
        expect(Math.abs(l - x(Date.parse(w.start.utc)))).toBeLessThanOrEqual(1);
        expect(Math.abs(r - x(Date.parse(w.end.utc)))).toBeLessThanOrEqual(1);
        checked += 2;
      }
      // Closed and open stretches tile the plot; each closed one names a limit the API knows.
      const spans = await lane.locator('.open-span, .closed-span .hit').evaluateAll((els) =>
        els.map((e) => {
          const g = e as SVGGraphicsElement;
          const b = g.getBBox();
          const m = g.getScreenCTM()!;
          return [m.a * b.x + m.e, m.a * (b.x + b.width) + m.e] as [number, number];
        }),
      );
      spans.sort((a, b) => a[0] - b[0]);
      const plotLeft = x(Date.parse(vis.sun.set!.utc) - 1_800_000);
      const plotRight = x(Date.parse(vis.sun.rise!.utc) + 1_800_000);
      expect(Math.abs(spans[0]![0] - plotLeft)).toBeLessThanOrEqual(1);
      expect(Math.abs(spans[spans.length - 1]![1] - plotRight)).toBeLessThanOrEqual(1);
      for (let k = 1; k < spans.length; k++)
        expect(Math.abs(spans[k]![0] - spans[k - 1]![1])).toBeLessThanOrEqual(1);
      const limits = await lane
        .locator('.closed-span')
        .evaluateAll((els) => els.map((e) => e.getAttribute('data-limit')!));
      for (const l of limits) expect(LIMITS).toContain(l);
      // Where a window opens, the stretch before it is closed by the limit the API names.
      for (const w of t.windows) {
        const before = await lane
          .locator('.closed-span')
          .evaluateAll(
            (els, at) =>
              els
                .filter((e) => Math.abs(Number(e.getAttribute('data-end-ms')) - at) < 1)
                .map((e) => e.getAttribute('data-limit')),
            Date.parse(w.start.utc),
          );
        if (Date.parse(w.start.utc) > Date.parse(vis.sun.set!.utc))
          expect(before).toEqual([w.opensBy]);
      }
    }

    // The altitude limit is named with its value on hover.
    const low = page.locator('svg.night-chart .closed-span[data-limit=altitude] title').first();
    await expect(low.textContent()).resolves.toContain(
      `${vis.limits.altitudeLimitDeg.toFixed(1)}°`,
    );

    // Darkness: each interval's span.
    const dark = page.locator('svg.night-chart .dark-span');
    expect(await dark.count()).toBe(vis.darkness.intervals.length);
    for (const [k, d] of vis.darkness.intervals.entries()) {
      const [l, r] = await svgEdges(dark.nth(k));
      expect(Math.abs(l - x(Date.parse(d.start.utc)))).toBeLessThanOrEqual(1);
      expect(Math.abs(r - x(Date.parse(d.end.utc)))).toBeLessThanOrEqual(1);
      checked += 2;
    }

    // Blocks: in their target's lane, edge to edge.
    const names = new Map(
      (await api<{ items: { id: number; name: string }[] }>('/targets?limit=500')).items.map(
        (t) => [t.id, t.name],
      ),
    );
    for (const b of blocks) {
      const laneIndex = laneTargets.findIndex((l) =>
        l.some((n) => n.startsWith(`${names.get(b.targetId)} (`)),
      );
      const bar = lanes.nth(laneIndex).locator(`.block-bar[data-block="${b.id}"]`);
      const [l, r] = await svgEdges(bar);
      expect(Math.abs(l - x(Date.parse(b.startUtc)))).toBeLessThanOrEqual(1);
      expect(Math.abs(r - x(Date.parse(b.endUtc)))).toBeLessThanOrEqual(1);
      checked += 2;
    }
    // A proposed schedule: each bar where the schedule answer the view received puts it.
    const [answer] = await Promise.all([
      page.waitForResponse(
        (r) => r.request().method() === 'POST' && r.url().endsWith(`/api/nights/${id}/schedule`),
      ),
      page.getByRole('button', { name: 'Propose a schedule' }).click(),
    ]);
    const proposal = (await answer.json()) as {
      schedule: { blocks: { id: string; start: { utc: string }; end: { utc: string } }[] };
    };
    await page.locator('svg.night-chart .proposed-track .block-bar').first().waitFor();
    for (const p of proposal.schedule.blocks) {
      const [l, r] = await svgEdges(
        page.locator(`svg.night-chart .block-bar[data-proposed="${p.id}"]`),
      );
      expect(Math.abs(l - x(Date.parse(p.start.utc)))).toBeLessThanOrEqual(1);
      expect(Math.abs(r - x(Date.parse(p.end.utc)))).toBeLessThanOrEqual(1);
      checked += 2;
    }
    console.log(`night ${id}: ${checked} edges within 1 px at ${(px * WIDTH).toFixed(0)} px wide`);

    // The Moon lane carries its illumination.
    await expect(page.locator('svg.night-chart .moon-lane').textContent()).resolves.toContain(
      `${Math.round(vis.moon.illuminatedFraction * 100)}% lit`,
    );
    // The text twin has a sentence per lane, with the first window's opening on both clocks.
    await expect(page.locator('#night-chart-text li').count()).resolves.toBe(laneTargets.length);
    const words = (await page.locator('#night-chart-text').textContent())!;
    expect(words).toContain(
      `below ${vis.limits.altitudeLimitDeg.toFixed(1)}°, the lowest altitude`,
    );
    const w0 = vis.targets.flatMap((t) => t.windows)[0]!;
    const utc = (iso: string) => iso.slice(11, 16);
    expect(words).toContain(`(${utc(w0.start.utc)} UTC)`);
    await page
      .locator('svg.night-chart')
      .screenshot({ path: join(SCREENSHOTS, 'night-chart.png') });

    // The altitude detail: the selected lane's windows, within 1 px on the same clock.
    const withWindow = laneTargets.findIndex(
      (l) => vis.targets.find((v) => v.name === l[0])!.windows.length > 0,
    );
    await page.locator('select[name=detail]').selectOption(String(withWindow));
    const t = vis.targets.find((v) => v.name === laneTargets[withWindow]![0])!;
    const col = page.locator('svg.night-detail .window-column');
    await col.first().waitFor();
    const [l] = await svgEdges(col.first());
    expect(Math.abs(l - x(Date.parse(t.windows[0]!.start.utc)))).toBeLessThanOrEqual(1);
    await page
      .locator('#night-chart')
      .screenshot({ path: join(SCREENSHOTS, 'night-chart-detail.png') });

    // The UTC clock: hour labels on whole UTC hours.
    await page.locator('#night-chart select[name=clock]').selectOption('utc');
    await page.locator('svg.night-chart .time-axis[data-zone=UTC]').waitFor();
    const tick = page.locator('svg.night-chart .time-axis text[data-ms]').first();
    const ms = Number(await tick.getAttribute('data-ms'));
    expect(new Date(ms).getUTCMinutes()).toBe(0);
    await expect(tick.textContent()).resolves.toBe(
      `${String(new Date(ms).getUTCHours()).padStart(2, '0')}h`,
    );
    expect(errors).toEqual([]);
    await page.close();
  });

  test('a block of a target outside the night’s campaign is refused, naming both; nothing is stored', async () => {
    const { night, outsider } = await strayNight();
    try {
      // The store refuses such a block (server/store/repos/block-rules.ts); the chart's separate
      // lane for one is left for rows stored before that rule (the next test).
      const vis = await api<Visibility>(`/nights/${night.id}/visibility?curves=true`);
      const start = Date.parse(vis.darkness.intervals[0]!.start.utc) + 3_600_000;
      const before = (await api<{ items: BlockRow[] }>(`/blocks?nightId=${night.id}`)).items;
      const refused = await api<BlockRow>('/blocks', {
        method: 'POST',
        body: {
          nightId: night.id,
          targetId: outsider,
          kind: 'astrometry',
          startUtc: new Date(start).toISOString(),
          endUtc: new Date(start + 2_400_000).toISOString(),
        },
      }).catch((e: unknown) => e);
      expect(String(refused)).toMatch(/422 .*"field":"targetId".*is not a target of campaign/);
      expect((await api<{ items: BlockRow[] }>(`/blocks?nightId=${night.id}`)).items).toEqual(
        before,
      );
    } finally {
      await api(`/nights/${night.id}`, { method: 'DELETE' });
    }
  });

  test('a stored block of a target outside the night’s campaign (an older database’s row) is drawn in a lane of its own', async () => {
    const { night, outsider } = await strayNight();
    // Written straight into the table, as a database from before the campaign-target rule holds it.
    const db = createClient({ url: inject('databaseUrl') });
    let blockId: number | undefined;
    try {
      const vis = await api<Visibility>(`/nights/${night.id}/visibility?curves=true`);
      const start = Date.parse(vis.darkness.intervals[0]!.start.utc) + 3_600_000;
      const end = start + 2_400_000;
      const at = new Date().toISOString();
      const row = await db.execute({
        sql: `INSERT INTO blocks (night_id, target_id, kind, start_utc, end_utc, created_at, updated_at)
              VALUES (?, ?, 'astrometry', ?, ?, ?, ?) RETURNING id`,
        args: [
          night.id,
          outsider,
          new Date(start).toISOString(),
          new Date(end).toISOString(),
          at,
          at,
        ],
      });
      blockId = Number(row.rows[0]!.id);
      const { page, errors } = await open(`/nights/${night.id}`);
      const bar = page.locator(`svg.night-chart .stray-lane .block-bar[data-block="${blockId}"]`);
      await bar.waitFor();
      // Its own lane, below the night's target lanes, named as such; not in any target's lane.
      await expect(
        page.locator('svg.night-chart .stray-lane .lane-name').textContent(),
      ).resolves.toBe('other targets');
      expect(
        await page
          .locator(`svg.night-chart .target-lane .block-bar[data-block="${blockId}"]`)
          .count(),
      ).toBe(0);
      const x = await screenX(page, vis);
      const [l, r] = await svgEdges(bar);
      expect(Math.abs(l - x(start))).toBeLessThanOrEqual(1);
      expect(Math.abs(r - x(end))).toBeLessThanOrEqual(1);
      await page
        .locator('svg.night-chart')
        .screenshot({ path: join(SCREENSHOTS, 'night-stray-lane.png') });
      expect(errors).toEqual([]);
      await page.close();
    } finally {
      if (blockId !== undefined)
        await db.execute({ sql: 'DELETE FROM blocks WHERE id = ?', args: [blockId] });
      db.close();
      await api(`/nights/${night.id}`, { method: 'DELETE' });
    }
  });

  test('the now mark stands at the clock’s instant on tonight’s chart', async () => {
    // A site where TEST_NOW falls before dawn (local hour under 6): the night of the local day before.
    const sites = (await api<{ items: { id: number; timeZone: string }[] }>('/sites?limit=500'))
      .items;
    const local = (zone: string) => DateTime.fromISO(TEST_NOW, { zone });
    const site = sites.find((s) => local(s.timeZone).hour < 6)!;
    expect(site).toBeDefined(); // the demo's Ostrel Summit keeps UTC−7: 05:00 there (invented demo site)
    const date = local(site.timeZone).minus({ days: 1 }).toISODate()!;
    const existing = (
      await api<{ items: { id: number; siteId: number; date: string }[] }>('/nights?limit=500')
    ).items.find((n) => n.siteId === site.id && n.date === date);
    const night =
      existing ??
      (await api<{ id: number }>('/nights', { method: 'POST', body: { siteId: site.id, date } }));
    try {
      const vis = await api<Visibility>(`/nights/${night.id}/visibility?curves=true`);
      const { page, errors } = await open(`/nights/${night.id}`);
      const mark = page.locator('svg.night-chart .now-mark');
      await mark.waitFor();
      const at = Number(await mark.getAttribute('data-ms'));
      expect(Math.abs(at - Date.parse(TEST_NOW))).toBeLessThan(120_000); // the browser's clock runs on from TEST_NOW
      const x = await screenX(page, vis);
      const lineX = await svgLineX(mark.locator('line'));
      expect(Math.abs(lineX - x(at))).toBeLessThanOrEqual(1);
      expect(errors).toEqual([]);
      await page.close();
    } finally {
      if (!existing) await api(`/nights/${night.id}`, { method: 'DELETE' });
    }
  });
});
