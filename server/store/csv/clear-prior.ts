/**
 * A site's clear-night prior from CSV: a header with `month` and `clear_fraction` (and optionally
 * `strength_nights`), one row per month that has a prior. Cells follow csv/cells.ts (plain
 * decimals); an error names the line, the column and the rule, and nothing is read in part.
 */
import { parse } from 'csv-parse/sync';
import { InputError } from '../../science/errors.ts';
import { checkMonthPriors, type MonthPrior } from '../repos/clear-priors.ts';
import { isDecimal } from './cells.ts';

export const CLEAR_PRIOR_COLUMNS = ['month', 'clear_fraction', 'strength_nights'] as const;
const CSV_COLUMN_OF: Record<string, string> = {
  month: 'month',
  clearFraction: 'clear_fraction',
  strengthNights: 'strength_nights',
};

/** Weight of a CSV row without `strength_nights`, nights, unless the request gives one. */
export const DEFAULT_PRIOR_STRENGTH_NIGHTS = 10;

/**
 * @param defaultStrengthNights weight of rows without `strength_nights`, (0, 1000]
 * @throws InputError naming `line N column` and the rule
 */
export function readClearPriorCsv(text: string, defaultStrengthNights: number): MonthPrior[] {
  let rows: string[][];
  try {
    rows = parse(text, {
      skip_empty_lines: true,
      trim: true,
      bom: true,
      relax_column_count: true,
    }) as string[][];
  } catch (err) {
    throw new InputError('csv', null, `is not valid CSV: ${(err as Error).message}`);
  }
  const [head, ...body] = rows;
  if (!head) throw new InputError('csv', '', 'is empty: give a header month,clear_fraction');
  const col = (name: string) => head.indexOf(name);
  for (const name of head)
    if (!(CLEAR_PRIOR_COLUMNS as readonly string[]).includes(name))
      throw new InputError(
        'line 1',
        name,
        `is not a column: use ${CLEAR_PRIOR_COLUMNS.join(', ')}`,
      );
  if (col('month') < 0 || col('clear_fraction') < 0)
    throw new InputError(
      'line 1',
      head.join(','),
      'must have the columns month and clear_fraction',
    );
  const number = (line: number, name: string, cell: string | undefined) => {
    if (cell === undefined || !isDecimal(cell))
      throw new InputError(`line ${line} ${name}`, cell ?? null, 'must be a plain decimal number');
    return Number(cell);
  };
  const months = body.map((r, i) => {
    const line = i + 2;
    if (r.length > head.length)
      throw new InputError(
        `line ${line}`,
        r.join(','),
        `has ${r.length} cells for ${head.length} columns (a decimal comma? use a point: 0.8)`,
      );
    const s = col('strength_nights') >= 0 ? r[col('strength_nights')] : undefined;
    return {
      month: number(line, 'month', r[col('month')]),
      clearFraction: number(line, 'clear_fraction', r[col('clear_fraction')]),
      strengthNights: s ? number(line, 'strength_nights', s) : defaultStrengthNights,
    };
  });
  try {
    return checkMonthPriors(months);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    // months.3.clearFraction → line 5 clear_fraction: the file's own words
    const m = /^months\.(\d+)\.?(.*)$/.exec(err.field);
    const column = m?.[2] ? (CSV_COLUMN_OF[m[2]] ?? m[2]) : '';
    throw m
      ? new InputError(`line ${Number(m[1]) + 2}${column ? ` ${column}` : ''}`, err.value, err.rule)
      : err;
  }
}
