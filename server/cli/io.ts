/**
 * What every CLI command is, and the one way a command reports bad usage (exit code 2, message
 * on stderr, nothing on stdout). Reading the options themselves is args.ts.
 */

/** Bad usage or bad input: main() prints the message on stderr and exits with code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

/** A CLI subcommand: its one-line summary, its full help, and what it does with its arguments. */
export interface Command {
  summary: string;
  help: string;
  /** Returns what goes to stdout. Throws UsageError or InputError on bad input. */
  run(argv: string[]): Promise<string> | string;
}
