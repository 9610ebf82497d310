/**
 * Everything out of the store from the client, in chromium against the real server with the demo:
 * the measurements CSV, a campaign's calendar and the archive of every record download from the
 * Records page as the export API writes them (the archive's round trip into an empty database is
 * the CLI's test: test/cli). Downloads are waited on as events, never on time.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { describe, expect, inject, test } from 'vitest';
import { chartPages } from './chart-page.ts';
import { HEADLINE } from './harness.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const open = chartPages();

async function apiText(path: string): Promise<string> {
  const res = await fetch(`${base}/api${path}`, { headers: { authorization: `Bearer ${lead}` } });
  expect(res.ok).toBe(true);
  return res.text();
}

/** Click and take the file the browser saves: its suggested name and its text. */
async function download(page: Page, button: string): Promise<{ name: string; text: string }> {
  const [file] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('button', { name: button }).click(),
  ]);
  return { name: file.suggestedFilename(), text: await readFile((await file.path())!, 'utf8') };
}

describe('exports from the client', () => {
  test('measurements, a campaign’s calendar and the archive, as the API writes them', async () => {
    const targets = (
      (await JSON.parse(await apiText('/targets?limit=500'))) as {
        items: { id: number; name: string }[];
      }
    ).items;
    const star = targets.find((t) => t.name === HEADLINE)!;
    const campaigns = (
      JSON.parse(await apiText('/campaigns?limit=500')) as { items: { id: number; name: string }[] }
    ).items;
    const { page, errors } = await open('/records');
    const panel = page.locator('#exports');
    await panel.waitFor();

    await panel.locator('select[name=export-target]').selectOption(String(star.id));
    const csv = await download(page, 'Download measurements (CSV)');
    expect(csv.name).toBe(`${star.name.toLowerCase()}-measurements.csv`);
    expect(csv.text).toBe(await apiText(`/exports/measurements?targetId=${star.id}`));
    expect(csv.text.split('\n').length).toBeGreaterThan(10);

    await panel.locator('select[name=campaign]').selectOption(String(campaigns[0]!.id));
    const ics = await download(page, 'Download its calendar (iCalendar)');
    expect(ics.text.startsWith('BEGIN:VCALENDAR')).toBe(true);
    const events = (t: string) => t.match(/^BEGIN:VEVENT/gm)?.length ?? 0;
    expect(events(ics.text)).toBe(
      events(await apiText(`/campaigns/${campaigns[0]!.id}/calendar.ics`)),
    );
    expect(events(ics.text)).toBeGreaterThan(0);

    const archive = await download(page, 'Download the archive of every record (JSON)');
    expect(archive.name).toBe('epochwright-archive.json');
    // The same records as the API's archive, numbers unchanged by the download.
    expect(JSON.parse(archive.text)).toEqual(JSON.parse(await apiText('/exports/archive')));
    expect(errors).toEqual([]);
    await page.close();
  });
});
