/**
 * Reading a command's options: ids, numbers, JSON given inline or as a file, the output format, and
 * errors of the layers below renamed after the option the user typed. Every rule names the option
 * and the value, and fails as a UsageError (exit code 2).
 */
import { readFileSync } from 'node:fs';
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { InputError } from '../science/errors.ts';
import { UsageError } from './io.ts';
import type { OutputFormat } from './output.ts';
import { DEFAULT_WEATHER, WEATHER_CHOICES, type WeatherChoice } from '../store/index.ts';

/** `--<option> <id>`: a positive whole number. */
export function positiveId(option: string, text: string | undefined): number {
  const id = Number(text);
  if (text === undefined || !Number.isInteger(id) || id <= 0)
    throw new UsageError(
      `--${option}: ${JSON.stringify(text ?? null)} must be an id (a positive whole number)`,
    );
  return id;
}

/** An optional `--<option> <id>`: undefined when left out. */
export function optionalId(option: string, text: string | undefined): number | undefined {
  return text === undefined ? undefined : positiveId(option, text);
}

/** An optional `--<option> <x>` with x > 0 (finite). */
export function optionalPositive(option: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const x = Number(text);
  if (!(x > 0) || !Number.isFinite(x))
    throw new UsageError(`--${option}: ${JSON.stringify(text)} must be a positive number`);
  return x;
}

/** The text of the file an option names. @throws UsageError naming the option, the path and the system's code. */
export function readTextFile(option: string, path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (err) {
    throw new UsageError(
      `--${option}: cannot read file ${JSON.stringify(path)} (${(err as NodeJS.ErrnoException).code ?? 'error'})`,
    );
  }
}

/** Read a JSON value from inline text (starts with `{` or `[`) or from a file path. */
export function readJsonArg(option: string, text: string | undefined): unknown {
  if (text === undefined) throw new UsageError(`--${option} is required`);
  const trimmed = text.trim();
  let source = trimmed;
  if (!trimmed.startsWith('{') && !trimmed.startsWith('[')) source = readTextFile(option, trimmed);
  try {
    return JSON.parse(source);
  } catch (err) {
    throw new UsageError(`--${option}: not valid JSON (${(err as Error).message})`);
  }
}

/** `--weather aware|blind`; left out, weather-aware (the store's default, as for every request). */
export function weatherOption(text: string | undefined): WeatherChoice {
  if (text === undefined) return DEFAULT_WEATHER;
  const found = WEATHER_CHOICES.find((w) => w === text);
  if (!found) throw new UsageError(`--weather: ${JSON.stringify(text)} must be "aware" or "blind"`);
  return found;
}

/** The preview/accept pair every planning command shares: `--digest` only with `--accept`. */
export function checkAcceptDigest(values: { accept?: boolean; digest?: string }): void {
  if (values.digest !== undefined && !values.accept)
    throw new UsageError('--digest goes with --accept');
}

/** `--json` / `--csv` flags to a format; both at once is a usage error. */
export function outputFormat(values: { json?: boolean; csv?: boolean }): OutputFormat {
  if (values.json && values.csv) throw new UsageError('choose one of --json and --csv');
  return values.json ? 'json' : values.csv ? 'csv' : 'table';
}

/** What parseArgs gives for these options, read strictly and without positionals. */
type StrictValues<O extends NonNullable<ParseArgsConfig['options']>> = ReturnType<
  typeof parseArgs<{ args: string[]; options: O; strict: true; allowPositionals: false }>
>['values'];

/** `--json` and `--csv`: the options of every command that prints a table. */
export const outputOptions = { json: { type: 'boolean' }, csv: { type: 'boolean' } } as const;

/**
 * A command's options read strictly (an unknown option or a stray word is a usage error), with
 * `--json` / `--csv` added, and the output format they ask for.
 */
export function commandArgs<const O extends NonNullable<ParseArgsConfig['options']>>(
  argv: string[],
  options: O,
): { values: StrictValues<O & typeof outputOptions>; format: OutputFormat } {
  const { values } = parseArgs({
    args: argv,
    options: { ...options, ...outputOptions },
    strict: true,
    allowPositionals: false,
  });
  return { values, format: outputFormat(values as { json?: boolean; csv?: boolean }) };
}

/**
 * Re-raise an InputError under the option the user typed (`options`: request field → option), so
 * the message names it.
 */
export async function asOptions<T>(
  options: Record<string, string>,
  f: () => Promise<T>,
): Promise<T> {
  try {
    return await f();
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    const [head, ...rest] = err.field.split('.');
    const option = options[head!] ?? options['*'];
    if (option === undefined) throw err;
    throw new InputError(
      options[head!] ? [option, ...rest].join('.') : `${option} ${err.field}`,
      err.value,
      err.rule,
    );
  }
}

/**
 * Every stored record is named by `--<record>-id` in every command (`--campaign-id`, `--site-id`,
 * `--night-id`, `--target-id`, `--system-id`, `--token-id`). The spellings used before are
 * refused by name, with the one to use; `--site` stays where it means a site given as JSON
 * (`night`, `season`), where it is a known option and never reaches this rule.
 */
export const RETIRED_ID_OPTIONS: Readonly<Record<string, string>> = {
  campaign: 'campaign-id',
  site: 'site-id',
  night: 'night-id',
  id: 'token-id',
};

/**
 * Range and step options of earlier versions (DEVELOPERS.md, "Vocabulary"): a range is
 * --start/--end, its spacing --step (an ISO 8601 duration); refused by name with what replaced them.
 */
const RETIRED_OPTIONS: Readonly<Record<string, string>> = {
  from: '--start (the first of a range) or --record (a whole record as JSON)',
  to: '--end (the last of a range) or --file (where backup writes)',
  every: '--step, an ISO 8601 duration such as P30D or PT6H',
  'every-nights': '--step, an ISO 8601 duration in whole days (P2D: every second night)',
};

/** The message for an unknown option that is a retired spelling, or null for any other. */
export function retiredIdOption(message: string): string | null {
  const m = /Unknown option '--([a-z-]+)'/.exec(message);
  const id = m ? RETIRED_ID_OPTIONS[m[1]!] : undefined;
  if (id) return `--${m![1]} is now --${id} (every id option is --<record>-id)`;
  const other = m ? RETIRED_OPTIONS[m[1]!] : undefined;
  return other ? `--${m![1]} is now ${other}` : null;
}
