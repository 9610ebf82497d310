/**
 * A data file written before migration 0001 opens with it applied: existing systems keep their
 * position as J2000.0 (what the store assumed before the column existed) and existing sites get a
 * flat horizon, and both still pass the store's checks on their next update. One written before
 * 0002 gets each block's origin from the notes the plan accepts wrote, and `by-hand` otherwise.
 */
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createClient } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { MIGRATIONS_FOLDER } from '../../server/store/database.ts';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-upgrade-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

it('upgrades a database made by migration 0000 alone, keeping its rows', async () => {
  // The migrations folder as it stood before 0001: the first journal entry only.
  const old = join(dir, 'migrations-0000');
  cpSync(MIGRATIONS_FOLDER, old, { recursive: true });
  const journal = JSON.parse(readFileSync(join(old, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  expect(journal.entries[1]?.tag).toMatch(/^0001_/); // the migration under test exists
  writeFileSync(
    join(old, 'meta/_journal.json'),
    JSON.stringify({ ...journal, entries: journal.entries.slice(0, 1) }),
  );
  const url = `file:${join(dir, 'old.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: old });
  const now = '2026-01-01T00:00:00.000Z';
  await client.execute({
    sql: 'INSERT INTO systems (name, ra_deg, dec_deg, pm_ra_mas_yr, pm_dec_mas_yr, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
    args: ['Old Deep', 10, 20, 5, -5, now, now],
  });
  await client.execute({
    sql: 'INSERT INTO sites (name, latitude_deg, longitude_deg, elevation_m, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
    args: ['Old Ridge', -30, -70, 2400, 'America/Santiago', now, now],
  });
  client.close();

  const store = createStore(await openDatabase({ url }));
  try {
    const [system] = (await store.systems.list({})).items;
    const [site] = (await store.sites.list({})).items;
    expect(system).toMatchObject({
      name: 'Old Deep',
      pmRaMasYr: 5,
      positionEpoch: '2000-01-01T12:00:00.000Z',
    }); // J2000.0 = JD 2451545.0 (IAU 1976 standard epoch, from memory): the store's assumption before 0001
    expect(site).toMatchObject({ name: 'Old Ridge', horizonMask: [] }); // a flat horizon, as before 0001
    const patched = await store.sites.update(LOCAL_OPERATOR, site!.id, {
      horizonMask: [{ azimuthDeg: 180, altitudeDeg: 25 }],
    });
    expect(patched.horizonMask).toEqual([{ azimuthDeg: 180, altitudeDeg: 25 }]); // the value sent
    expect(
      (await store.systems.update(LOCAL_OPERATOR, system!.id, { notes: 'kept' })).positionEpoch,
    ).toBe('2000-01-01T12:00:00.000Z'); // unchanged by an unrelated patch
  } finally {
    store.close();
  }
});

it('upgrades a database made before migration 0002: blocks get their origin and pin from what wrote them', async () => {
  // The migrations folder as it stood before 0002: the first two journal entries.
  const old = join(dir, 'migrations-0001');
  cpSync(MIGRATIONS_FOLDER, old, { recursive: true });
  const journal = JSON.parse(readFileSync(join(old, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  expect(journal.entries[2]?.tag).toMatch(/^0002_/); // the migration under test exists
  writeFileSync(
    join(old, 'meta/_journal.json'),
    JSON.stringify({ ...journal, entries: journal.entries.slice(0, 2) }),
  );
  const url = `file:${join(dir, 'old-blocks.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: old });
  const now = '2026-01-01T00:00:00.000Z';
  await client.execute({
    sql: 'INSERT INTO systems (name, ra_deg, dec_deg, created_at, updated_at) VALUES (?, ?, ?, ?, ?)',
    args: ['Old Deep', 10, 20, now, now],
  });
  await client.execute({
    sql: 'INSERT INTO targets (system_id, name, created_at, updated_at) VALUES (1, ?, ?, ?)',
    args: ['Oriel', now, now],
  });
  await client.execute({
    sql: 'INSERT INTO sites (name, latitude_deg, longitude_deg, elevation_m, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
    args: ['Old Ridge', -30, -70, 2400, 'America/Santiago', now, now],
  });
  await client.execute({
    sql: 'INSERT INTO nights (site_id, date, created_at, updated_at) VALUES (1, ?, ?, ?)',
    args: ['2027-06-10', now, now],
  });
  // The notes the accepts wrote before 0002 (season-plan.ts, night-plan.ts), and a block a person made.
  const notes = [
    'season plan 0123456789abcdef (cadence): keeps every gap within 14 d',
    'night schedule 0123456789abcdef: Oriel:astrometry',
    'night schedule 0123456789abcdef: Oriel:spectroscopy (pinned)',
    'moved by hand after the season plan',
  ];
  for (const [k, n] of notes.entries()) {
    await client.execute({
      sql: 'INSERT INTO blocks (night_id, target_id, kind, start_utc, end_utc, notes, created_at, updated_at) VALUES (1, 1, ?, ?, ?, ?, ?, ?)',
      args: [
        'astrometry',
        `2027-06-11T0${k}:00:00.000Z`,
        `2027-06-11T0${k}:30:00.000Z`,
        n,
        now,
        now,
      ],
    });
  }
  client.close();

  const store = createStore(await openDatabase({ url }));
  try {
    const rows = (await store.blocks.list({})).items.map((b) => [b.origin, b.pinned]);
    expect(rows).toEqual([
      ['season-plan', false],
      ['night-schedule', false],
      ['night-schedule', true],
      ['by-hand', false],
    ]); // the rule of migration 0002: plan-written notes name their origin; anything else is kept as made by hand
    const [first] = (await store.blocks.list({})).items;
    const patched = await store.blocks.update(
      LOCAL_OPERATOR,
      first!.id,
      { pinned: true },
      first!.version,
    );
    expect([patched.origin, patched.pinned]).toEqual(['season-plan', true]); // a pin changes the pin, not who made the block
  } finally {
    store.close();
  }
});

it('upgrades a database made before migration 0003: limits keep their values under the new names', async () => {
  // The migrations folder as it stood before 0003: the first three journal entries.
  const old = join(dir, 'migrations-0002');
  cpSync(MIGRATIONS_FOLDER, old, { recursive: true });
  const journal = JSON.parse(readFileSync(join(old, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  expect(journal.entries[3]?.tag).toMatch(/^0003_/); // the migration under test exists
  writeFileSync(
    join(old, 'meta/_journal.json'),
    JSON.stringify({ ...journal, entries: journal.entries.slice(0, 3) }),
  );
  const url = `file:${join(dir, 'old-limits.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: old });
  const now = '2026-01-01T00:00:00.000Z';
  await client.execute({
    sql: 'INSERT INTO sites (name, latitude_deg, longitude_deg, elevation_m, time_zone, min_altitude_deg, sun_avoidance_deg, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
    args: ['Old Ridge', -30, -70, 2400, 'America/Santiago', 25, 50, now, now],
  });
  const campaign = (name: string, limits: object) =>
    client.execute({
      sql: 'INSERT INTO campaigns (name, start_date, end_date, goals, constraints, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
      args: [
        name,
        '2027-01-01',
        '2027-12-31',
        JSON.stringify({ cadenceDays: 30, kinds: ['astrometry'] }),
        JSON.stringify(limits),
        now,
        now,
      ],
    });
  await campaign('Full', { maxAirmass: 1.8, minMoonSeparationDeg: 40, darkness: 'nautical' });
  await campaign('Empty', {});
  client.close();

  const store = createStore(await openDatabase({ url }));
  try {
    const [site] = (await store.sites.list({})).items;
    expect(site).toMatchObject({ lowestAltitudeDeg: 25, leastSunDistanceDeg: 50 }); // the values inserted above
    const limits = (await store.campaigns.list({})).items.map((c) => [c.name, c.limits]);
    expect(limits).toEqual([
      ['Full', { highestAirmass: 1.8, leastMoonDistanceDeg: 40, darkness: 'nautical' }],
      ['Empty', {}],
    ]); // the values inserted above, under the names of migration 0003
  } finally {
    store.close();
  }
});

it('upgrades a database made before migration 0011: a periapsis repeat keeps its spacing as an ISO 8601 step', async () => {
  // The migrations folder as it stood before 0011: the first eleven journal entries.
  const old = join(dir, 'migrations-0010');
  cpSync(MIGRATIONS_FOLDER, old, { recursive: true });
  const journal = JSON.parse(readFileSync(join(old, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  expect(journal.entries[11]?.tag).toMatch(/^0011_/); // the migration under test exists
  writeFileSync(
    join(old, 'meta/_journal.json'),
    JSON.stringify({ ...journal, entries: journal.entries.slice(0, 11) }),
  );
  const url = `file:${join(dir, 'old-repeat.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: old });
  const now = '2026-01-01T00:00:00.000Z';
  const campaign = (name: string, goals: object) =>
    client.execute({
      sql: 'INSERT INTO campaigns (name, start_date, end_date, goals, limits, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
      args: [name, '2027-01-01', '2027-12-31', JSON.stringify(goals), '{}', now, now],
    });
  const base = { cadenceDays: 30, kinds: ['astrometry'] };
  await campaign('Hours', {
    ...base,
    periapsisRepeat: { everyHours: 2 },
    targets: { '7': { priority: 2, periapsisRepeat: { everyHours: 1.5 } }, '8': { priority: 1 } },
  });
  await campaign('Fill', { ...base, periapsisRepeat: 'fill', targets: { '9': { priority: 3 } } });
  await campaign('Plain', base);
  client.close();

  const store = createStore(await openDatabase({ url }));
  try {
    const goals = (await store.campaigns.list({})).items.map((c) => [c.name, c.goals]);
    expect(goals).toEqual([
      [
        'Hours',
        {
          ...base,
          periapsisRepeat: { step: 'PT2H' },
          targets: {
            '7': { priority: 2, periapsisRepeat: { step: 'PT1.5H' } },
            '8': { priority: 1 },
          },
        },
      ],
      ['Fill', { ...base, periapsisRepeat: 'fill', targets: { '9': { priority: 3 } } }],
      ['Plain', base],
    ]); // the values inserted above, the spacing as an ISO 8601 duration (1.5 h = PT1.5H)
  } finally {
    store.close();
  }
});
