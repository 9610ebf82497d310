/**
 * The campaign archive round trip on the demo campaign: archive → empty database → archive again
 * gives the same content, table by table and row by row; a non-empty database is refused whole.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { commands } from '../../server/cli/commands/index.ts';
import { InputError } from '../../server/science/errors.ts';
import { createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';

let dir: string;
let store: Store;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-archive-'));
  store = (await startStore({ url: `file:${join(dir, 'demo.db')}`, demo: true })).store;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

it('round-trips the demo campaign into an empty database with equal content', async () => {
  const first = await store.archive();
  // constructed case: the demo's own tables, every one with rows except those it leaves empty
  for (const t of [
    'systems',
    'targets',
    'orbit_solutions',
    'sites',
    'campaigns',
    'nights',
    'blocks',
    'night_reports',
    'block_outcomes',
    'measurements',
    'users',
    'audit_trail',
  ])
    expect(first.tables[t]?.length ?? 0, t).toBeGreaterThan(0);
  expect(first.tables.tokens).toBeUndefined(); // no way in travels with an archive
  const file = join(dir, 'archive.json');
  writeFileSync(file, `${JSON.stringify(first)}\n`);
  const copyUrl = `file:${join(dir, 'copy.db')}`;
  const out = await commands.restore!.run(['--archive', file, '--database', copyUrl]);
  expect(out).toMatch(/^restored \d+ records/);
  const copy = createStore(await openDatabase({ url: copyUrl }));
  const second = await copy.archive();
  expect(second).toEqual(first);
  // the solutions keep covariance and provenance, read through the store as any row
  const solutions = (await copy.orbitSolutions.list({}, { limit: 200 })).items;
  expect(solutions.some((s) => s.provenance === 'fitted' && s.orbit.covariance)).toBe(true);
  copy.close();
  // a database that holds records takes no archive, and is left as it was
  const refused = await Promise.resolve(
    commands.restore!.run(['--archive', file, '--database', copyUrl]),
  ).catch((e: unknown) => e);
  expect(refused).toBeInstanceOf(InputError);
  expect((refused as InputError).rule).toMatch(/must be empty/);
  // a backup does not overwrite a database without --replace (a file this process never opened:
  // restore runs in a process of its own)
  const backup = await store.backup(join(dir, 'backup.db'));
  const targetUrl = `file:${join(dir, 'target.db')}`;
  writeFileSync(join(dir, 'target.db'), '');
  const noReplace = await Promise.resolve(
    commands.restore!.run(['--backup', backup, '--database', targetUrl]),
  ).catch((e: unknown) => e);
  expect((noReplace as InputError).rule).toMatch(/--replace/);
  expect(
    await commands.restore!.run(['--backup', backup, '--database', targetUrl, '--replace']),
  ).toMatch(/^restored/);
  const restored = createStore(await openDatabase({ url: targetUrl }));
  expect((await restored.archive()).tables.measurements).toEqual(first.tables.measurements);
  restored.close();
});

it('restores a backup over a file this process just had open (no SQLITE_BUSY)', async () => {
  const backup = await store.backup(join(dir, 'backup-2.db'));
  const url = `file:${join(dir, 'was-open.db')}`;
  const before = createStore(await openDatabase({ url }));
  await before.archive(); // reads through a transaction, as a request would
  before.close(); // its connections may outlive close() until garbage collection
  expect(await commands.restore!.run(['--backup', backup, '--database', url, '--replace'])).toMatch(
    /^restored/,
  );
  const after = createStore(await openDatabase({ url }));
  const [a, b] = [await after.archive(), await store.archive()];
  expect(a.tables.measurements).toEqual(b.tables.measurements); // constructed case: the backup's rows
  after.close();
});

it('writes an archive through the write gate: inside another transaction it is refused at once', async () => {
  const archive = await store.archive();
  const url = `file:${join(dir, 'gate.db')}`;
  const empty = await openDatabase({ url });
  const target = createStore(empty);
  const refused = await empty.db
    .transaction(() => target.restoreArchive(archive))
    .catch((e: unknown) => e);
  expect((refused as Error).name).toBe('NestedTransaction'); // the gate saw it (write-gate.ts)
  expect(Object.values(await target.restoreArchive(archive)).some((n) => n > 0)).toBe(true);
  target.close();
});
