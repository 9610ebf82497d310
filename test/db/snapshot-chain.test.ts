/**
 * Every migration has the drizzle snapshot of the schema it leaves, chained by id to the one
 * before, so `drizzle-kit generate` diffs the next schema change against the right state. Checked
 * here without drizzle-kit (which needs a terminal): each journal entry has its snapshot, each
 * snapshot's prevId is the previous snapshot's id, and the last snapshot holds every table and
 * column of db/schema.ts (constructed case: the schema as code is the truth).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { SQLiteTable, getTableConfig } from 'drizzle-orm/sqlite-core';
import { expect, it } from 'vitest';
import * as schema from '../../db/schema.ts';
import { MIGRATIONS_FOLDER } from '../../server/store/database.ts';

interface Snapshot {
  id: string;
  prevId: string;
  tables: Record<string, { columns: Record<string, unknown> }>;
}

const journal = JSON.parse(readFileSync(join(MIGRATIONS_FOLDER, 'meta/_journal.json'), 'utf8')) as {
  entries: { idx: number; tag: string }[];
};
const snapshotPath = (idx: number) =>
  join(MIGRATIONS_FOLDER, 'meta', `${String(idx).padStart(4, '0')}_snapshot.json`);

it('has one snapshot per migration, each chained to the one before', () => {
  let prev = '00000000-0000-0000-0000-000000000000';
  for (const { idx, tag } of journal.entries) {
    expect(existsSync(snapshotPath(idx)), `snapshot of ${tag}`).toBe(true);
    const snap = JSON.parse(readFileSync(snapshotPath(idx), 'utf8')) as Snapshot;
    expect(snap.prevId, `prevId of ${tag}`).toBe(prev);
    prev = snap.id;
  }
});

it('last snapshot holds exactly the schema as code', () => {
  const last = journal.entries.at(-1)!.idx;
  const snap = JSON.parse(readFileSync(snapshotPath(last), 'utf8')) as Snapshot;
  const tables = (Object.values(schema) as unknown[])
    .filter((v): v is SQLiteTable => v instanceof SQLiteTable)
    .map((t) => getTableConfig(t));
  const fromCode = Object.fromEntries(
    tables.map((t) => [t.name, t.columns.map((c) => c.name).sort()]),
  );
  const fromSnapshot = Object.fromEntries(
    Object.entries(snap.tables).map(([name, t]) => [name, Object.keys(t.columns).sort()]),
  );
  expect(fromSnapshot).toEqual(fromCode);
});

it('each snapshot differs from the one before (no whole-schema copies)', () => {
  const all = journal.entries.map(
    ({ idx }) => JSON.parse(readFileSync(snapshotPath(idx), 'utf8')) as Snapshot,
  );
  for (let k = 1; k < all.length; k++)
    expect(JSON.stringify(all[k]!.tables), journal.entries[k]!.tag).not.toBe(
      JSON.stringify(all[k - 1]!.tables),
    );
});
