/**
 * All-or-nothing CSV imports; the report lists every bad row with its line, column, value and
 * rule. Targets and orbit solutions (small files) are written inside one transaction through the
 * same repositories as the API (so every rule applies, including references to rows earlier in the
 * file); any bad row rolls the whole file back, and a dry run does everything and then rolls back.
 * Measurements (files of 100,000 rows) are checked first and staged in short batches, then moved in
 * at once (import-measurements.ts), so a long import never holds the write lock for its length.
 */
import { and, eq } from 'drizzle-orm';
import { systems, targets } from '../../../db/schema.ts';
import {
  CORRELATIONS_COLUMN,
  COVARIANCE_TERMS,
  THIELE_INNES_TERMS,
  covarianceOf,
  parseCorrelations,
  sigmaColumn,
  type UncertainTerm,
} from '../../../descriptors/covariance.ts';
import { InputError } from '../../science/errors.ts';
import { recordAudit, type Actor } from '../audit.ts';
import type { DbOrTx, Tx } from '../database.ts';
import type { StoreContext } from '../context.ts';
import type { CsvKind } from './columns.ts';
import { writeMeasurements } from './import-measurements.ts';
import { fileDigest, repeatedFileProblem } from './repeated-file.ts';
import {
  prepareMeasurements,
  unpackMeasurements,
  type PackedMeasurements,
  type PreparedMeasurements,
} from './measurement-rows.ts';
import {
  ImportRejected,
  cellValues,
  readCsv,
  rowProblems,
  type ImportProblem,
  type ImportReport,
  type Record_,
} from './read.ts';

export { ImportRejected, type ImportReport } from './read.ts';

export interface ImportOptions {
  dryRun?: boolean;
  /** Import a file already imported, and rows that repeat stored measurements (default: refused). */
  allowDuplicates?: boolean;
  /** Called after each row is written inside the transaction (progress; tests use it to crash mid-way). */
  onRow?: (index: number) => void | Promise<void>;
}

class Rollback extends Error {}

/** Names already resolved in this import (a file usually repeats a few targets many times). */
type NameCache = Map<string, number>;

async function targetIdOf(
  tx: DbOrTx,
  system: unknown,
  target: unknown,
  cache: NameCache,
): Promise<number> {
  const key = JSON.stringify([system, target]);
  const hit = cache.get(key);
  if (hit !== undefined) return hit;
  const id = await lookupTarget(tx, system, target);
  cache.set(key, id);
  return id;
}

async function lookupTarget(tx: DbOrTx, system: unknown, target: unknown): Promise<number> {
  if (typeof system !== 'string')
    throw new InputError('system', system, 'is required: the name of a stored system');
  const [sys] = await tx.select({ id: systems.id }).from(systems).where(eq(systems.name, system));
  if (!sys) throw new InputError('system', system, 'does not name a stored system');
  if (typeof target !== 'string')
    throw new InputError('target', target, 'is required: the name of a target of the system');
  const [t] = await tx
    .select({ id: targets.id })
    .from(targets)
    .where(and(eq(targets.systemId, sys.id), eq(targets.name, target)));
  if (!t)
    throw new InputError('target', target, `is not a target of system ${JSON.stringify(system)}`);
  return t.id;
}

const RELATIVITY = ['romer', 'gravitationalRedshift', 'transverseDoppler', 'precession'];
const FACTOR_COLUMNS = ['redshiftFactor', 'precessionFactor'];

/** One CSV row to the JSON input of the repository. */
async function toInput(
  tx: DbOrTx,
  kind: CsvKind,
  cells: Record_,
  cache: NameCache,
): Promise<Record<string, unknown>> {
  const v = cellValues(cells);
  if (kind === 'targets') {
    if (typeof v.system !== 'string')
      throw new InputError('system', v.system, 'is required: the name of a stored system');
    const [sys] = await tx
      .select({ id: systems.id })
      .from(systems)
      .where(eq(systems.name, v.system));
    if (!sys) throw new InputError('system', v.system, 'does not name a stored system');
    const { system: _s, ...rest } = v;
    return { ...rest, systemId: sys.id };
  }
  const targetId = await targetIdOf(tx, v.system, v.target, cache);
  const on = typeof v.relativity === 'string' ? v.relativity.split(/[\s;|]+/).filter(Boolean) : [];
  for (const s of on)
    if (!RELATIVITY.includes(s))
      throw new InputError(
        'relativity',
        s,
        `is not a switch; use ${RELATIVITY.join(', ')} separated by ";"`,
      );
  const elementKeys = [
    'kind',
    'periodYears',
    'periapsis',
    'eccentricity',
    'semiMajorAxisArcsec',
    'inclinationDeg',
    'ascendingNodeDeg',
    'argPeriapsisDeg',
    'aArcsec',
    'bArcsec',
    'fArcsec',
    'gArcsec',
  ];
  const elements = Object.fromEntries(
    elementKeys.filter((k) => v[k] !== undefined).map((k) => [k, v[k]]),
  );
  const covariance = covarianceCells(v);
  const factors = Object.fromEntries(
    FACTOR_COLUMNS.filter((k) => v[k] !== undefined).map((k) => [k, v[k]]),
  );
  return {
    targetId,
    orbit: {
      elements,
      ...(v.distancePc !== undefined ? { distancePc: v.distancePc } : {}),
      ...(v.systemicVelocityKmS !== undefined
        ? { systemicVelocityKmS: v.systemicVelocityKmS }
        : {}),
      ...(v.massRatio !== undefined ? { massRatio: v.massRatio } : {}),
      ...(v.lightFraction !== undefined ? { lightFraction: v.lightFraction } : {}),
      ...(on.length ? { relativity: Object.fromEntries(on.map((s) => [s, true])) } : {}),
      ...(Object.keys(factors).length ? { relativityFactors: factors } : {}),
      ...(covariance ? { covariance } : {}),
    },
    provenance: 'imported',
    reference: v.reference,
    notes: v.notes,
    makeCurrent: v.makeCurrent,
  };
}

