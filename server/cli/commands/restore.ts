/**
 * `epochwright restore`: a backup file back in place of the database, or an archive into an empty
 * one. Neither overwrites a database that holds records unless --replace is given (for a backup).
 */
import { copyFileSync, existsSync, renameSync, rmSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { InputError } from '../../science/errors.ts';
import {
  createStore,
  displayUrl,
  filePath,
  locateDatabase,
  openDatabase,
} from '../../store/index.ts';
import { readTextFile } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { DATABASE_HELP, databaseOption } from './store-option.ts';

const help = `usage: epochwright restore --backup <file> [--replace]
       epochwright restore --archive <file>

--backup   puts a copy made by 'epochwright backup' in place of the database file. A database
           that exists is refused unless --replace: stop the server first, since a running
           server keeps writing the file it has open.
--archive  writes an archive made by 'epochwright export archive' into the database, which must be
           new or empty (all of it or nothing). Tokens are not archived: issue new ones after.

options:
${DATABASE_HELP}
`;

function localPath(url: string): string {
  const path = filePath(url);
  if (path === null)
    throw new InputError(
      '--database',
      url,
      'must be a local file to restore a backup into; a libSQL server is restored with its own tools',
    );
  return path;
}

export const restoreCommand: Command = {
  summary: 'put a backup back, or read an archive into an empty database',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...databaseOption,
        backup: { type: 'string' },
        archive: { type: 'string' },
        replace: { type: 'boolean' },
      },
      strict: true,
      allowPositionals: false,
    });
    if ((values.backup === undefined) === (values.archive === undefined))
      throw new UsageError('give one of --backup <file> or --archive <file>');
    const where = locateDatabase(values.database ? { url: values.database } : {});
    process.stderr.write(
      `epochwright: writing to ${displayUrl(where.url)} (from ${where.source})\n`,
    );
    if (values.backup !== undefined) {
      const path = localPath(where.url);
      if (!existsSync(values.backup))
        throw new InputError('--backup', values.backup, 'names no file');
      if (existsSync(path) && !values.replace)
        throw new InputError(
          '--database',
          where.url,
          'holds a database already: give --replace to overwrite it with the backup (stop the server first)',
        );
      // Copied beside the database and renamed over it: a new file (inode), never the old one
      // overwritten in place. A connection this process had open on the old file may outlive its
      // close() until garbage collection (libSQL frees a connection with its last statement
      // handle), and SQLite's locks are per file, so switching the copy to WAL in place failed
      // SQLITE_BUSY. The rename also means a half-written copy never stands in for the database.
      const incoming = `${path}.restoring`;
      for (const extra of ['', '-wal', '-shm']) rmSync(`${incoming}${extra}`, { force: true });
      copyFileSync(values.backup, incoming);
      for (const extra of ['-wal', '-shm']) rmSync(`${path}${extra}`, { force: true });
      renameSync(incoming, path);
      const check = await openDatabase({ url: where.url }); // migrates a backup of an older version
      check.close();
      return `restored ${values.backup} to ${path}\n`;
    }
    if (values.replace) throw new UsageError('--replace goes with --backup only');
    let archive: unknown;
    try {
      archive = JSON.parse(readTextFile('archive', values.archive!));
    } catch (err) {
      if (err instanceof SyntaxError)
        throw new InputError('--archive', values.archive, 'is not JSON');
      throw err;
    }
    const database = await openDatabase({ url: where.url });
    try {
      const counts = await createStore(database).restoreArchive(archive);
      const n = Object.values(counts).reduce((a, b) => a + b, 0);
      return `restored ${n} records into ${displayUrl(where.url)}\n`;
    } finally {
      database.close();
    }
  },
};
