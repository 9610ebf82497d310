/** `epochwright create-database`: a new, empty database where the server and the CLI will find it. */
import { existsSync } from 'node:fs';
import { parseArgs } from 'node:util';
import {
  LOCAL_OPERATOR,
  createStore,
  displayUrl,
  filePath,
  locateDatabase,
  openDatabase,
} from '../../store/index.ts';
import { UsageError, type Command } from '../io.ts';
import { DATABASE_HELP, databaseOption } from './store-option.ts';

const help = `usage: epochwright create-database [--demo]

Creates the database where the server finds its own (below), empty and at the current schema, so
a team can set up its systems, sites and campaigns from the command line before any server runs.
An existing database is never touched: the command refuses. --demo loads the invented demo
campaign instead of starting empty.

options:
  --demo                 load the invented demo campaign
${DATABASE_HELP}
`;

export const createDatabaseCommand: Command = {
  summary: 'create an empty database (or the demo) where the server will find it',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: { ...databaseOption, demo: { type: 'boolean' } },
      strict: true,
      allowPositionals: false,
    });
    const where = locateDatabase(values.database ? { url: values.database } : {});
    const path = filePath(where.url);
    if (path === null)
      throw new UsageError(
        `${displayUrl(where.url)} is a database server: it is created with its own tools`,
      );
    if (existsSync(path))
      throw new UsageError(
        `${displayUrl(where.url)} (from ${where.source}) exists already; nothing was changed`,
      );
    const store = createStore(await openDatabase({ url: where.url }));
    try {
      if (values.demo) await store.loadDemo(LOCAL_OPERATOR, {});
    } finally {
      store.close();
    }
    return (
      `created ${values.demo ? 'the demo database' : 'an empty database'} at ${displayUrl(where.url)} ` +
      `(from ${where.source})\n`
    );
  },
};
