/**
 * The store's public surface: the entity repositories, and the views, plans, fits, imports and
 * exports over them, each with the database handle already supplied, so no caller holds it.
 */
import { acceptAllocations, previewAllocations } from './allocations/allocate.ts';
import { backupDatabase } from './backup.ts';
import { readArchive, writeArchive } from './archive.ts';
import { registerContext, storeContext } from './context.ts';
import { importCsv, importPreparedMeasurements } from './csv/import.ts';
import type { Database } from './database.ts';
import { loadDemo } from './demo/load.ts';
import { campaignCalendar } from './exports/calendar.ts';
import { measurementsForExport } from './exports/measurements.ts';
import { orbitsForExport } from './exports/orbits.ts';
import { acceptStoredFit, prepareStoredFit, systemTargetIds } from './fits.ts';
import { auditLog } from './repos/audit.ts';
import { acceptNightSchedule, previewNightSchedule } from './views/night-plan.ts';
import { targetForecast } from './views/forecast.ts';
import { cachedCampaignFlags } from './views/flags-cache.ts';
import { acceptSeasonPlan, previewSeasonPlan } from './views/season-plan.ts';
import { nightVisibility, storedSky } from './views/visibility.ts';
import { clearPriorOf, replaceClearPrior } from './repos/clear-priors.ts';
import { siteStatisticsView } from './views/site-statistics.ts';
import { seasonPlanDraws } from './views/season-draws.ts';
import { acceptReplan, previewReplan } from './views/replan.ts';
import { timeRequestView } from './views/time-request.ts';

// biome-ignore lint/suspicious/noExplicitAny: the first parameter is dropped, whatever its type
type WithoutFirst<F> = F extends (first: any, ...rest: infer R) => infer O
  ? (...rest: R) => O
  : never;
/** `f` with its first argument (the database or the store's context) supplied. */
function bind<C, F extends (first: C, ...rest: never[]) => unknown>(
  first: C,
  f: F,
): WithoutFirst<F> {
  return ((...rest: never[]) => f(first, ...rest)) as WithoutFirst<F>;
}

export function createStore(database: Database) {
  const context = storeContext(database);
  const { db, database: _database, ...repositories } = context;
  const store = {
    ...repositories,
    audit: auditLog(db),
    plans: {
      /** Periapsis, blend and stale-prediction flags of a campaign's targets (kept until a write). */
      flags: cachedCampaignFlags(db),
      previewSeason: bind(db, previewSeasonPlan),
      acceptSeason: bind(context, acceptSeasonPlan),
      previewNight: bind(db, previewNightSchedule),
      acceptNight: bind(context, acceptNightSchedule),
      /** The rest of a season planned again after a night that lost time: preview, then accept. */
      previewReplan: bind(db, previewReplan),
      acceptReplan: bind(context, acceptReplan),
      /** A semester's time request: hours per site, target and kind, weather allowance, expected results. */
      timeRequest: bind(db, timeRequestView),
      /** The season plan drawn N times under the learned weather: σ percentiles, coverage. */
      seasonDraws: bind(db, seasonPlanDraws),
      /** When the relativistic terms of a target become detectable with its planned blocks. */
      forecast: bind(db, targetForecast),
    },
    /**
     * A campaign's allocated nights in bulk (a pattern, a CSV file, a telescope's calendar):
     * preview, then all or none.
     */
    allocations: {
      preview: bind(context, previewAllocations),
      accept: bind(context, acceptAllocations),
    },
    /** What a site's log has learned (loss per month by the Beta-prior rule, seeing, precision) and its priors. */
    siteWeather: {
      statistics: bind(db, siteStatisticsView),
      prior: bind(db, clearPriorOf),
      replacePrior: bind(db, replaceClearPrior),
    },
    /** The sky engine's night report for a stored night and its campaign's targets. */
    nightVisibility: bind(db, nightVisibility),
    storedSky: bind(db, storedSky),
    fits: {
      /** The targets of a system that have measurements (some of them with `only`). */
      systemTargetIds: bind(context, systemTargetIds),
      prepare: bind(context, prepareStoredFit),
      accept: bind(context, acceptStoredFit),
    },
    /** A CSV file of targets, orbit solutions or measurements: all rows or none. */
    importCsv: bind(context, importCsv),
    /** A measurements file already parsed and checked (`prepareMeasurementsPacked`, on a worker): the writes. */
    importPreparedMeasurements: bind(context, importPreparedMeasurements),
    exports: {
      measurements: bind(db, measurementsForExport),
      orbits: bind(db, orbitsForExport),
      calendar: bind(db, campaignCalendar),
    },
    loadDemo: bind(context, loadDemo),
    /** A consistent copy of a local database file (VACUUM INTO). */
    backup: (path: string) => backupDatabase(database, path),
    /** Every stored table but the tokens, as JSON rows with their ids (a campaign archive). */
    archive: () => writeArchive(database),
    /** An archive written into this database, which must be empty: all of it or nothing. */
    restoreArchive: (archive: unknown) => readArchive(database, archive),
    url: database.url,
    close: () => database.close(),
  };
  registerContext(store, context);
  return store;
}
export type Store = ReturnType<typeof createStore>;
