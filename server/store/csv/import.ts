/**
 * All-or-nothing CSV imports. Every row is written inside one transaction through the same
 * repositories as the API (so every rule applies, including references to rows earlier in the
 * file); any bad row rolls the whole file back, and the report lists every bad row with its line,
 * column, value and rule. A dry run does everything and then rolls back.
 */
import { parse } from 'csv-parse/sync';
import { and, eq } from 'drizzle-orm';
import { systems, targets } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { recordAudit, type Actor } from '../audit.ts';
import type { DbOrTx } from '../database.ts';
import type { Store } from '../index.ts';
import type { RowProblem } from '../schemas/common.ts';
import { COLUMNS, NUMERIC, REQUIRED_COLUMNS, type CsvKind } from './columns.ts';

export interface ImportProblem {
  /** Line in the file (1 = header). */
  line: number;
  column: string;
  value: unknown;
  rule: string;
}

export interface ImportReport {
  kind: CsvKind;
  dryRun: boolean;
  rows: number;
  /** Rows written (0 in a dry run or when anything failed). */
  written: number;
  problems: ImportProblem[];
}

/** Thrown when any row is bad: nothing was written; `report.problems` lists every bad row. */
export class ImportRejected extends Error {
  override readonly name = 'ImportRejected';
  constructor(readonly report: ImportReport) {
    super(
      `${report.problems.length} problem(s) in ${report.kind} CSV; nothing was written (first: line ${report.problems[0]?.line}, ${report.problems[0]?.column}: ${report.problems[0]?.rule})`,
    );
  }
}

export interface ImportOptions {
  dryRun?: boolean;
  /** Called after each row is written inside the transaction (progress; tests use it to crash mid-way). */
  onRow?: (index: number) => void | Promise<void>;
}

class Rollback extends Error {}

type Record_ = Record<string, string>;
const MAX_ROWS = 200_000;

function readCsv(
  kind: CsvKind,
  text: string,
): { header: string[]; rows: { line: number; cells: Record_ }[] } {
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, {
      info: true,
      skip_empty_lines: true,
      trim: true,
      bom: true,
      relax_column_count: false,
    }) as never;
  } catch (err) {
    const e = err as Error & { lines?: number };
    throw new ImportRejected({
      kind,
      dryRun: false,
      rows: 0,
      written: 0,
      problems: [
        {
          line: e.lines ?? 0,
          column: '(file)',
          value: null,
          rule: `is not valid CSV: ${e.message}`,
        },
      ],
    });
  }
  const [head, ...body] = records;
  const problems: ImportProblem[] = [];
  if (!head)
    problems.push({
      line: 1,
      column: '(header)',
      value: null,
      rule: 'the file is empty; the first line must name the columns',
    });
  const header = head?.record ?? [];
  const known = COLUMNS[kind];
  header.forEach((h) => {
    if (!known.includes(h))
      problems.push({
        line: 1,
        column: h,
        value: h,
        rule: `is not a column of ${kind} CSV; known: ${known.join(', ')}`,
      });
  });
  for (const r of REQUIRED_COLUMNS[kind])
    if (head && !header.includes(r))
      problems.push({ line: 1, column: r, value: null, rule: 'is a required column' });
  if (body.length > MAX_ROWS)
    problems.push({
      line: 1,
      column: '(file)',
      value: body.length,
      rule: `has more than ${MAX_ROWS} rows; split it`,
    });
  if (problems.length)
    throw new ImportRejected({ kind, dryRun: false, rows: body.length, written: 0, problems });
  const rows = body.map(({ record, info }) => ({
    line: info.lines,
    cells: Object.fromEntries(header.map((h, j) => [h, record[j] ?? ''])),
  }));
  return { header, rows };
}

function cellValue(column: string, cell: string): unknown {
  if (cell === '') return undefined;
  if (NUMERIC.has(column)) {
    const x = Number(cell);
    return Number.isFinite(x) ? x : cell;
  }
  if (column === 'makeCurrent') return cell === 'true' ? true : cell === 'false' ? false : cell;
  return cell;
}

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

/** One CSV row to the JSON input of the repository. */
async function toInput(
  tx: DbOrTx,
  kind: CsvKind,
  cells: Record_,
  cache: NameCache,
): Promise<Record<string, unknown>> {
  const v: Record<string, unknown> = Object.fromEntries(
    Object.entries(cells).map(([k, c]) => [k, cellValue(k, c)]),
  );
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
  const { system: _s, target: _t, ...rest } = v;
  if (kind === 'measurements') return { ...rest, targetId };
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
  return {
    targetId,
    orbit: {
      elements,
      ...(v.distancePc !== undefined ? { distancePc: v.distancePc } : {}),
      ...(v.systemicVelocityKmS !== undefined
        ? { systemicVelocityKmS: v.systemicVelocityKmS }
        : {}),
      ...(on.length ? { relativity: Object.fromEntries(on.map((s) => [s, true])) } : {}),
    },
    provenance: 'imported',
    reference: v.reference,
    notes: v.notes,
    makeCurrent: v.makeCurrent,
  };
}

/** The CSV column a field path of the repository input refers to. */
function columnOf(field: string): string {
  const last =
    field
      .split('.')
      .filter((p) => !/^\d+$/.test(p))
      .pop() ?? field;
  if (last === 'targetId') return 'target';
  if (last === 'systemId') return 'system';
  if (field.startsWith('orbit.relativity')) return 'relativity';
  return last;
}

function problemsOf(err: unknown, line: number): ImportProblem[] {
  if (err instanceof InputError) {
    const list: RowProblem[] = (err as InputError & { problems?: RowProblem[] }).problems ?? [
      { field: err.field, value: err.value, rule: err.rule },
    ];
    return list.map((p) => ({ line, column: columnOf(p.field), value: p.value, rule: p.rule }));
  }
  if (err instanceof Error && ['ConflictError', 'NotFoundError'].includes(err.name))
    return [{ line, column: '(row)', value: null, rule: err.message }];
  throw err;
}

export async function importCsv(
  store: Store,
  actor: Actor,
  kind: CsvKind,
  text: string,
  options: ImportOptions = {},
): Promise<ImportReport> {
  const { rows } = readCsv(kind, text);
  const dryRun = options.dryRun ?? false;
  const repo =
    kind === 'targets'
      ? store.targets
      : kind === 'orbits'
        ? store.orbitSolutions
        : store.measurements;
  const problems: ImportProblem[] = [];
  const report: ImportReport = { kind, dryRun, rows: rows.length, written: 0, problems };
  try {
    await store.db.transaction(async (tx) => {
      const cache: NameCache = new Map();
      for (const [i, { line, cells }] of rows.entries()) {
        try {
          await repo.createIn(tx, actor, await toInput(tx, kind, cells, cache));
        } catch (err) {
          problems.push(...problemsOf(err, line));
        }
        await options.onRow?.(i);
      }
      if (problems.length > 0 || dryRun) throw new Rollback();
      await recordAudit(tx, actor, 'import', kind, null, { rows: rows.length });
    });
  } catch (err) {
    if (!(err instanceof Rollback)) throw err;
  }
  if (problems.length > 0) throw new ImportRejected(report);
  report.written = dryRun ? 0 : rows.length;
  return report;
}
