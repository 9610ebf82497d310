/**
 * The rules of a single CSV cell, shared by the imports and the exports.
 *
 * Numbers: a plain decimal (optional sign, digits with an optional point, optional exponent).
 * `Number()` alone would read `0x10` as 16, `" 1 "` as 1 and `Infinity` as a number.
 *
 * Formulas: a text cell that begins with `=`, `+`, `-`, `@`, tab or carriage return is run as a
 * formula by spreadsheet programs when a CSV is opened. Following the OWASP "CSV Injection"
 * guidance (owasp.org/www-community/attacks/CSV_Injection, from memory), such a cell is written
 * with a single quote in front, which every common spreadsheet shows as text. Plain numbers
 * (`-3.5`) are not formulas and stay as they are; our imports drop the quote again, so an export
 * read back gives the same text.
 */
const DECIMAL = /^[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?$/;
const FORMULA_START = /^[=+\-@\t\r]/;
const ESCAPED = /^'[=+\-@\t\r]/;

/** True for a plain decimal number that is finite. */
export function isDecimal(cell: string): boolean {
  return DECIMAL.test(cell) && Number.isFinite(Number(cell));
}

/** The cell as it may be written to a CSV that someone will open in a spreadsheet. */
export function escapeFormulaCell(text: string): string {
  return FORMULA_START.test(text) && !isDecimal(text) ? `'${text}` : text;
}

/** The text of a cell written by `escapeFormulaCell` (other cells unchanged). */
export function unescapeFormulaCell(cell: string): string {
  return ESCAPED.test(cell) ? cell.slice(1) : cell;
}
