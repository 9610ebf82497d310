/**
 * Output for people (aligned tables), programs (JSON) and spreadsheets (CSV, RFC 4180 via csv-stringify).
 */
import { stringify } from 'csv-stringify/sync';
import { escapeFormulaCell } from '../store/index.ts';

export type OutputFormat = 'table' | 'json' | 'csv';

/** `1 block`, `2 blocks`: a count with its noun. */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** A column of a table: its header (with unit) and how to show a row's value. */
export interface Column<Row> {
  header: string;
  value: (row: Row) => string | number | null | undefined;
  /** Digits after the decimal point for numbers (default: as printed by JS). */
  digits?: number;
}

function cell<Row>(col: Column<Row>, row: Row): string {
  const v = col.value(row);
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) return String(v);
    return col.digits === undefined ? String(v) : v.toFixed(col.digits);
  }
  return v;
}

const RULE_MAX = 60;

/** An aligned text table: numbers right-aligned, text left-aligned. */
export function formatTable<Row>(rows: readonly Row[], columns: readonly Column<Row>[]): string {
  const cells = rows.map((r) => columns.map((c) => cell(c, r)));
  const numeric = columns.map(
    (c, j) =>
      rows.length > 0 &&
      rows.every((r) => {
        const v = c.value(r);
        return v === null || v === undefined || typeof v === 'number';
      }) &&
      j >= 0,
  );
  const widths = columns.map((c, j) =>
    Math.max(c.header.length, ...cells.map((row) => row[j]!.length)),
  );
  const pad = (s: string, j: number) =>
    numeric[j] ? s.padStart(widths[j]!) : s.padEnd(widths[j]!);
  // A long text column at the end (reasons, notes) wraps in the terminal anyway: its rule stops at
  // RULE_MAX characters instead of running for the length of its longest cell.
  const last = columns.length - 1;
  const rule = (w: number, j: number) =>
    j === last && !numeric[j] ? Math.min(w, Math.max(columns[j]!.header.length, RULE_MAX)) : w;
  const lines = [
    columns
      .map((c, j) => pad(c.header, j))
      .join('  ')
      .trimEnd(),
    widths.map((w, j) => '-'.repeat(rule(w, j))).join('  '),
  ];
  for (const row of cells)
    lines.push(
      row
        .map((s, j) => pad(s, j))
        .join('  ')
        .trimEnd(),
    );
  return `${lines.join('\n')}\n`;
}

export function formatCsv<Row>(rows: readonly Row[], columns: readonly Column<Row>[]): string {
  return stringify([
    columns.map((c) => c.header),
    // Text cells escaped against spreadsheet formulas (see store/csv/cells.ts); numbers as they are.
    ...rows.map((r) =>
      columns.map((c) =>
        typeof c.value(r) === 'string' ? escapeFormulaCell(cell(c, r)) : cell(c, r),
      ),
    ),
  ]);
}

/** Render rows in the chosen format; `json` prints `jsonValue` (the full structured result). */
export function render<Row>(
  format: OutputFormat,
  rows: readonly Row[],
  columns: readonly Column<Row>[],
  jsonValue: unknown,
): string {
  switch (format) {
    case 'json':
      return `${JSON.stringify(jsonValue, null, 2)}\n`;
    case 'csv':
      return formatCsv(rows, columns);
    case 'table':
      return formatTable(rows, columns);
  }
}
