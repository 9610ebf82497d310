/** `epochwright import`: a CSV of targets, orbit solutions or measurements, all rows or none. */
import { parseArgs } from 'node:util';
import {
  COLUMNS,
  CSV_KINDS,
  ImportRejected,
  type ImportReport,
  REQUIRED_COLUMNS,
  type CsvKind,
} from '../../store/index.ts';
import { readTextFile } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { formatTable, plural } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright import --kind targets|orbits|measurements --file <csv> [--check-only]
                         [--allow-duplicates]

Reads a CSV whose first line names the columns and writes every row in one transaction. If any
row is bad, nothing is written and every bad row is listed (line, column, value, rule).
--check-only does all the checks and writes nothing.
A file imported before (same SHA-256 digest) is refused, and so is every measurement equal to a
stored one or to an earlier line (same target, kind, epoch to the second and values);
--allow-duplicates imports them anyway.

columns (required ones marked *):
${CSV_KINDS.map(
  (k) =>
    `  ${k}: ` +
    `${COLUMNS[k].map((c) => (REQUIRED_COLUMNS[k].includes(c) ? `${c}*` : c)).join(', ')}`,
).join('\n')}
  system and target are names; relativity lists switches separated by ";".

options:
${STORE_HELP}
`;

export const importCommand: Command = {
  summary: 'import targets, orbit solutions or measurements from CSV (all rows or none)',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...storeOptions,
        kind: { type: 'string' },
        file: { type: 'string' },
        'check-only': { type: 'boolean' },
        'allow-duplicates': { type: 'boolean' },
      },
      strict: true,
      allowPositionals: false,
    });
    const kind = values.kind as CsvKind | undefined;
    if (kind === undefined || !CSV_KINDS.includes(kind))
      throw new UsageError(`--kind must be one of ${CSV_KINDS.join(', ')}`);
    if (values.file === undefined) throw new UsageError('--file is required');
    const text = readTextFile('file', values.file);
    const dryRun = values['check-only'] ?? false;
    const allowDuplicates = values['allow-duplicates'] ?? false;
    try {
      const report = await storeAction<ImportReport>(values, {
        local: (store, actor) => store.importCsv(actor, kind, text, { dryRun, allowDuplicates }),
        remote: {
          method: 'POST',
          path: `/imports/${kind}`,
          query: { dryRun, allowDuplicates },
          text: { text, type: 'text/csv' },
        },
        writes: !dryRun,
      });
      return dryRun
        ? `checked ${plural(report.rows, 'row')} of ${kind}: all good, nothing written\n`
        : `imported ${plural(report.written, 'row')} of ${kind}\n`;
    } catch (err) {
      if (!(err instanceof ImportRejected)) throw err;
      const table = formatTable(err.report.problems, [
        { header: 'line', value: (p) => p.line },
        { header: 'column', value: (p) => p.column },
        {
          header: 'value',
          value: (p) => (p.value === undefined || p.value === null ? '' : JSON.stringify(p.value)),
        },
        { header: 'rule', value: (p) => p.rule },
      ]);
      throw new UsageError(
        `${err.report.problems.length} problem(s); nothing was written\n${table}`,
      );
    }
  },
};
