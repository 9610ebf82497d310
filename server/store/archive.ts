/**
 * A campaign archive: every stored table (systems, targets, orbit solutions with covariance and
 * provenance, sites, campaigns, nights, blocks, night reports and outcomes, measurements, users,
 * the audit trail, and whatever later migrations add) as JSON rows with their ids, so it reads
 * back into an empty database with equal content. Bearer tokens stay out: an archive that travels
 * must not carry a way in (issue new tokens after a restore).
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Database } from './database.ts';
import { MIGRATIONS_FOLDER, libsqlTransaction } from './database.ts';
import { InputError } from '../science/errors.ts';

export const ARCHIVE_FORMAT = 'epochwright-archive';
/** Tables never archived: the migrator's own bookkeeping, and the token hashes. */
const LEFT_OUT = new Set(['__drizzle_migrations', 'tokens', 'sqlite_sequence']);

export interface Archive {
  format: typeof ARCHIVE_FORMAT;
  /** The last migration of the schema the rows follow; a restore needs the same. */
  schema: string;
  /** Rows per table, in id order, with every column under its SQL name. */
  tables: Record<string, Record<string, unknown>[]>;
}

function schemaTag(): string {
  const journal = JSON.parse(
    readFileSync(resolve(MIGRATIONS_FOLDER, 'meta/_journal.json'), 'utf8'),
  ) as { entries: { idx: number; tag: string }[] };
  return [...journal.entries].sort((a, b) => a.idx - b.idx).at(-1)!.tag;
}

async function tableNames(database: Database): Promise<string[]> {
  const rs = await database.client.execute(
    "SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name",
  );
  return rs.rows
    .map((r) => String(r.name))
    .filter((n) => !LEFT_OUT.has(n) && !n.startsWith('sqlite_'));
}

const quote = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** Read every archived table in one read transaction (a consistent instant while others write). */
export async function writeArchive(database: Database): Promise<Archive> {
  const names = await tableNames(database);
  const tx = await database.client.transaction('read');
  try {
    const tables: Archive['tables'] = {};
    for (const n of names) {
      const rs = await tx.execute(`SELECT * FROM ${quote(n)} ORDER BY rowid`);
      tables[n] = rs.rows.map((row) => Object.fromEntries(rs.columns.map((c) => [c, row[c]])));
    }
    await tx.commit();
    return { format: ARCHIVE_FORMAT, schema: schemaTag(), tables };
  } finally {
    tx.close();
  }
}

/**
 * Write an archive into an empty database, all of it or nothing; references are checked at the
 * commit (deferred), so the tables may come in any order.
 * @throws InputError when the text is no archive, its schema differs, or the database is not empty
 */
export async function readArchive(
  database: Database,
  input: unknown,
): Promise<Record<string, number>> {
  const a = input as Partial<Archive> | null;
  if (!a || typeof a !== 'object' || a.format !== ARCHIVE_FORMAT || typeof a.tables !== 'object')
    throw new InputError(
      'archive',
      a?.format,
      `is not an ${ARCHIVE_FORMAT} (made by "epochwright export archive")`,
    );
  const here = schemaTag();
  if (a.schema !== here)
    throw new InputError(
      'archive.schema',
      a.schema,
      `must be this version's schema (${here}): restore it with the version that wrote it, then upgrade`,
    );
  const names = new Set(await tableNames(database));
  for (const t of Object.keys(a.tables!))
    if (!names.has(t))
      throw new InputError(`archive.tables.${t}`, t, 'is not a table of this database');
  // Through the write gate (write-gate.ts) like every write of this process: the emptiness check
  // and the rows in one transaction, so a writer in between cannot slip rows under the archive.
  return database.db.transaction(async (tx) => {
    const raw = libsqlTransaction(tx);
    if (!raw) throw new Error('readArchive: no libSQL transaction under drizzle’s');
    for (const t of names) {
      const rs = await raw.execute(`SELECT count(*) AS n FROM ${quote(t)}`);
      if (Number(rs.rows[0]!.n) > 0)
        throw new InputError(
          'database',
          database.url,
          `must be empty to take an archive (table ${t} has rows); restore into a new file`,
        );
    }
    const counts: Record<string, number> = {};
    await raw.execute('PRAGMA defer_foreign_keys = ON');
    for (const [t, rows] of Object.entries(a.tables!)) {
      counts[t] = rows.length;
      for (const row of rows) {
        const cols = Object.keys(row);
        await raw.execute({
          sql: `INSERT INTO ${quote(t)} (${cols.map(quote).join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`,
          args: cols.map((c) => row[c] as string | number | null),
        });
      }
    }
    return counts;
  });
}
