/**
 * `plan-season` and `plan-night` through the real CLI on the demo campaign (invented; its headline
 * star passes periapsis months after the clock, server/store/demo/scenario.ts): tables, JSON and CSV; --accept stores
 * what the preview showed; bad input exits 2 naming the option and writes nothing.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDays } from '../../server/science/sky/night.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { tableCounts } from '../store/backends.ts';
import { nowIso } from '../../server/clock.ts';
import { DEMO_DAYS, HEADLINE, demoAnchor } from '../../server/store/demo/scenario.ts';
import { cli } from './run-cli.ts';

let dir: string;
let url: string;
let store: Store;
// Previews are made as of the demo's day; accepts run at the clock (an accept may not reach back in time).
// Every date comes from the demo, which is built around the clock.
const demo = demoAnchor(nowIso());
const AT = ['--at', `${demo.today}T00:00:00Z`];
const MONTH = [demo.day(DEMO_DAYS.periapsis - 13), demo.day(DEMO_DAYS.periapsis + 16)]; // the passage's month
// Two nights of the densified run: the stored ones nearest the pattern's dates (the demo moves a
// night up to 4 days off the Moon).
const DENSE: string[] = [];
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-plan-cli-'));
  url = `file:${join(dir, 'plan.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  const stored = (await store.nights.list({}, { limit: 500 })).items
    .filter((n) => n.siteId === 1 && n.campaignId === 1)
    .map((n) => n.date);
  for (const k of [21, 35]) {
    const want = Date.parse(demo.day(DEMO_DAYS.densified.start + k));
    DENSE.push(
      stored.reduce((a, b) =>
        Math.abs(Date.parse(b) - want) < Math.abs(Date.parse(a) - want) ? b : a,
      ),
    );
  }
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const season = (...args: string[]) =>
  cli([
    'plan-season',
    '--campaign-id',
    '1',
    '--start',
    MONTH[0]!,
    '--end',
    MONTH[1]!,
    ...(args.includes('--accept') ? [] : AT),
    '--database',
    url,
    ...args,
  ]);
const nightId = async (date: string) =>
  (await store.nights.list({}, { limit: 500 })).items.find(
    (n) => n.date === date && n.siteId === 1 && n.campaignId === 1,
  )!.id;

describe('epochwright plan-season', () => {
  it('shows the plan as a table, JSON and CSV without writing', async () => {
    const before = await tableCounts(store);
    const table = await season();
    expect(table.code, table.stderr).toBe(0);
    expect(table.stdout).toMatch(
      /^night\s+site\s+start_local\s+minutes\s+target\s+kind\s+airmass\s+sigma\s+why\s+gain/m,
    );
    expect(table.stdout).toMatch(
      new RegExp(
        `${HEADLINE}\\s+\\d+\\s+\\d+\\s+\\d+\\s+\\d+\\s+(yes|no)\\s+\\d{4}-\\d\\d-\\d\\d\\s+[\\d.]+ → [\\d.]+`,
      ),
    ); // the headline star's row: epochs, periapsis date, σ of T before → after
    expect(table.stdout).toMatch(/preview only \(digest [0-9a-f]{16}\)/);
    expect(table.stdout).toMatch(/note: Laser guide star/);
    const json = JSON.parse((await season('--json')).stdout);
    const csv = (await season('--csv')).stdout.trim().split('\n');
    expect(csv[0]).toBe(
      'night,site,start_utc,minutes,target,kind,airmass,sigma,sigma_unit,why,gain,reason',
    );
    expect(csv.length - 1).toBe(json.plan.epochs.length); // one CSV row per planned epoch
    expect(await tableCounts(store)).toEqual(before); // previews write nothing
  });

  it('stores the previewed plan with --accept and refuses a stale digest', async () => {
    const preview = JSON.parse((await season('--json')).stdout);
    const stale = await season('--accept', '--digest', 'ffffffffffffffff');
    expect(stale.code).toBe(1); // a conflict with the stored state, not bad usage
    expect(stale.stderr).toMatch(/changed since the preview/);
    const res = await season('--accept', '--digest', preview.digest, '--json');
    expect(res.code, res.stderr).toBe(0);
    const body = JSON.parse(res.stdout);
    expect(body.written.map((b: { startUtc: string }) => b.startUtc).sort()).toEqual(
      preview.plan.epochs
        .map((e: { block: { start: { utc: string } } }) => e.block.start.utc.replace('Z', '.000Z'))
        .sort(),
    ); // block for block the preview
  });

  it('exits 2 naming the option on bad input, writing nothing', async () => {
    const before = await tableCounts(store);
    const cases: [string[], RegExp][] = [
      [
        ['--start', '2025-01-01'],
        /--start: "2025-01-01" must be a date within the campaign's dates/,
      ],
      [['--site-id', '9'], /--site-id\.0: 9 must be one of the campaign's sites/],
      [['--settings', '{"fillFraction": 3}'], /--settings fillFraction: 3 must lie in \(0, 1\]/],
      [['--settings', '{"colour": 1}'], /unknown setting "colour"/],
      [
        AT,
        new RegExp(
          `--at: "${demo.today}T00:00:00.000Z" must not be earlier than the server's clock less 2 min`,
        ),
      ], // a past moment: accepting may not replace blocks begun since
    ];
    for (const [args, message] of cases) {
      const res = await cli([
        'plan-season',
        '--campaign-id',
        '1',
        '--start',
        MONTH[0]!,
        '--end',
        MONTH[1]!,
        '--database',
        url,
        ...args,
        '--accept',
      ]);
      expect([res.code, res.stdout]).toEqual([2, '']); // exit 2 on bad input (server/cli/main.ts)
      expect(res.stderr).toMatch(message);
    }
    expect(await tableCounts(store)).toEqual(before);
  });
});

describe('epochwright plan-night', () => {
  it('schedules a stored night with pins and removals, listing what is left out and why', async () => {
    const id = await nightId(DENSE[0]!);
    const res = await cli([
      'plan-night',
      '--night-id',
      String(id),
      ...AT,
      '--remove',
      'Sorrel:spectroscopy',
      '--database',
      url,
    ]);
    expect(res.code, res.stderr).toBe(0);
    expect(res.stdout).toMatch(
      new RegExp(`^Tolvane Ridge, night of ${DENSE[0]} \\(America/Santiago; local times\\)`, 'm'),
    );
    expect(res.stdout).toMatch(/left out:\n {2}Sorrel:spectroscopy: removed by the user/);
    const json = JSON.parse(
      (await cli(['plan-night', '--night-id', String(id), ...AT, '--json', '--database', url]))
        .stdout,
    );
    const last = json.schedule.blocks.at(-1);
    const pinned = JSON.parse(
      (
        await cli([
          'plan-night',
          '--night-id',
          String(id),
          ...AT,
          '--pin',
          `${last.id}@${last.start.utc}`,
          '--json',
          '--database',
          url,
        ])
      ).stdout,
    );
    expect(pinned.schedule.blocks.find((b: { id: string }) => b.id === last.id)).toMatchObject({
      start: last.start,
      pinned: true,
    });
  });

  it('stores the schedule with --accept; a pin outside darkness exits 2 and writes nothing', async () => {
    const id = await nightId(DENSE[1]!);
    const noonAfter = `${addDays(DENSE[1]!, 1)}T16:00Z`; // local noon after the night (UTC−4 in the southern winter)
    const before = await tableCounts(store);
    const bad = await cli([
      'plan-night',
      '--night-id',
      String(id),
      '--pin',
      `${HEADLINE}:astrometry@${noonAfter}`,
      '--accept',
      '--database',
      url,
    ]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain(`--pin.0.start: "${noonAfter}" is not inside darkness`);
    expect(await tableCounts(store)).toEqual(before);
    const past = await cli([
      'plan-night',
      '--night-id',
      String(id),
      ...AT,
      '--accept',
      '--database',
      url,
    ]);
    expect([past.code, past.stdout]).toEqual([2, '']); // bad input: exit 2 (server/cli/main.ts)
    expect(past.stderr).toMatch(/--at: .* must not be earlier than the server's clock/);
    expect(await tableCounts(store)).toEqual(before);
    const res = await cli([
      'plan-night',
      '--night-id',
      String(id),
      '--accept',
      '--json',
      '--database',
      url,
    ]);
    expect(res.code, res.stderr).toBe(0);
    const body = JSON.parse(res.stdout);
    const stored = (await store.blocks.list({}, { limit: 500 })).items.filter(
      (b) => b.nightId === id,
    );
    expect(stored.length).toBe(body.schedule.blocks.length);
    expect(body.schedule.leftOut.length + body.schedule.blocks.length).toBe(8); // 4 demo targets × 2 goal kinds, each placed or explained
  });
});
