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
import { localActor } from '../actor.ts';
import { readTextFile } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { formatTable } from '../output.ts';
import { SERVER_HELP, remoteOf, send, serverOptions } from '../remote.ts';
import { DATABASE_HELP, databaseOption, withStore } from './store-option.ts';

const help = `usage: epochwright import --kind targets|orbits|measurements --file <csv> [--check-only]
                         [--allow-duplicates]

Reads a CSV whose first line names the columns and writes every row in one transaction. If any
row is bad, nothing is written and every bad row is listed (line, column, value, rule).
--check-only does all the checks and writes nothing.
A file imported before (same SHA-256 digest) is refused, and so is every measurement equal to a
stored one or to an earlier line (same target, kind, epoch to the second and values);
--allow-duplicates imports them anyway.

columns (required ones marked *):
${CSV_KINDS.map((k) => `  ${k}: ${COLUMNS[k].map((c) => (REQUIRED_COLUMNS[k].includes(c) ? `${c}*` : c)).join(', ')}`).join('\n')}
  system and target are names; relativity lists switches separated by ";".

options:
${DATABASE_HELP}
${SERVER_HELP}
`;

export const importCommand: Command = {
  summary: 'import targets, orbit solutions or measurements from CSV (all rows or none)',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...databaseOption,
        ...serverOptions,
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
    const remote = remoteOf(values);
    const allowDuplicates = values['allow-duplicates'] ?? false;
    try {
      const report = remote
        ? ((await (
            await send(
              remote,
              'POST',
              `/imports/${kind}?dryRun=${dryRun}&allowDuplicates=${allowDuplicates}`,
              { text, type: 'text/csv' },
              (e) => {
                // The server's row report, shown as a local import shows it.
                const details = e.details as ImportReport | undefined;
                if (e.status === 422 && details?.problems) throw new ImportRejected(details);
                return undefined;
              },
            )
          ).json()) as ImportReport)
        : await withStore(
            values.database,
            (store) => store.importCsv(localActor(), kind, text, { dryRun, allowDuplicates }),
            { writes: !dryRun },
          );
      return dryRun
        ? `checked ${report.rows} ${kind} rows: all good, nothing written\n`
        : `imported ${report.written} ${kind} rows\n`;
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
