/**
 * Reading an import file: CSV to rows of cells (with line numbers), cells to values, and the
 * report and rejection every import gives. No database here, so a worker thread can run it.
 */
import { parse } from 'csv-parse/sync';
import { InputError, refuseDecimalComma, type FieldProblem } from '../../science/errors.ts';
import { COLUMNS, NUMERIC, REQUIRED_COLUMNS, type CsvKind } from './columns.ts';
import { isDecimal, unescapeFormulaCell } from './cells.ts';

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
      `${report.problems.length} problem(s) in ${report.kind} CSV; nothing was written (first: ` +
        `line ${report.problems[0]?.line}, ${report.problems[0]?.column}: ` +
        `${report.problems[0]?.rule})`,
    );
  }
}

export type Record_ = Record<string, string>;
const MAX_ROWS = 200_000;

export function readCsv(
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

/** A cell as the value the schemas check (cells.ts: numbers plain decimals, formulas unescaped). */
export function cellValue(column: string, cell: string): unknown {
  if (cell === '') return undefined;
  if (NUMERIC.has(column)) {
    refuseDecimalComma(cell, column, cell); // `1,5` is refused with the fix named, never read as 15
    if (!isDecimal(cell))
      throw new InputError(
        column,
        cell,
        'must be a decimal number such as 12.5, -0.25 or 3e-4 (no spaces, hexadecimal or words)',
      );
    return Number(cell);
  }
  if (column === 'makeCurrent') return cell === 'true' ? true : cell === 'false' ? false : cell;
  return unescapeFormulaCell(cell);
}

/**
 * Every cell of a row as a value; InputError for the first bad cell, with every bad cell in
 * `problems` (as `parseInput` reports a schema's).
 */
export function cellValues(cells: Record_): Record<string, unknown> {
  const values: Record<string, unknown> = {};
  const problems: FieldProblem[] = [];
  for (const [k, c] of Object.entries(cells)) {
    try {
      values[k] = cellValue(k, c);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      problems.push({ field: err.field, value: err.value, rule: err.rule });
    }
  }
  const first = problems[0];
  if (first) throw new InputError(first.field, first.value, first.rule, problems);
  return values;
}

/** The problems of one row from what its checks threw (anything else is rethrown). */
export function rowProblems(err: unknown, line: number): ImportProblem[] {
  if (err instanceof InputError) {
    // An InputError thrown for one field carries an empty list: it is then the row's one problem.
    const list = err.problems.length
      ? err.problems
      : [{ field: err.field, value: err.value, rule: err.rule }];
    return list.map((p) => ({ line, column: columnOf(p.field), value: p.value, rule: p.rule }));
  }
  if (err instanceof Error && ['ConflictError', 'NotFoundError'].includes(err.name))
    return [{ line, column: '(row)', value: null, rule: err.message }];
  throw err;
}

/** The CSV column a field path of the repository input refers to. */
export function columnOf(field: string): string {
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
