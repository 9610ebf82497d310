/**
 * Migrations that drizzle's migrator would skip. It applies only journal entries newer than the
 * newest one recorded, so a migration merged in after later ones had been applied to a database
 * (a development database of a branch that landed late) is never applied there, and the tables
 * silently lack its columns. Before drizzle runs, each journal entry older than the newest
 * recorded and recorded neither by hash nor by time is a gap. A gap whose statements only add
 * (ADD COLUMN, CREATE TABLE or INDEX) cannot clash with what came after it, so it is applied in
 * journal order and recorded, all in one batch; any other gap is refused with the migrations named
 * and what to do, before anything is written.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Client } from '@libsql/client';
import { readMigrationFiles } from 'drizzle-orm/migrator';

const TABLE = '__drizzle_migrations';

/** A database the start-up cannot bring up to date by itself (never an HTTP answer: the server does not start). */
export class MigrationGap extends Error {
  override readonly name = 'MigrationGap';
}

/** A journal entry as drizzle reads it, with its tag for messages. */
export interface JournalMigration {
  tag: string;
  sql: string[];
  folderMillis: number;
  hash: string;
}

/** A statement that only adds (its SQL comments stripped), so order against later ones does not matter. */
export function isAdditive(statement: string): boolean {
  const s = statement
    .split('\n')
    .filter((line) => !line.trim().startsWith('--'))
    .join(' ')
    .trim();
  if (s === '') return true;
  return /^(ALTER\s+TABLE\s+\S+\s+ADD\s|CREATE\s+(UNIQUE\s+)?(TABLE|INDEX)\s)/i.test(s);
}

/** The journal's migrations with their tags, in journal order. */
export function journalMigrations(folder: string): JournalMigration[] {
  const journal = JSON.parse(readFileSync(join(folder, 'meta/_journal.json'), 'utf8')) as {
    entries: { tag: string }[];
  };
  return readMigrationFiles({ migrationsFolder: folder }).map((m, i) => ({
    tag: journal.entries[i]?.tag ?? `#${i}`,
    sql: m.sql,
    folderMillis: m.folderMillis,
    hash: m.hash,
  }));
}

/** The gaps: entries older than the newest recorded one and recorded neither by hash nor by time. */
export function migrationGaps(
  journal: readonly JournalMigration[],
  recorded: readonly { hash: string; createdAt: number }[],
): JournalMigration[] {
  if (recorded.length === 0) return [];
  const newest = Math.max(...recorded.map((r) => r.createdAt));
  const hashes = new Set(recorded.map((r) => r.hash));
  const times = new Set(recorded.map((r) => r.createdAt));
  return journal.filter(
    (m) => m.folderMillis < newest && !hashes.has(m.hash) && !times.has(m.folderMillis),
  );
}

/**
 * Apply the skipped migrations of a database before drizzle's own pass, or refuse.
 * @returns the tags applied (empty when there was no gap)
 * @throws MigrationGap naming the skipped migrations that are not purely additive
 */
export async function fillMigrationGaps(
  client: Client,
  journal: readonly JournalMigration[],
): Promise<string[]> {
  const exists = await client.execute(
    `SELECT name FROM sqlite_master WHERE type = 'table' AND name = '${TABLE}'`,
  );
  if (exists.rows.length === 0) return [];
  const rows = await client.execute(`SELECT hash, created_at FROM ${TABLE}`);
  const recorded = rows.rows.map((r) => ({
    hash: String(r.hash),
    createdAt: Number(r.created_at),
  }));
  const gaps = migrationGaps(journal, recorded);
  if (gaps.length === 0) return [];
  const unsafe = gaps.filter((m) => !m.sql.every(isAdditive));
  if (unsafe.length > 0) {
    throw new MigrationGap(
      `this database was migrated past ${unsafe.map((m) => m.tag).join(', ')} without applying ` +
        `it, and it changes existing tables, so it cannot be applied after the later ones: ` +
        `restore a backup made before the later migrations and start again, or export the ` +
        `campaigns (archive) and load them into a new database`,
    );
  }
  try {
    await client.batch(
      gaps.flatMap((m) => [
        ...m.sql.filter((s) => s.trim() !== ''),
        {
          sql: `INSERT INTO ${TABLE} (hash, created_at) VALUES (?, ?)`,
          args: [m.hash, m.folderMillis],
        },
      ]),
      'write',
    );
  } catch (err) {
    throw new MigrationGap(
      `this database was migrated past ${gaps.map((m) => m.tag).join(', ')} without applying ` +
        `them, and applying them now failed (${(err as Error).message}); nothing was changed`,
    );
  }
  return gaps.map((m) => m.tag);
}
