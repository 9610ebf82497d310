/**
 * The options the store commands share: `--database`, resolved exactly as the server resolves
 * its own (locateDatabase), and opening the store with it. The resolved database is printed in
 * every store command's help and, on stderr, before every write.
 */
import {
  createStore,
  displayUrl,
  locateDatabase,
  openDatabase,
  type Store,
} from '../../store/index.ts';

export const databaseOption = { database: { type: 'string' } } as const;

const here = locateDatabase();
export const DATABASE_HELP = `  --database <url>       libSQL url (file:…, libsql://…); default as the server finds its own:
                         DATABASE_URL, else <EPOCHWRIGHT_DATA_DIR or the repository's data/>/epochwright.db
                         (here and now: ${displayUrl(here.url)}, from ${here.source})`;

export interface StoreUse {
  /** The command writes: say on stderr which database it writes to. */
  writes?: boolean;
}

/**
 * Open (and migrate) the store, run `f`, and close it whatever happens. A local file that does not
 * exist is refused, never created: a mistyped path or a missing EPOCHWRIGHT_DATA_DIR would
 * otherwise write into a new, empty database that the server never reads.
 */
export async function withStore<T>(
  url: string | undefined,
  f: (store: Store) => Promise<T>,
  use: StoreUse = {},
): Promise<T> {
  const where = locateDatabase(url ? { url } : {});
  const store = createStore(await openDatabase({ ...(url ? { url } : {}), mustExist: true }));
  if (use.writes)
    process.stderr.write(
      `epochwright: writing to ${displayUrl(where.url)} (from ${where.source})\n`,
    );
  try {
    return await f(store);
  } finally {
    store.close();
  }
}