/** The σ columns and the correlations cell of an orbit row as a covariance, or none when no σ is given. */
function covarianceCells(v: Record<string, unknown>) {
  const sigmas = Object.fromEntries(
    [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS].flatMap((t) => {
      const x = v[sigmaColumn(t.parameter)];
      return x === undefined ? [] : [[t.parameter, x]];
    }),
  ) as Partial<Record<UncertainTerm, number>>;
  const text = v[CORRELATIONS_COLUMN];
  const correlations = typeof text === 'string' ? parseCorrelations(text) : [];
  if (!Array.isArray(correlations))
    throw new InputError(CORRELATIONS_COLUMN, correlations.value, correlations.rule);
  const cov = covarianceOf(sigmas, correlations);
  if (cov && 'rule' in cov) throw new InputError(cov.field, cov.value, cov.rule);
  return cov;
}

/** Import a CSV file of `kind`: all rows or none (ImportRejected lists every bad row). */
export async function importCsv(
  store: StoreContext,
  actor: Actor,
  kind: CsvKind,
  text: string,
  options: ImportOptions = {},
): Promise<ImportReport> {
  if (kind === 'measurements')
    return importMeasurementRows(store, actor, prepareMeasurements(text), options);
  const { rows } = readCsv(kind, text);
  const digest = fileDigest(text);
  const dryRun = options.dryRun ?? false;
  const repo = kind === 'targets' ? store.targets : store.orbitSolutions;
  const problems: ImportProblem[] = [];
  const report: ImportReport = { kind, dryRun, rows: rows.length, written: 0, problems };
  await rollingBack(store, async (tx) => {
    const repeated = options.allowDuplicates ? null : await repeatedFileProblem(tx, kind, digest);
    if (repeated) problems.push(repeated);
    const cache: NameCache = new Map();
    for (const [i, { line, cells }] of rows.entries()) {
      try {
        await repo.createIn(tx, actor, await toInput(tx, kind, cells, cache));
      } catch (err) {
        problems.push(...rowProblems(err, line));
      }
      await options.onRow?.(i);
    }
    if (problems.length > 0 || dryRun) throw new Rollback();
    await recordAudit(tx, actor, 'import', kind, null, { rows: rows.length, digest });
  });
  return finish(report);
}

/**
 * Write a measurements file already parsed and checked on a worker thread
 * (`prepareMeasurementsPacked`): unpacked in short steps, checked against the store, staged in
 * short batches, then moved in at once (import-measurements.ts).
 */
export async function importPreparedMeasurements(
  store: StoreContext,
  actor: Actor,
  packed: PackedMeasurements,
  options: ImportOptions = {},
): Promise<ImportReport> {
  return importMeasurementRows(store, actor, await unpackMeasurements(packed), options);
}

async function importMeasurementRows(
  store: StoreContext,
  actor: Actor,
  prepared: PreparedMeasurements,
  options: ImportOptions,
): Promise<ImportReport> {
  const dryRun = options.dryRun ?? false;
  const problems = await writeMeasurements(store.db, actor, prepared, {
    dryRun,
    allowDuplicates: options.allowDuplicates ?? false,
    ...(options.onRow ? { onRow: options.onRow } : {}),
  });
  return finish({ kind: 'measurements', dryRun, rows: prepared.total, written: 0, problems });
}

/** Run `write` in a transaction; a Rollback thrown inside undoes it quietly. */
async function rollingBack(store: StoreContext, write: (tx: Tx) => Promise<void>): Promise<void> {
  try {
    await store.db.transaction(write);
  } catch (err) {
    if (!(err instanceof Rollback)) throw err;
  }
}

function finish(report: ImportReport): ImportReport {
  if (report.problems.length > 0) throw new ImportRejected(report);
  report.written = report.dryRun ? 0 : report.rows;
  return report;
}
