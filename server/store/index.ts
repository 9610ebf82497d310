/** The campaign store: one repository per entity over one libSQL database. */
import type { Database } from './database.ts';
import { campaignRepository } from './repos/campaigns.ts';
import { systemRepository, targetRepository } from './repos/catalogue.ts';
import { measurementRepository } from './repos/measurements.ts';
import { blockRepository, nightRepository } from './repos/nights.ts';
import { orbitSolutionRepository } from './repos/orbits.ts';
import { nightReportRepository } from './repos/reports.ts';
import { siteRepository } from './repos/sites.ts';
import { userRepository } from './repos/users.ts';

export function createStore(database: Database) {
  const { db } = database;
  return {
    database,
    db,
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
export type Store = ReturnType<typeof createStore>;

export { openDatabase, resolveDatabaseUrl, type Database, type OpenOptions } from './database.ts';
export { LOCAL_OPERATOR, type Actor } from './audit.ts';
export { ConflictError, NotFoundError } from './errors.ts';
export type { Page, PageRequest } from './crud.ts';
