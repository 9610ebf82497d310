/**
 * What the store's own modules share: the database handle and the entity repositories over it.
 * It never leaves the store; createStore (index.ts) builds the public surface from it.
 */
import type { Database, Db } from './database.ts';
import { campaignRepository } from './repos/campaigns.ts';
import { systemRepository, targetRepository } from './repos/catalogue.ts';
import { measurementRepository } from './repos/measurements.ts';
import { blockRepository, nightRepository } from './repos/nights.ts';
import { orbitSolutionRepository } from './repos/orbits.ts';
import { nightReportRepository } from './repos/reports.ts';
import { siteRepository } from './repos/sites.ts';
import { userRepository } from './repos/users.ts';

export function repositories(db: Db) {
  return {
    systems: systemRepository(db),
    targets: targetRepository(db),
    orbitSolutions: orbitSolutionRepository(db),
    sites: siteRepository(db),
    campaigns: campaignRepository(db),
    nights: nightRepository(db),
    blocks: blockRepository(db),
    nightReports: nightReportRepository(db),
    measurements: measurementRepository(db),
    users: userRepository(db),
  };
}
export type Repositories = ReturnType<typeof repositories>;

/** The repositories with the handle they write through, for writes that span several of them. */
export interface StoreContext extends Repositories {
  db: Db;
  database: Database;
}

export function storeContext(database: Database): StoreContext {
  return { ...repositories(database.db), db: database.db, database };
}

const contexts = new WeakMap<object, StoreContext>();

export function registerContext(store: object, context: StoreContext): void {
  contexts.set(store, context);
}

/** The context behind a store made by createStore (for store modules and store tests only). */
export function contextOf(store: object): StoreContext {
  const context = contexts.get(store);
  if (!context) throw new Error('not a store made by createStore');
  return context;
}
