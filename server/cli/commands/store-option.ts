/**
 * The two ways a store command reaches the store, and the one place that chooses between them:
 * opening the database (`--database`, resolved exactly as the server resolves its own, printed in
 * every store command's help and on stderr before every write), or a running server (`--server`
 * with a token, remote.ts), where the server's roles apply and its audit trail names the token's
 * user. A command says what it does both ways (`StoreAction`); `storeAction` runs one of them.
 */
import {
  createStore,
  displayUrl,
  locateDatabase,
  openDatabase,
  type Actor,
  type Store,
} from '../../store/index.ts';
import { localActor } from '../actor.ts';
import { SERVER_HELP, call, remoteOf, serverOptions, type ApiRequest } from '../remote.ts';

export const databaseOption = { database: { type: 'string' } } as const;
/** The options of every command that reads or writes store data: `--database`, or `--server` with `--token`. */
export const storeOptions = { ...databaseOption, ...serverOptions } as const;

const here = locateDatabase();
export const DATABASE_HELP = `  --database <url>       libSQL url (file:…, libsql://…); default as the server finds its own:
                         DATABASE_URL, else <EPOCHWRIGHT_DATA_DIR or the repository's data/>/epochwright.db
                         (here and now: ${displayUrl(here.url)}, from ${here.source})`;
export const STORE_HELP = `${DATABASE_HELP}\n${SERVER_HELP}`;

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

/** A request to the server, answered with its JSON (or text); see remote.ts. */
export type Api = <R = unknown>(r: ApiRequest) => Promise<R>;

/** One store action, said both ways: what it does with the store, and what it asks a server. */
export interface StoreAction<T> {
  /** With the database open; writes go under the local operator (`actor`). */
  local: (store: Store, actor: Actor) => Promise<T>;
  /** Through a server: one request whose answer is the same value, or several through `api`. */
  remote: ApiRequest | ((api: Api) => Promise<T>);
  /** The action writes: stderr says where (the database, or the server and the token's user). */
  writes?: boolean;
}

export interface StoreValues {
  database?: string | undefined;
  server?: string | undefined;
  token?: string | undefined;
}

/** Run a store action the way the options say: through `--server`, else on the database. */
export async function storeAction<T>(values: StoreValues, action: StoreAction<T>): Promise<T> {
  const remote = remoteOf(values);
  if (!remote)
    return withStore(values.database, (store) => action.local(store, localActor()), {
      writes: action.writes === true,
    });
  const api: Api = (r) => call(remote, r);
  if (action.writes) {
    const me = await api<{ name: string; role: string }>({ method: 'GET', path: '/me' });
    process.stderr.write(
      `epochwright: writing through ${remote.base} as ${JSON.stringify(me.name)} (${me.role})\n`,
    );
  }
  return typeof action.remote === 'function' ? action.remote(api) : api<T>(action.remote);
}
