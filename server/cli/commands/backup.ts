/** `epochwright backup`: a consistent copy of the database file, safe while the server runs. */
import { parseArgs } from 'node:util';
import { UsageError, type Command } from '../io.ts';
import { DATABASE_HELP, databaseOption, withStore } from './store-option.ts';

const help = `usage: epochwright backup --file <new file>

Writes a copy of the database as it is at one instant (SQLite's VACUUM INTO), while the server
keeps running. The file must not exist yet. A libSQL server is backed up with its own tools.

options:
  --file <file>          where to write the copy
${DATABASE_HELP}
`;

export const backupCommand: Command = {
  summary: 'write a consistent copy of the database while the server runs',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: { ...databaseOption, file: { type: 'string' } },
      strict: true,
      allowPositionals: false,
    });
    if (values.file === undefined) throw new UsageError('--file is required');
    const file = values.file;
    const path = await withStore(values.database, (store) => store.backup(file));
    return `backup written to ${path}\n`;
  },
};
