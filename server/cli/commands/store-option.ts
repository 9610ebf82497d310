/** The `--database` option the store commands share, and opening the store with it. */
import { createStore, openDatabase, type Store } from '../../store/index.ts';

export const databaseOption = { database: { type: 'string' } } as const;
export const DATABASE_HELP = `  --database <url>       libSQL url (file:…, libsql://…); default DATABASE_URL, else data/epochwright.db`;

/** Open (and migrate) the store, run `f`, and close it whatever happens. */
export async function withStore<T>(
  url: string | undefined,
  f: (store: Store) => Promise<T>,
): Promise<T> {
  const store = createStore(await openDatabase(url ? { url } : {}));
  try {
    return await f(store);
  } finally {
    store.close();
  }
}
