/**
 * A database migrated while a migration was missing from the journal (it landed after later ones
 * had been applied) gets it at the next open, when it only adds; one that changes existing tables
 * is refused, with nothing written. Constructed cases: journals cut from the real one.
 */
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createClient } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { MIGRATIONS_FOLDER } from '../../server/store/database.ts';
import { openDatabase } from '../../server/store/index.ts';
import {
  fillMigrationGaps,
  isAdditive,
  journalMigrations,
  migrationGaps,
} from '../../server/store/migration-gaps.ts';

interface Journal {
  entries: { tag: string; when: number }[];
}

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-gaps-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A copy of the migrations folder whose journal keeps only the entries `keep` accepts. */
function cutFolder(name: string, keep: (tag: string) => boolean): string {
  const folder = join(dir, name);
  cpSync(MIGRATIONS_FOLDER, folder, { recursive: true });
  const path = join(folder, 'meta/_journal.json');
  const journal = JSON.parse(readFileSync(path, 'utf8')) as Journal;
  writeFileSync(
    path,
    JSON.stringify({ ...journal, entries: journal.entries.filter((e) => keep(e.tag)) }),
  );
  return folder;
}

const columns = async (client: ReturnType<typeof createClient>, table: string) =>
  (await client.execute(`PRAGMA table_info(${table})`)).rows.map((r) => String(r.name));

it('applies migrations 0005 and 0006 to a database migrated to 0009 without them', async () => {
  const early = cutFolder('without-5-6', (t) => !/^000[56]_/.test(t));
  const url = `file:${join(dir, 'dev.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: early });
  expect(await columns(client, 'sites')).not.toContain('wavelength_um'); // the gap the test is about
  // drizzle alone skips them: its rule is "newer than the newest applied".
  await migrate(drizzle(client), { migrationsFolder: MIGRATIONS_FOLDER });
  expect(await columns(client, 'sites')).not.toContain('wavelength_um');
  const now = '2026-01-01T00:00:00.000Z';
  await client.execute({
    sql: 'INSERT INTO sites (name, latitude_deg, longitude_deg, elevation_m, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?)',
    args: ['Old Ridge', -30, -70, 2400, 'America/Santiago', now, now],
  });
  client.close();

  const opened = await openDatabase({ url });
  try {
    expect(await columns(opened.client, 'sites')).toEqual(
      expect.arrayContaining(['wavelength_um', 'humidity_pct', 'longitude_zone_confirmed']),
    ); // 0006's columns beside 0009's
    expect(await columns(opened.client, 'measurements')).toContain('component'); // 0006
    expect(await columns(opened.client, 'audit_trail')).toContain('actor_name'); // 0005
    const recorded = await opened.client.execute('SELECT COUNT(*) AS n FROM __drizzle_migrations');
    expect(Number(recorded.rows[0]!.n)).toBe(journalMigrations(MIGRATIONS_FOLDER).length); // every entry once
    const site = await opened.client.execute('SELECT name FROM sites');
    expect(site.rows.map((r) => r.name)).toEqual(['Old Ridge']); // the row inserted above
  } finally {
    opened.close();
  }
  // A second open finds no gap.
  const again = await openDatabase({ url });
  const count = await again.client.execute('SELECT COUNT(*) AS n FROM __drizzle_migrations');
  expect(Number(count.rows[0]!.n)).toBe(journalMigrations(MIGRATIONS_FOLDER).length);
  again.close();
});

it('refuses a skipped migration that rebuilds a table, naming it, and writes nothing', async () => {
  const folder = cutFolder('with-rebuild', () => true);
  // A constructed migration between 0000 and 0001 that would rebuild a table.
  const path = join(folder, 'meta/_journal.json');
  const journal = JSON.parse(readFileSync(path, 'utf8')) as Journal;
  const rebuild = {
    ...journal.entries[0]!,
    tag: '0000b_rebuild',
    when: journal.entries[0]!.when + 1,
  };
  writeFileSync(
    join(folder, '0000b_rebuild.sql'),
    'CREATE TABLE `__new_sites` (`id` integer);--> statement-breakpoint\nDROP TABLE `sites`;',
  );
  writeFileSync(
    path,
    JSON.stringify({
      ...journal,
      entries: [journal.entries[0], rebuild, ...journal.entries.slice(1)],
    }),
  );
  const url = `file:${join(dir, 'refused.db')}`;
  const client = createClient({ url });
  await migrate(drizzle(client), { migrationsFolder: MIGRATIONS_FOLDER });
  const before = await client.execute('SELECT COUNT(*) AS n FROM __drizzle_migrations');
  await expect(fillMigrationGaps(client, journalMigrations(folder))).rejects.toThrow(
    /0000b_rebuild.*changes existing tables/,
  );
  const after = await client.execute('SELECT COUNT(*) AS n FROM __drizzle_migrations');
  expect(after.rows[0]!.n).toEqual(before.rows[0]!.n); // nothing recorded
  expect(await columns(client, 'sites')).toContain('wavelength_um'); // the table untouched
  client.close();
});

it('reads a statement as additive only when it adds', () => {
  expect(isAdditive('-- why\nALTER TABLE `sites` ADD `x` real;')).toBe(true); // constructed case
  expect(isAdditive('CREATE INDEX `i` ON `sites` (`name`);')).toBe(true); // constructed case
  expect(isAdditive('ALTER TABLE `sites` RENAME COLUMN `a` TO `b`;')).toBe(false); // constructed case
  expect(isAdditive('UPDATE `sites` SET `x` = 1;')).toBe(false); // constructed case
  expect(isAdditive('DROP TABLE `sites`;')).toBe(false); // constructed case
});

it('finds no gap on a fresh database or one recorded in order', () => {
  const journal = journalMigrations(MIGRATIONS_FOLDER);
  expect(migrationGaps(journal, [])).toEqual([]); // constructed case: nothing applied yet
  const all = journal.map((m) => ({ hash: m.hash, createdAt: m.folderMillis }));
  expect(migrationGaps(journal, all)).toEqual([]); // constructed case: everything applied
  expect(migrationGaps(journal, all.slice(0, 3)).length).toBe(0); // pending, not skipped: drizzle's own
  expect(migrationGaps(journal, [...all.slice(0, 3), all[5]!]).map((m) => m.tag)).toEqual([
    journal[3]!.tag,
    journal[4]!.tag,
  ]); // constructed case: 3 and 4 lie behind the newest recorded
});
