/**
 * Setting a campaign up from the command line alone: create-database, system, target, site,
 * campaign, allocate (pattern, CSV, iCalendar), block and report, each on the database and
 * through a running server; every refusal names the option, the value and the rule, and writes
 * nothing. Names and places are invented.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { commands } from '../../server/cli/commands/index.ts';
import { UsageError } from '../../server/cli/io.ts';
import { joinNegativeValues } from '../../server/cli/main.ts';
import { InputError } from '../../server/science/errors.ts';
import { createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { tableCounts } from '../store/backends.ts';
import { serveStore, type ServedStore } from './served-store.ts';

let dir: string;
let db: string[];
let store: Store;
let served: ServedStore;
let remote: string[];
let leadId: number;
const run = (name: string, ...argv: string[]) =>
  Promise.resolve(commands[name]!.run(joinNegativeValues(argv)));
const refused = (p: Promise<unknown>) => p.then(() => null).catch((e: unknown) => e as Error);

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-setup-'));
  const url = `file:${join(dir, 'setup.db')}`;
  db = ['--database', url];
  expect(await run('create-database', ...db)).toMatch(/created an empty database/);
  expect((await refused(run('create-database', ...db)))?.message).toMatch(/exists already/);
  store = createStore(await openDatabase({ url }));
  served = await serveStore(store, 'Ines Varga');
  leadId = served.lead.id;
  remote = served.remote;
});
afterAll(async () => {
  await served.close();
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

it('reads a negative value after its option as that option’s value', () => {
  expect(
    joinNegativeValues(['--dec', '-21:42:58', '--accept', '--pm-ra', '−1.5', '--x', 'y']),
  ).toEqual(['--dec=-21:42:58', '--accept', '--pm-ra=−1.5', '--x', 'y']);
});

it('stores a system, its targets, sites and a campaign; refuses bad values by option, writing nothing', async () => {
  expect(await run('system', 'list', ...db)).toMatch(/no system stored yet/);
  const system = await run(
    'system',
    'add',
    '--name',
    'Hollow Lamp',
    '--ra',
    '17:35:22.1',
    '--dec',
    '-21:42:58',
    '--distance-pc',
    '15000',
    ...db,
  );
  expect(system).toMatch(/stored system 1 "Hollow Lamp"/);
  // 17h35m22.1s = 263.842083° and −21°42′58″ = −21.716111° (sexagesimal arithmetic, common practice, no source)
  expect(system).toMatch(/263\.842083\s+-21\.716111/);
  await run(
    'target',
    'add',
    '--system-id',
    '1',
    '--name',
    'Lamp-7',
    '--magnitude',
    '14.1',
    '--band',
    'K',
    ...db,
  );
  await run('target', 'add', '--system-id', '1', '--name', 'Lamp-12', ...remote);
  const before = await tableCounts(store);
  const bad: [string, string[], RegExp][] = [
    [
      'system',
      ['add', '--name', 'Bad', '--ra', '25h', '--dec', '0'],
      /^--ra: "25h" must lie in \[0, 24\) h/,
    ],
    [
      'system',
      ['add', '--name', 'Bad', '--ra', '10', '--dec', '0', '--mass', '1,5'],
      /^--mass: "1,5" has a comma: use a decimal point: 1\.5/,
    ],
    [
      'target',
      ['add', '--system-id', '9', '--name', 'x'],
      /^--system-id: 9 does not name an existing system/,
    ],
    // A flipped longitude sign in Chile (UTC−3/−4, common practice, no source): refused with the fix.
    [
      'site',
      [
        'add',
        '--name',
        'Flip',
        '--latitude',
        '-29.26',
        '--longitude',
        '70.74',
        '--elevation',
        '2380',
        '--time-zone',
        'America/Santiago',
      ],
      /^--longitude: .*likely correction: longitude -70\.7400° .*--longitude-zone-confirmed/,
    ],
    [
      'site',
      [
        'add',
        '--name',
        'Typo',
        '--latitude',
        '-29.26',
        '--longitude',
        '-70.74',
        '--elevation',
        '2380',
        '--time-zone',
        'America/Santigo',
      ],
      /^--time-zone: "America\/Santigo" .*nearest valid names: "America\/Santiago"/,
    ],
    [
      'campaign',
      [
        'add',
        '--name',
        'Bad',
        '--start',
        '2027-03-01',
        '--end',
        '2027-09-01',
        '--kinds',
        'astrometry',
        '--cadence-days',
        '0',
      ],
      /^--cadence-days: 0 must be above 0/,
    ],
  ];
  for (const [name, argv, message] of bad)
    for (const way of [db, remote]) {
      const e = await refused(run(name, ...argv, ...way));
      expect(e, `${name} ${argv.join(' ')}`).toBeInstanceOf(InputError);
      expect(e!.message).toMatch(message);
    }
  expect(await tableCounts(store)).toEqual(before); // nothing written by any refusal
  await run(
    'site',
    'add',
    '--name',
    'Cerro Tanagra',
    '--latitude',
    '-29:15:40',
    '--longitude',
    '-70:44:10',
    '--elevation',
    '2380',
    '--time-zone',
    'America/Santiago',
    ...db,
  );
  const site2 = await run(
    'site',
    'add',
    '--name',
    'Mauna Pelo',
    '--latitude',
    '19.82',
    '--longitude',
    '-155.47',
    '--elevation',
    '4100',
    '--time-zone',
    'Pacific/Honolulu',
    ...remote,
  );
  expect(site2).toMatch(/stored site 2 "Mauna Pelo"/);
  const audit = await store.audit.list({ entity: 'site' }, { limit: 5, offset: 0 });
  expect(audit.items.map((a) => a.userId).sort()).toEqual([leadId, null].sort()); // the token’s user, and the local operator
  await run(
    'campaign',
    'add',
    '--name',
    'Lamp passage',
    '--start',
    '2026-09-01',
    '--end',
    '2027-12-31',
    '--target-ids',
    '1,2',
    '--site-ids',
    '1,2',
    '--cadence-days',
    '14',
    '--kinds',
    'astrometry,spectroscopy',
    ...db,
  );
  // For people, a record is shown under the options that set it, not its stored field names.
  const shown = await run('campaign', 'show', '--campaign-id', '1', ...db);
  expect(shown).toMatch(/^cadence-days\s+14$/m);
  expect(shown).toMatch(/^kinds\s+astrometry, spectroscopy$/m);
  expect(shown).not.toMatch(/cadenceDays|goals/);
  for (const record of ['system', 'target', 'site', 'campaign']) {
    const local = JSON.parse(await run(record, 'list', '--json', ...db));
    expect(JSON.parse(await run(record, 'list', '--json', ...remote))).toEqual(local);
  }
  expect(
    JSON.parse(await run('campaign', 'show', '--campaign-id', '1', '--json', ...db)),
  ).toMatchObject({
    targetIds: [1, 2],
    siteIds: [1, 2],
    goals: { cadenceDays: 14, kinds: ['astrometry', 'spectroscopy'] },
  });
});

it('allocates nights by pattern, CSV and iCalendar, previewing first and storing all or none', async () => {
  const pattern = [
    '--campaign-id',
    '1',
    '--site-id',
    '1',
    '--start',
    '2026-10-01',
    '--end',
    '2026-10-31',
    '--weekdays',
    'mon,wed,fri',
    '--semester',
    '2026B',
  ];
  const preview = await run('allocate', ...pattern, ...db);
  // October 2026 has 13 Mondays, Wednesdays and Fridays (calendar arithmetic, common practice, no source)
  expect(preview).toMatch(/^13 new nights, 0 already allocated, 0 refused/);
  expect(preview).toMatch(/preview only: run again with --accept/);
  expect(await store.nights.list({}, { limit: 5 })).toMatchObject({ total: 0 });
  expect(await run('allocate', ...pattern, '--accept', ...remote)).toMatch(/stored 13 nights/);
  expect(await run('allocate', ...pattern, ...db)).toMatch(/^0 new nights, 13 already allocated/);
  const stepped = [
    '--campaign-id',
    '1',
    '--site-id',
    '1',
    '--start',
    '2026-11-01',
    '--end',
    '2026-11-10',
  ];
  // One night per P3D from 1 November: the 1st, 4th, 7th and 10th (constructed case).
  expect(await run('allocate', ...stepped, '--step', 'P3D', ...db)).toMatch(/^4 new nights/);
  expect(await refused(run('allocate', ...stepped, '--step', 'PT36H', ...db))).toBeInstanceOf(
    InputError,
  );
  const csv = join(dir, 'nights.csv');
  writeFileSync(
    csv,
    'site,date,semester\nCerro Tanagra,2027-05-03,2027A\nMauna Pelo,2028-05-10,2027A\n',
  );
  const before = await tableCounts(store);
  const e = await refused(
    run('allocate', '--campaign-id', '1', '--csv-file', csv, '--accept', ...db),
  );
  expect(e).toBeInstanceOf(InputError);
  expect(e!.message).toMatch(
    /Mauna Pelo, night of 2028-05-10 \(CSV line 3\): lies outside the campaign’s dates.*nothing was stored/,
  );
  expect(await tableCounts(store)).toEqual(before);
  const ics = join(dir, 'schedule.ics');
  writeFileSync(
    ics,
    [
      'BEGIN:VCALENDAR',
      'VERSION:2.0',
      'PRODID:-//invented//EN',
      'BEGIN:VEVENT',
      'UID:run-1@invented',
      'DTSTAMP:20261101T000000Z',
      'DTSTART;VALUE=DATE:20270510',
      'DTEND;VALUE=DATE:20270512',
      'SUMMARY:Lamp passage run',
      'END:VEVENT',
      'END:VCALENDAR',
      '',
    ].join('\r\n'),
  );
  const fromCalendar = await run(
    'allocate',
    '--campaign-id',
    '1',
    '--site-id',
    '2',
    '--calendar-file',
    ics,
    '--semester',
    '2027A',
    '--accept',
    ...db,
  );
  expect(fromCalendar).toMatch(/stored 2 nights/); // an all-day event of two dates, DTEND excluded (RFC 5545 §3.6.1)
  const listed = await run('allocate', '--campaign-id', '1', ...db);
  expect(listed).toMatch(/2027-05-11\s+Mauna Pelo\s+2027A/);
  expect(
    await refused(
      run('allocate', '--campaign-id', '1', '--csv-file', csv, '--site-id', '1', ...db),
    ),
  ).toBeInstanceOf(UsageError);
});

it('logs a past night: blocks by hand with what ran, then the report with each outcome', async () => {
  const night = (await store.nights.list({ campaignId: 1 }, { limit: 1 })).items[0]!; // 2026-10-02 at Cerro Tanagra
  const id = String(night.id);
  const obtained = await run(
    'block',
    'add',
    '--night-id',
    id,
    '--target-id',
    '1',
    '--kind',
    'astrometry',
    '--start',
    '2026-10-02T21:05-03',
    '--end',
    '2026-10-02T21:45-03',
    '--status',
    'obtained',
    ...db,
  );
  expect(obtained).toMatch(/2026-10-03 00:05\s+2026-10-03 00:45\s+obtained\s+by-hand/); // −03:00 read as an offset
  await run(
    'block',
    'add',
    '--night-id',
    id,
    '--target-id',
    '2',
    '--kind',
    'spectroscopy',
    '--start',
    '2026-10-02T21:50-03',
    '--end',
    '2026-10-02T22:50-03',
    ...remote,
  );
  expect(await run('block', 'edit', '--block-id', '2', '--status', 'lost', ...remote)).toMatch(
    /changed block 2 \(now version 2\)/,
  );
  const outside = await refused(
    run(
      'block',
      'add',
      '--night-id',
      id,
      '--target-id',
      '1',
      '--kind',
      'astrometry',
      '--start',
      '2026-10-05T21:00-03',
      '--end',
      '2026-10-05T21:40-03',
      ...db,
    ),
  );
  expect(outside?.message).toMatch(/^--start: .*must lie within night 2026-10-02/);
  // Plans are for nights ahead: a schedule for the ended night is refused, pointing to the log.
  const planned = await refused(run('plan-night', '--night-id', id, '--accept', ...db));
  expect(planned?.message).toMatch(/has ended: .*record what ran as blocks by hand/);
  const comma = await refused(run('report', 'add', '--night-id', id, '--time-lost', '1,5', ...db));
  expect(comma?.message).toMatch(/^--time-lost: "1,5" has a comma: use a decimal point: 1\.5/);
  const report = await run(
    'report',
    'add',
    '--night-id',
    id,
    '--seeing',
    '0.7',
    '--strehl',
    '0.45',
    '--time-lost',
    '1.5',
    '--time-lost-reason',
    'cirrus after 22:00',
    '--outcome',
    '1=obtained:35',
    '--outcome',
    '2=lost',
    ...db,
  );
  expect(report).toMatch(/0\.70\s+0\.45\s+1\.5\s+cirrus after 22:00\s+1=obtained 2=lost/);
  expect(JSON.parse(await run('report', 'list', '--night-id', id, '--json', ...remote))).toEqual(
    JSON.parse(await run('report', 'list', '--night-id', id, '--json', ...db)),
  );
  const measured = await run(
    'measurement',
    'add',
    '--target-id',
    '1',
    '--block-id',
    '1',
    '--kind',
    'offsets',
    '--epoch',
    '2026-10-02T21:30-03',
    '--dra',
    '-45.2',
    '--ddec',
    '12.1',
    '--sigma-dra',
    '0.8',
    '--sigma-ddec',
    '0.8',
    '--instrument',
    'imager K',
    ...remote,
  );
  expect(measured).toMatch(
    /2026-10-03 00:30:00\s+Δα\* -45\.200 ± 0\.800, Δδ 12\.100 ± 0\.800 mas\s+1\s+imager K/,
  );
  const noSigma = await refused(
    run(
      'measurement',
      'add',
      '--target-id',
      '1',
      '--kind',
      'radial-velocity',
      '--epoch',
      '2026-10-03T01:00Z',
      '--rv',
      '1200',
      '--instrument',
      'spectrograph',
      ...db,
    ),
  );
  expect(noSigma?.message).toMatch(
    /^--sigma-rv: \(missing\) is required for kind "radial-velocity"/,
  );
  expect(JSON.parse(await run('measurement', 'list', '--block-id', '1', '--json', ...db))).toEqual(
    JSON.parse(await run('measurement', 'list', '--block-id', '1', '--json', ...remote)),
  );
  expect(
    (await refused(run('report', 'add', '--night-id', id, '--outcome', '1:obtained', ...db)))
      ?.message,
  ).toMatch(/^--outcome: "1:obtained" must be <block id>=<status>/);
});
