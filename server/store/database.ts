/**
 * Opening the campaign store: an embedded libSQL file by default (in a git-ignored data folder),
 * a libSQL server when DATABASE_URL says so, or an embedded replica that syncs with one.
 * Migrations under db/migrations are applied on every open (a no-op when none is pending).
 */
import { closeSync, existsSync, mkdirSync, openSync } from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createClient, type Client, type Transaction } from '@libsql/client';
import { drizzle, type LibSQLDatabase } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import * as schema from '../../db/schema.ts';
import { InputError } from '../science/errors.ts';
import { fillMigrationGaps, journalMigrations } from './migration-gaps.ts';
import { CONNECTION_BUSY_MS, gatedTransaction } from './write-gate.ts';
import { clearAbandonedImports } from './csv/staging.ts';

export type Db = LibSQLDatabase<typeof schema>;
/** A transaction handle or the database itself: repositories accept either. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;

/**
 * The libSQL transaction under a drizzle transaction (drizzle-orm 0.45 keeps it at `session.tx`),
 * for bulk statements with plain bound parameters; null for the database itself or if drizzle
 * moves it (callers then fall back to drizzle's builders).
 */
export function libsqlTransaction(tx: DbOrTx): Transaction | null {
  const raw = (tx as unknown as { session?: { tx?: Transaction } }).session?.tx;
  return raw && typeof raw.execute === 'function' ? raw : null;
}

const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const MIGRATIONS_FOLDER = resolve(REPO_ROOT, 'db/migrations');
/** Default data folder (git-ignored), relative to the repository. */
export const DEFAULT_DATA_DIR = resolve(REPO_ROOT, 'data');

export interface OpenOptions {
  /** `file:/abs/path.db`, `:memory:`, `libsql://…`, `http(s)://…`. Default: a file in the data folder. */
  url?: string;
  authToken?: string;
  /** With a `file:` url: keep it as an embedded replica of this libSQL server. */
  syncUrl?: string;
  syncIntervalS?: number;
  /** Data folder for the default file url. */
  dataDir?: string;
  /** Refuse (InputError on `database`) rather than create a local file that is not there (the CLI). */
  mustExist?: boolean;
}

export interface Database {
  db: Db;
  client: Client;
  url: string;
  /** True for a local file without a sync url (WAL on, backups by VACUUM INTO). */
  isLocalFile: boolean;
  close(): void;
}

/** Where a database url came from, in the words the help and the CLI print. */
export type DatabaseSource =
  | 'given'
  | 'DATABASE_URL'
  | 'EPOCHWRIGHT_DATA_DIR'
  | 'the default data folder';

/**
 * The one resolution of the database, shared by the server and the CLI: the url given, then
 * DATABASE_URL, then `file:<EPOCHWRIGHT_DATA_DIR or the repository's data/>/epochwright.db`
 * (absolute, so the working directory does not matter).
 */
export function locateDatabase(
  options: OpenOptions = {},
  env: NodeJS.ProcessEnv = process.env,
): { url: string; source: DatabaseSource } {
  if (options.url) return { url: options.url, source: 'given' };
  if (env.DATABASE_URL) return { url: env.DATABASE_URL, source: 'DATABASE_URL' };
  const dir = options.dataDir ?? env.EPOCHWRIGHT_DATA_DIR;
  return {
    url: `file:${resolve(dir ?? DEFAULT_DATA_DIR, 'epochwright.db')}`,
    source: dir === undefined ? 'the default data folder' : 'EPOCHWRIGHT_DATA_DIR',
  };
}

/** The url from options, then DATABASE_URL, then `file:<dataDir>/epochwright.db`. */
export function resolveDatabaseUrl(
  options: OpenOptions = {},
  env: NodeJS.ProcessEnv = process.env,
): string {
  return locateDatabase(options, env).url;
}

/** A url for people: a libSQL server's credentials in the url are hidden. */
export function displayUrl(url: string): string {
  return url.replace(/\/\/[^@/]*@/, '//…@');
}

/** The path of a `file:` url (relative ones from the working folder); null for a database server. */
export function filePath(url: string): string | null {
  if (!url.startsWith('file:')) return null;
  const p = url.slice('file:'.length).replace(/^\/\/(?=\/)/, '');
  return isAbsolute(p) ? p : resolve(process.cwd(), p);
}

/**
 * Create the data folder and an empty database file readable by its owner only (0600; SQLite
 * gives its -wal and -shm files the same mode). An existing file keeps the mode it has.
 */
export function createPrivateFile(path: string): void {
  mkdirSync(dirname(path), { recursive: true, mode: 0o700 });
  try {
    closeSync(openSync(path, 'wx', 0o600));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
  }
}

/** Open, create the parent folder of a file database, turn on WAL, and migrate. */
export async function openDatabase(options: OpenOptions = {}): Promise<Database> {
  const { url, source } = locateDatabase(options);
  const path = filePath(url);
  if (path && options.mustExist && !existsSync(path)) {
    throw new InputError(
      'database',
      url,
      `names no database (from ${source}): the server creates its database on its first start (or ` +
        `run 'epochwright create-database'); point DATABASE_URL or EPOCHWRIGHT_DATA_DIR (or ` +
        `--database) at the server's, or start the server once`,
    );
  }
  if (path) createPrivateFile(path);
  const syncUrl = options.syncUrl ?? process.env.DATABASE_SYNC_URL;
  const client = createClient({
    url,
    authToken: options.authToken ?? process.env.DATABASE_AUTH_TOKEN,
    // The client pools connections: a PRAGMA reaches one of them, this option every one.
    timeout: CONNECTION_BUSY_MS,
    ...(syncUrl && path ? { syncUrl, syncInterval: options.syncIntervalS ?? 60 } : {}),
  });
  const isLocalFile = path !== null && !syncUrl;
  // WAL persists in the file; readers (a backup, the CLI) then never block the server's writer.
  if (isLocalFile) await client.execute('PRAGMA journal_mode = WAL');
  // Already on in libSQL's connections; said once more for a build where it is not.
  await client.execute('PRAGMA foreign_keys = ON');
  const db = drizzle(client, { schema });
  // Every write transaction of this process through one gate (write-gate.ts).
  db.transaction = gatedTransaction(db.transaction.bind(db), async () => {
    await client.reconnect();
  }) as Db['transaction'];
  // drizzle skips a migration older than the newest applied one: fill such gaps first, or refuse.
  await fillMigrationGaps(client, journalMigrations(MIGRATIONS_FOLDER));
  await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
  // Staged rows of an import whose process died (staging.ts): never measurements, only clutter.
  await clearAbandonedImports(db);
  return { db, client, url, isLocalFile, close: () => client.close() };
}
