/**
 * The heavy computations a worker thread may run, by name: the science functions themselves (and
 * the database-free half of an import), called as they are. Arguments and results are plain,
 * structured-clonable data. The server runs them through the pool (`pool.ts`); the CLI and the
 * tests call `inProcess`, the same functions on the calling thread.
 */
import { prepareMeasurementsPacked } from '../store/csv/measurement-rows.ts';
import { ComputationError, InputError } from '../science/errors.ts';
import { fitOrbits, FitRefusal, type FitRequest } from '../science/orbit/fit/index.ts';
import { pageResiduals, type ResidualPageRequest } from '../science/orbit/fit/residual-page.ts';
import { calendarText } from '../store/exports/calendar-text.ts';
import { ephemerisCsv } from '../store/exports/ephemeris.ts';
import { measurementsCsv } from '../store/exports/measurements.ts';
import { residualsCsv } from '../store/exports/residuals.ts';
import { ephemeris, eventsWithUncertainty } from '../science/orbit/ephemeris.ts';
import {
  computeFlags,
  forecastDetection,
  planSeason,
  scheduleNight,
} from '../science/plan/index.ts';
import { seasonMonteCarlo } from '../science/plan/season-monte-carlo.ts';
import {
  nightReport,
  reviveSite,
  seasonMap,
  seasonReport,
  type Site,
} from '../science/sky/index.ts';
import { ImportRejected } from '../store/csv/read.ts';

type SeasonArgs = Parameters<typeof seasonMap>;
type Rest<F extends (...a: never[]) => unknown> =
  Parameters<F> extends [unknown, ...infer R] ? R : never;

export const TASKS = {
  fitOrbits,
  /** A fit answered with one page of residuals and their summary (HTTP: a bounded answer). */
  fitPage: (request: FitRequest, page?: ResidualPageRequest) =>
    pageResiduals(fitOrbits(request), page),
  /** Every residual of a fit as CSV, written on the worker (a large fit's text never blocks the server). */
  fitResidualsCsv: (request: FitRequest) => residualsCsv(fitOrbits(request).residuals),
  planSeason: (...[start, end, sites, ...rest]: Parameters<typeof planSeason>) =>
    planSeason(
      start,
      end,
      sites.map((s) => ({ ...s, site: reviveSite(s.site) })),
      ...rest,
    ),
  scheduleNight: (site: Site, ...rest: Rest<typeof scheduleNight>) =>
    scheduleNight(reviveSite(site), ...rest),
  nightReport: (site: Site, ...rest: Rest<typeof nightReport>) =>
    nightReport(reviveSite(site), ...rest),
  /** The season map and its report in one job (the report reads the map). */
  seasonReport: (site: Site, ...rest: Rest<typeof seasonMap>) =>
    seasonReport(reviveSite(site), seasonMap(reviveSite(site), ...rest), rest[2] as SeasonArgs[3]),
  /** Draws of a planned season; kept blocks are placed on the sky, so the sites need their observers. */
  seasonMonteCarlo: (
    plan: Parameters<typeof seasonMonteCarlo>[0],
    sites: Parameters<typeof seasonMonteCarlo>[1],
    targets: Parameters<typeof seasonMonteCarlo>[2],
    options: Parameters<typeof seasonMonteCarlo>[3],
  ) =>
    seasonMonteCarlo(
      plan,
      sites.map((s) => ({ ...s, site: reviveSite(s.site) })),
      targets,
      options,
    ),
  ephemeris,
  /** An ephemeris written as CSV where it is computed (large tables never block the server). */
  ephemerisCsv: (...args: Parameters<typeof ephemeris>) => ephemerisCsv(ephemeris(...args)),
  eventsWithUncertainty,
  computeFlags: (
    targets: Parameters<typeof computeFlags>[0],
    sites: Parameters<typeof computeFlags>[1],
    options: Parameters<typeof computeFlags>[2],
  ) =>
    computeFlags(
      targets,
      sites.map((s) => ({ ...s, site: reviveSite(s.site) })),
      options,
    ),
  /** When the relativistic terms become detectable: a Fisher matrix over every measurement. */
  forecastDetection,
  /** The database-free half of a measurements import, its rows packed for the trip back. */
  prepareMeasurementsPacked,
  measurementsCsv,
  /** A campaign's iCalendar feed from its gathered rows: darkness, passages and the text. */
  calendarText,
};

export type Tasks = typeof TASKS;
export type TaskName = keyof Tasks;
export type TaskArgs<K extends TaskName> = Tasks[K] extends (...a: infer A) => unknown ? A : never;
export type TaskResult<K extends TaskName> = Tasks[K] extends (...a: never[]) => infer R
  ? R
  : never;

/** Runs a task somewhere (a worker thread, or here) and resolves with its result. */
export type Runner = <K extends TaskName>(name: K, ...args: TaskArgs<K>) => Promise<TaskResult<K>>;

/** The tasks on the calling thread (the CLI, tests, a server without a pool). */
export const inProcess: Runner = async (name, ...args) =>
  (TASKS[name] as (...a: unknown[]) => never)(...args);

/** An error as plain data, so it survives the trip back from a worker thread. */
export type ErrorData =
  | {
      type: 'InputError';
      field: string;
      value: unknown;
      rule: string;
      problems: InputError['problems'];
    }
  | { type: 'FitRefusal'; reason: FitRefusal['reason']; message: string; parameters: string[] }
  | { type: 'ComputationError'; message: string }
  | { type: 'ImportRejected'; report: ImportRejected['report'] }
  | { type: 'Error'; message: string; stack?: string };

export function errorToData(err: unknown): ErrorData {
  if (err instanceof InputError)
    return {
      type: 'InputError',
      field: err.field,
      value: err.value,
      rule: err.rule,
      problems: err.problems,
    };
  if (err instanceof FitRefusal)
    return {
      type: 'FitRefusal',
      reason: err.reason,
      message: err.message,
      parameters: err.parameters,
    };
  if (err instanceof ComputationError) return { type: 'ComputationError', message: err.message };
  if (err instanceof ImportRejected) return { type: 'ImportRejected', report: err.report };
  const e = err instanceof Error ? err : new Error(String(err));
  return { type: 'Error', message: e.message, ...(e.stack ? { stack: e.stack } : {}) };
}

export function errorFromData(d: ErrorData): Error {
  switch (d.type) {
    case 'InputError':
      return new InputError(d.field, d.value, d.rule, d.problems);
    case 'FitRefusal':
      return new FitRefusal(d.reason, d.message, d.parameters);
    case 'ComputationError':
      return new ComputationError(d.message);
    case 'ImportRejected':
      return new ImportRejected(d.report);
    case 'Error': {
      const e = new Error(`in a worker thread: ${d.message}`);
      if (d.stack) e.stack = d.stack;
      return e;
    }
  }
}
