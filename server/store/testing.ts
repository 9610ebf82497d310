/**
 * For tests only: the database behind a store, to count rows, run raw SQL and re-run migrations.
 * Server code never imports this (test/architecture.test.ts).
 */
import { contextOf } from './context.ts';
import type { Database } from './database.ts';
import type { Store } from './store.ts';

export function databaseOf(store: Store): Database {
  return contextOf(store).database;
}
