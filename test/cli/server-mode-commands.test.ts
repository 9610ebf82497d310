/**
 * Every store command through a running server answers as it does on the database: the demo
 * campaign (invented, server/store/demo/scenario.ts) behind one store, read both ways, each
 * command's JSON (or CSV) compared whole; a write through the server is audited under the
 * token's user; a bad value is named by its option either way.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { nowIso } from '../../server/clock.ts';
import { commands } from '../../server/cli/commands/index.ts';
import { InputError } from '../../server/science/errors.ts';
import { DEMO_DAYS, demoAnchor } from '../../server/store/demo/scenario.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { serveStore, type ServedStore } from './served-store.ts';

let dir: string;
let url: string;
let store: Store;
let served: ServedStore;
let remote: string[];
let lead: { id: number; secret: string };
const demo = demoAnchor(nowIso());
const AT = ['--at', `${demo.today}T00:00:00Z`];
const RANGE = [
  '--start',
  demo.day(DEMO_DAYS.densified.start),
  '--end',
  demo.day(DEMO_DAYS.densified.start + 20),
];
let ilex: number;
let comingNight: number;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-remote-commands-'));
  url = `file:${join(dir, 'server.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
  ilex = (await store.targets.list({}, { limit: 50 })).items.find((t) => t.name === 'Ilex')!.id;
  comingNight = (await store.nights.list({}, { limit: 500 })).items.find(
    (n) => n.campaignId === 1 && n.siteId === 1 && n.date > demo.day(DEMO_DAYS.comingSeason.start),
  )!.id;
  served = await serveStore(store, 'Mira Okonkwo-Tal');
  ({ lead, remote } = served);
});
afterAll(async () => {
  await served.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const run = (name: string, ...argv: string[]) => Promise.resolve(commands[name]!.run(argv));
/** One command both ways: the database's answer and the server's. */
async function bothWays(name: string, ...argv: string[]) {
  const local = await run(name, ...argv, '--database', url);
  const viaServer = await run(name, ...argv, ...remote);
  return { local, viaServer };
}

it.each([
  ['plan-season', '--campaign-id', '1', ...RANGE, ...AT, '--json'],
  ['plan-season', '--campaign-id', '1', ...RANGE, ...AT, '--draws', '20', '--json'],
  ['time-request', '--campaign-id', '1', '--name', 'Dense run', ...RANGE, ...AT, '--json'],
  ['site-statistics', '--site-id', '1', '--json'],
  ['site-precision', '--json'],
  ['account', 'list', '--json'],
  ['flags', '--campaign-id', '1', ...AT, '--json'],
])('%s answers the same through a server as on the database', async (name, ...argv) => {
  const { local, viaServer } = await bothWays(name, ...argv);
  expect(JSON.parse(viaServer)).toEqual(JSON.parse(local)); // constructed case: one store, two ways in
});

it('plans a night, forecasts a target and exports its ephemeris the same both ways', async () => {
  for (const argv of [
    ['plan-night', '--night-id', String(comingNight), ...AT, '--json'],
    ['forecast', '--target-id', String(ilex), ...AT, '--json'],
  ]) {
    const { local, viaServer } = await bothWays(argv[0]!, ...argv.slice(1));
    expect(JSON.parse(viaServer)).toEqual(JSON.parse(local));
  }
  for (const argv of [
    [
      'events',
      '--target-id',
      String(ilex),
      '--start',
      '2027-01-01T00:00Z',
      '--end',
      '2029-01-01T00:00Z',
      '--kinds',
      'periapsis',
      '--json',
    ],
    [
      'ephemeris',
      '--target-id',
      String(ilex),
      '--start',
      '2027-01-01T00:00Z',
      '--end',
      '2027-03-01T00:00Z',
      '--step',
      'P30D',
      '--json',
    ],
  ]) {
    const both = await bothWays(argv[0]!, ...argv.slice(1));
    expect(JSON.parse(both.viaServer)).toEqual(JSON.parse(both.local));
    expect(both.local).toMatch(/"periapsis"|"dRaMas"/); // the stored orbit's own events and offsets
  }
  const ephemeris = [
    'ephemeris',
    '--target-id',
    String(ilex),
    '--start',
    '2027-01-01T00:00Z',
    '--end',
    '2027-06-01T00:00Z',
    '--step',
    'P30D',
  ];
  const csv = await bothWays('export', ...ephemeris);
  expect(csv.viaServer).toBe(csv.local);
  expect(csv.local.split('\n')[0]).toMatch(/sigmaDRaMas/); // the σ columns travel too
  for (const only of [[], ['--current'], ['--target-id', String(ilex)]]) {
    const orbits = await bothWays('export', 'orbits', ...only);
    expect(orbits.viaServer).toBe(orbits.local);
    expect(orbits.local.split('\n')[0]).toMatch(/sigmaPeriodYears.*correlations/); // with covariance
  }
  const json = await bothWays('export', ...ephemeris, '--json');
  expect(JSON.parse(json.viaServer)).toEqual(JSON.parse(json.local));
});

it('shows a stored site’s night and season with a campaign’s targets the same both ways', async () => {
  const night = await bothWays(
    'night',
    '--site-id',
    '1',
    '--campaign-id',
    '1',
    '--date',
    demo.day(190),
    '--json',
  );
  expect(JSON.parse(night.viaServer)).toEqual(JSON.parse(night.local));
  expect(JSON.parse(night.local).targets.length).toBeGreaterThan(0);
  const season = await bothWays(
    'season',
    '--site-id',
    '1',
    '--campaign-id',
    '1',
    '--year',
    demo.day(0).slice(0, 4),
    '--step',
    'PT30M',
    '--csv',
  );
  expect(season.viaServer).toBe(season.local);
});

it('fits a stored target the same both ways', async () => {
  const { local, viaServer } = await bothWays('fit', '--target-id', String(ilex), '--json');
  expect(JSON.parse(viaServer)).toEqual(JSON.parse(local));
});

it('writes through the server under the token’s user, and names a bad option either way', async () => {
  const accepted = await run(
    'plan-night',
    '--night-id',
    String(comingNight),
    '--accept',
    ...remote,
  );
  expect(accepted).toMatch(/accepted: \d+ blocks? written/);
  const audit = await store.audit.list({ entity: 'block' }, { limit: 5, offset: 0 });
  expect(audit.items[0]!.userId).toBe(lead.id); // the token's user, not the local operator
  for (const way of [['--database', url], remote]) {
    const bad = await run(
      'plan-season',
      '--campaign-id',
      '1',
      '--start',
      '2027-02-30',
      '--end',
      '2027-03-10',
      ...way,
    ).catch((e: unknown) => e);
    expect(bad).toBeInstanceOf(InputError);
    expect((bad as Error).message).toMatch(/^--start: "2027-02-30"/);
  }
});
