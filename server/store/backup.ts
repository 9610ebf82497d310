/**
 * A consistent copy of a running database. `VACUUM INTO` reads inside one transaction, so the
 * copy is the database as of one instant even while the server keeps writing (WAL lets the
 * writer go on meanwhile). A libSQL server is backed up by its own tooling, not from here.
 */
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../science/errors.ts';
import { createPrivateFile, type Database } from './database.ts';

/** Write a copy of the database to `path` (a new file). Returns its absolute path. */
export async function backupDatabase(database: Database, path: string): Promise<string> {
  if (!database.isLocalFile && database.url !== ':memory:') {
    throw new InputError(
      'DATABASE_URL',
      database.url.replace(/\/\/[^@/]*@/, '//…@'),
      'is not a local file: back up a libSQL server with its own tools',
    );
  }
  const target = resolve(path);
  if (existsSync(target))
    throw new InputError(
      'to',
      path,
      'already exists; choose a new file name so no backup is overwritten',
    );
  // VACUUM INTO fills an empty file: created first, readable by its owner only, like the database.
  createPrivateFile(target);
  await database.client.execute({ sql: 'VACUUM INTO ?', args: [target] });
  return target;
}
