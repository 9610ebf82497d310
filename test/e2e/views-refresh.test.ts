/**
 * After a write, the views that depend on it change without a reload, in chromium against the
 * real server with the demo: the night report (its re-plan section, its stored version and its
 * measurements), a system's position edited in the sexagesimal form astronomers type, and the
 * chosen campaign carried to the time request. (Allocations: test/e2e/allocations.test.ts redraws
 * the calendar after each store; the season chart after accepting a plan: workflows.test.ts.)
 * Each test puts the demo back as it found it.
 */
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { apiCaller } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

interface Report {
  id: number;
  nightId: number;
  version: number;
  timeLostHours: number;
  timeLostReason: string;
  notes: string;
}

describe('views refresh after a write', () => {
  test('the report: saved lost time opens the re-plan, Discard returns to the saved version, a measurement is listed', async () => {
    const reports = (await api<{ items: Report[] }>('/night-reports?limit=500')).items;
    const blocksOf = async (nightId: number) =>
      (await api<{ items: { id: number }[] }>(`/blocks?nightId=${nightId}`)).items;
    // A demo night that lost no time and has blocks (invented log).
    let report: Report | undefined;
    for (const r of reports.filter((x) => x.timeLostHours === 0))
      if ((await blocksOf(r.nightId)).length) {
        report = r;
        break;
      }
    const before = report!;
    const { page, errors } = await open(`/nights/${before.nightId}/report`);
    const replan = page.locator('#replan');
    await replan.getByText('This night lost no time').waitFor();
    await page.locator('input[name=timeLostHours]').fill('2.5');
    await page.locator('input[name=timeLostReason]').fill('wind above the dome limit');
    await page.getByRole('button', { name: 'Save report' }).click();
    await page.getByText(`Saved as version ${before.version + 1}`).waitFor();
    // The re-plan section reads the stored report again: it now offers the re-plan.
    await replan.getByText('This night lost 2.5 h (wind above the dome limit).').waitFor();
    await replan.getByRole('button', { name: 'Re-plan the rest of the season' }).waitFor();
    // An edit discarded returns to the version just saved, not the one the page opened on ...
    await page.locator('textarea[name=notes]').fill('draft to throw away');
    await page.getByRole('button', { name: 'Discard draft' }).click();
    await expect(page.locator('input[name=timeLostHours]').inputValue()).resolves.toBe('2.5');
    await expect(page.locator('textarea[name=notes]').inputValue()).resolves.toBe(before.notes);
    // ... so the next save goes on from it, with no conflict.
    await page.locator('input[name=windMS]').fill('14');
    await page.getByRole('button', { name: 'Save report' }).click();
    await page.getByText(`Saved as version ${before.version + 2}`).waitFor();
    expect(await page.locator('.conflict').count()).toBe(0);

    // A measurement added is listed at once, in words.
    const listed = page.locator('#measurements table.data tbody tr');
    const n = await listed.count();
    const form = page.locator('form.measurement-form');
    // The form opens on the kind of the night's first block; fill what that kind asks.
    const offsets = (await form.locator('input[name=dRaMas]').count()) > 0;
    const values: [string, string][] = offsets
      ? [
          ['dRaMas', '-51.2'],
          ['dDecMas', '-22.4'],
          ['sigmaDRaMas', '0.45'],
          ['sigmaDDecMas', '0.45'],
        ]
      : [
          ['radialVelocityKmS', '-2710.4'],
          ['sigmaRadialVelocityKmS', '9.5'],
        ];
    for (const [name, v] of values) await form.locator(`input[name=${name}]`).fill(v);
    await form.locator('input[name=instrument]').fill('refresh check (invented)');
    await form.getByRole('button', { name: 'Add measurement' }).click();
    await expect.poll(() => listed.count()).toBe(n + 1);
    const row = listed.filter({ hasText: 'refresh check (invented)' });
    await expect(row.locator('td').nth(2).textContent()).resolves.toBe(
      offsets ? 'offsets Δα*, Δδ' : 'radial velocity',
    );
    await expect(row.locator('td').nth(3).textContent()).resolves.toBe(
      'secondary relative to the primary',
    );
    await expect(row.locator('td').nth(4).textContent()).resolves.toMatch(
      offsets ? /Δα\* -51\.20 mas ± 0\.45 mas/ : /-2710\.40 km\/s ± 9\.50/,
    );
    expect(errors).toEqual([]);
    await page.close();

    // Put the demo back.
    for (const b of await blocksOf(before.nightId)) {
      const ms = (
        await api<{ items: { id: number; instrument: string }[] }>(
          `/measurements?limit=500&blockId=${b.id}`,
        )
      ).items;
      for (const m of ms.filter((x) => x.instrument === 'refresh check (invented)'))
        await api(`/measurements/${m.id}`, { method: 'DELETE' });
    }
    const now = await api<Report>(`/night-reports/${before.id}`);
    await api(`/night-reports/${before.id}`, {
      method: 'PATCH',
      body: {
        version: now.version,
        timeLostHours: 0,
        timeLostReason: before.timeLostReason,
        windMS: (before as unknown as { windMS: number | null }).windMS,
      },
    });
  });

  test('a system’s position typed in sexagesimal is shown so at once, stored in degrees', async () => {
    const systems = (
      await api<{ items: { id: number; name: string; raDeg: number; decDeg: number }[] }>(
        '/systems?limit=500',
      )
    ).items;
    const sys = systems[systems.length - 1]!;
    const { page, errors } = await open('/records');
    const row = page.locator(`#systems tr[data-id="${sys.id}"]`);
    await row.getByRole('button', { name: 'Edit' }).click();
    const ra = row.locator('input[name=raDeg]');
    // Shown for editing as it is read: hours, minutes, seconds.
    await expect(ra.inputValue()).resolves.toMatch(/^\d\d:\d\d:\d\d\.\d\d$/);
    await ra.fill('02:47:10.5');
    await row.locator('input[name=decDeg]').fill('+04:19:30');
    await row.getByRole('button', { name: 'Save' }).click();
    await expect.poll(() => row.locator('td').nth(1).textContent()).toBe('02:47:10.50');
    await expect(row.locator('td').nth(2).textContent()).resolves.toBe('+04:19:30.0');
    const stored = await api<{ raDeg: number; decDeg: number }>(`/systems/${sys.id}`);
    // 02:47:10.5 h:m:s = 41.79375°, +04:19:30 = 4.325° (arithmetic: 15°/h, 60′/°, 60″/′).
    expect(stored.raDeg).toBeCloseTo(41.79375, 9);
    expect(stored.decDeg).toBeCloseTo(4.325, 9);
    expect(errors).toEqual([]);
    await page.close();
    await api(`/systems/${sys.id}`, {
      method: 'PATCH',
      body: { raDeg: sys.raDeg, decDeg: sys.decDeg },
    });
  });

  test('the campaign chosen on one view is the time request’s', async () => {
    const campaigns = (await api<{ items: { id: number; name: string }[] }>('/campaigns')).items;
    const other = campaigns[campaigns.length - 1]!;
    const { page, errors } = await open('/');
    await page.locator('.view-head select[name=campaign]').selectOption(String(other.id));
    await page.getByRole('heading', { name: other.name, level: 1 }).waitFor();
    await page
      .getByRole('navigation', { name: 'views' })
      .getByRole('link', { name: 'Time request' })
      .click();
    const choice = page.locator('#time-request-form select[name=campaign]');
    await choice.waitFor();
    await expect(choice.inputValue()).resolves.toBe(String(other.id));
    // And chosen there, it is the Season view's.
    await choice.selectOption(String(campaigns[0]!.id));
    await page
      .getByRole('navigation', { name: 'views' })
      .getByRole('link', { name: 'Season' })
      .click();
    const season = page.locator('.view-head select[name=campaign]');
    await season.waitFor();
    await expect(season.inputValue()).resolves.toBe(String(campaigns[0]!.id));
    expect(errors).toEqual([]);
    await page.close();
  });
});
