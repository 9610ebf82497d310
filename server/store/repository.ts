/**
 * A repository for one entity: input checked with its schema (InputError on a bad value), rows
 * written by crud.ts in one transaction with the audit entry. An update merges the patch into
 * the stored input and checks the whole again, so no rule can be dodged by patching one field.
 */
import type { SQL } from 'drizzle-orm';
import type { z } from 'zod';
import { InputError } from '../science/errors.ts';
import { changedFields, type Actor } from './audit.ts';
import * as crud from './crud.ts';
import type { Db, DbOrTx } from './database.ts';
import { parseInput } from './schemas/common.ts';

type Row = Record<string, unknown>;

export interface RepositorySpec<T, S extends z.ZodType, F> {
  entity: crud.Entity<T>;
  /** The SQL conditions of a typed filter (all of them must hold); none when omitted. */
  where?: (filter: F, db: DbOrTx) => (SQL | undefined)[];
  schema: S;
  /** Keys of the schema that are stored as columns of the same name. */
  keys: readonly string[];
  /** Keys that cannot change after creation. */
  fixedKeys?: readonly string[];
  /** Turn checked input into column values (e.g. normalise epochs). Default: pick `keys`. */
  toRow?: (input: z.output<S>, actor: Actor) => Row;
  /** Extra writes in the same transaction after insert/update (join tables…). */
  after?: (tx: DbOrTx, actor: Actor, row: T, input: z.output<S>, raw: Row) => Promise<void>;
  /** Rebuild input fields that are not columns (join tables…) for an update's merge. */
  extraInput?: (tx: DbOrTx, row: T) => Promise<Row>;
}

export interface Repository<T, F = Record<never, never>> {
  entity: crud.Entity<T>;
  /** One page of the rows that match every field of `filter` (an empty filter matches all). */
  list(filter?: F, page?: crud.PageRequest): Promise<crud.Page<T>>;
  get(id: number): Promise<T>;
  create(actor: Actor, input: unknown): Promise<T>;
  createIn(tx: DbOrTx, actor: Actor, input: unknown): Promise<T>;
  update(actor: Actor, id: number, patch: Row, version?: number): Promise<T>;
  remove(actor: Actor, id: number): Promise<void>;
}

function pick(row: Row, keys: readonly string[]): Row {
  const out: Row = {};
  for (const k of keys) if (row[k] !== undefined) out[k] = row[k];
  return out;
}

export function repository<T, S extends z.ZodType, F = Record<never, never>>(
  db: Db,
  spec: RepositorySpec<T, S, F>,
): Repository<T, F> {
  const { entity, schema, keys } = spec;
  const toRow = spec.toRow ?? ((input: z.output<S>) => pick(input as Row, keys));
  const createIn = async (tx: DbOrTx, actor: Actor, input: unknown) => {
    const checked = parseInput(schema, input);
    const row = await crud.insertIn(tx, entity, actor, toRow(checked, actor));
    if (spec.after) await spec.after(tx, actor, row, checked, input as Row);
    return row;
  };
  return {
    entity,
    list: (filter, page) =>
      crud.list(db, entity, filter && spec.where ? spec.where(filter, db) : [], page),
    get: (id) => crud.getById(db, entity, id),
    createIn,
    create: (actor, input) => db.transaction((tx) => createIn(tx, actor, input)),
    update: (actor, id, patch, version) =>
      db.transaction(async (tx) => {
        const previous = (await crud.getById(tx, entity, id)) as Row;
        for (const k of spec.fixedKeys ?? []) {
          if (patch[k] !== undefined && patch[k] !== previous[k]) {
            throw new InputError(k, patch[k], 'cannot be changed after creation');
          }
        }
        const extra = spec.extraInput ? await spec.extraInput(tx, previous as T) : {};
        const merged = { ...pick(previous, keys), ...extra, ...patch };
        const checked = parseInput(schema, merged);
        const joined = changedFields(extra, pick(checked as Row, Object.keys(extra)));
        const row = await crud.updateIn(
          tx,
          entity,
          actor,
          id,
          toRow(checked, actor),
          version,
          joined,
        );
        if (spec.after) await spec.after(tx, actor, row, checked, patch);
        return row;
      }),
    remove: (actor, id) => crud.remove(db, entity, actor, id),
  };
}
