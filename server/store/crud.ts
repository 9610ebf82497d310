/**
 * Generic create/read/update/delete over one table, shared by the entity repositories.
 * Every write runs in one transaction with its audit entry; versioned tables (blocks, night
 * reports) reject an update whose `version` is not the stored one.
 */
import { and, asc, count, eq, type SQL } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import { InputError } from '../science/errors.ts';
import { changedFields, recordAudit, type Actor } from './audit.ts';
import { nowIso } from '../clock.ts';
import type { Db, DbOrTx } from './database.ts';
import { ConflictError, NotFoundError, translateConstraint } from './errors.ts';

export interface Page<T> {
  items: T[];
  total: number;
  limit: number;
  offset: number;
}
export interface PageRequest {
  limit?: number;
  offset?: number;
}
export const DEFAULT_LIMIT = 50;
export const MAX_LIMIT = 500;

/** The parts of a table this module touches. */
type Table = SQLiteTable & { id: SQLiteColumn };
// drizzle's generic insert/update types do not survive abstraction over tables: rows are plain records here.
type Row = Record<string, unknown>;

export interface Entity<T> {
  /** Singular name used in messages and the audit trail. */
  name: string;
  table: Table;
  hasUpdatedAt: boolean;
  versioned: boolean;
  /** Check references and cross-field rules inside the transaction; throw InputError/ConflictError. */
  check?: (tx: DbOrTx, next: Row, previous: T | null) => Promise<void>;
  orderBy?: SQLiteColumn[];
  _row?: T;
}

export function entity<T>(spec: Omit<Entity<T>, '_row'>): Entity<T> {
  return spec;
}

// One generic path over every entity's table; each entity's row type is checked at its spec.
// biome-ignore lint/suspicious/noExplicitAny: see above
const q = (db: DbOrTx) => db as any;

export async function list<T>(
  db: DbOrTx,
  e: Entity<T>,
  where: (SQL | undefined)[],
  page: PageRequest = {},
): Promise<Page<T>> {
  const limit = Math.min(page.limit ?? DEFAULT_LIMIT, MAX_LIMIT);
  const offset = page.offset ?? 0;
  const cond = and(...where.filter((w): w is SQL => w !== undefined));
  const order = (e.orderBy ?? [e.table.id]).map((c) => asc(c));
  const items = (await q(db)
    .select()
    .from(e.table)
    .where(cond)
    .orderBy(...order, asc(e.table.id))
    .limit(limit)
    .offset(offset)) as T[];
  const [{ n }] = (await q(db).select({ n: count() }).from(e.table).where(cond)) as [{ n: number }];
  return { items, total: n, limit, offset };
}

/**
 * Rows that one long write transaction reads again and again, kept instead of queried each time:
 * the demo load looks up the same targets, sites and campaigns for each of its blocks and
 * measurements. Only in a transaction that asks for it (`rememberRows`), only for the tables it
 * names, and only for tables that nothing writes past updateIn/removeIn, which forget the row.
 */
const remembered = new WeakMap<object, Map<Table, Map<number, unknown>>>();

export function rememberRows(tx: DbOrTx, tables: Table[]): void {
  remembered.set(tx, new Map(tables.map((t) => [t, new Map()])));
}

/** The stored row of `table` with this id, from the transaction's kept rows where it keeps them. */
export async function rowById<T>(db: DbOrTx, table: Table, id: number): Promise<T | null> {
  const kept = remembered.get(db)?.get(table);
  if (kept?.has(id)) return kept.get(id) as T;
  const row = ((await q(db).select().from(table).where(eq(table.id, id)).limit(1)) as T[])[0];
  if (row && kept) kept.set(id, row);
  return row ?? null;
}

function forget(db: DbOrTx, table: Table, id: number): void {
  remembered.get(db)?.get(table)?.delete(id);
}

export async function findById<T>(db: DbOrTx, e: Entity<T>, id: number): Promise<T | null> {
  return rowById<T>(db, e.table, id);
}

