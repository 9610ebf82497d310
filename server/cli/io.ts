/**
 * What every CLI command shares: reading JSON given inline or as a file, picking the output format,
 * and the one way a command reports bad usage (exit code 2, message on stderr, nothing on stdout).
 */
import { readFileSync } from 'node:fs';
import type { OutputFormat } from './output.ts';

/** Bad usage or bad input: main() prints the message on stderr and exits with code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/** Read a JSON value from inline text (starts with `{` or `[`) or from a file path. */
export function readJsonArg(option: string, text: string | undefined): unknown {
  if (text === undefined) throw new UsageError(`--${option} is required`);
  const trimmed = text.trim();
  let source = trimmed;
  if (!trimmed.startsWith('{') && !trimmed.startsWith('[')) {
    try {
      source = readFileSync(trimmed, 'utf8');
    } catch (err) {
      throw new UsageError(
        `--${option}: cannot read file ${JSON.stringify(trimmed)} (${(err as NodeJS.ErrnoException).code ?? 'error'})`,
      );
    }
  }
  try {
    return JSON.parse(source);
  } catch (err) {
    throw new UsageError(`--${option}: not valid JSON (${(err as Error).message})`);
  }
}

/** `--json` / `--csv` flags to a format; both at once is a usage error. */
export function outputFormat(values: { json?: boolean; csv?: boolean }): OutputFormat {
  if (values.json && values.csv) throw new UsageError('choose one of --json and --csv');
  return values.json ? 'json' : values.csv ? 'csv' : 'table';
}

/** A CLI subcommand: its one-line summary, its full help, and what it does with its arguments. */
export interface Command {
  summary: string;
  help: string;
  /** Returns what goes to stdout. Throws UsageError or InputError on bad input. */
  run(argv: string[]): Promise<string> | string;
}