export async function getById<T>(db: DbOrTx, e: Entity<T>, id: number): Promise<T> {
  const row = await findById(db, e, id);
  if (!row) throw new NotFoundError(e.name, id);
  return row;
}

/** Insert inside an open transaction (for multi-entity writes); audit included. */
export async function insertIn<T>(tx: DbOrTx, e: Entity<T>, actor: Actor, values: Row): Promise<T> {
  const now = nowIso();
  const row: Row = { ...values, createdAt: now, ...(e.hasUpdatedAt ? { updatedAt: now } : {}) };
  if (e.versioned) row.version = 1;
  if (e.check) await e.check(tx, row, null);
  let inserted: T;
  try {
    [inserted] = (await q(tx).insert(e.table).values(row).returning()) as [T];
  } catch (err) {
    translateConstraint(err, e.name);
  }
  await recordAudit(tx, actor, 'create', e.name, (inserted as Row).id as number, values);
  return inserted;
}

/**
 * Apply a partial update inside an open transaction. For versioned tables `expectedVersion` must
 * equal the stored version; the stored version then goes up by one.
 */
export async function updateIn<T>(
  tx: DbOrTx,
  e: Entity<T>,
  actor: Actor,
  id: number,
  patch: Row,
  expectedVersion?: number,
  /** Changes the update makes outside the table's columns (join tables), for the audit entry. */
  alsoChanged: Record<string, { old: unknown; new: unknown }> = {},
): Promise<T> {
  const previous = await getById(tx, e, id);
  const prev = previous as Row;
  if (e.versioned) {
    if (expectedVersion === undefined)
      throw new ConflictError(
        'stale_version',
        `updating a ${e.name} needs the version you last read`,
        { currentVersion: prev.version },
      );
    if (expectedVersion !== prev.version) {
      throw new ConflictError(
        'stale_version',
        `the ${e.name} was changed by someone else (you sent version ${expectedVersion}, it is ` +
          `now ${String(prev.version)}); reload and apply your change again`,
        {
          currentVersion: prev.version,
          current: previous,
        },
      );
    }
  }
  const set: Row = { ...patch };
  if (e.hasUpdatedAt) set.updatedAt = nowIso();
  if (e.versioned) set.version = (prev.version as number) + 1;
  if (e.check) await e.check(tx, { ...prev, ...set }, previous);
  const where = e.versioned
    ? // biome-ignore lint/suspicious/noExplicitAny: versioned entities have a version column (checked by the spec's flag)
      and(eq(e.table.id, id), eq((e.table as any).version, prev.version))
    : eq(e.table.id, id);
  let rows: T[];
  forget(tx, e.table, id);
  try {
    rows = (await q(tx).update(e.table).set(set).where(where).returning()) as T[];
  } catch (err) {
    translateConstraint(err, e.name);
  }
  if (rows.length !== 1)
    throw new ConflictError(
      'stale_version',
      `the ${e.name} changed while it was being updated; reload and try again`,
    );
  await recordAudit(tx, actor, 'update', e.name, id, {
    changed: { ...changedFields(prev, patch), ...alsoChanged },
  });
  return rows[0]!;
}

export async function removeIn<T>(
  tx: DbOrTx,
  e: Entity<T>,
  actor: Actor,
  id: number,
): Promise<void> {
  const previous = await getById(tx, e, id);
  forget(tx, e.table, id);
  try {
    await q(tx).delete(e.table).where(eq(e.table.id, id));
  } catch (err) {
    translateConstraint(err, e.name);
  }
  await recordAudit(tx, actor, 'delete', e.name, id, previous);
}

export async function remove<T>(db: Db, e: Entity<T>, actor: Actor, id: number): Promise<void> {
  await db.transaction((tx) => removeIn(tx, e, actor, id));
}

/** Throw InputError (422) naming `field` when `id` is not a row of `e`. */
export async function requireRef<T>(
  tx: DbOrTx,
  e: Entity<T>,
  field: string,
  id: unknown,
): Promise<T> {
  const row = typeof id === 'number' ? await findById(tx, e, id) : null;
  if (!row) throw new InputError(field, id, `does not name an existing ${e.name}`);
  return row;
}
