/**
 * `epochwright <command> [options]`: the command-line entry. Every command calls the same science
 * and store functions as the server. Exit codes: 0 success, 2 bad usage or input, 1 anything else.
 */
import { InputError } from '../science/errors.ts';
import { retiredIdOption } from './args.ts';
import { UsageError, type Command } from './io.ts';
import { commands } from './commands/index.ts';

function usage(): string {
  const width = Math.max(...Object.keys(commands).map((k) => k.length));
  const lines = Object.entries(commands).map(
    ([name, c]: [string, Command]) => `  ${name.padEnd(width)}  ${c.summary}`,
  );
  return (
    `usage: epochwright <command> [options]\n\ncommands:\n${lines.join('\n')}` +
    `\n\n'epochwright <command> --help' shows a command's options.\n`
  );
}

/**
 * `--dec -21:42:58` as `--dec=-21:42:58`: an option's value that starts with a minus and a digit
 * (a southern declination, a western longitude, a negative proper motion) is that option's value,
 * not an unknown option (node's reader would refuse it as ambiguous).
 */
export function joinNegativeValues(argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let k = 0; k < argv.length; k++) {
    const a = argv[k]!;
    const next = argv[k + 1];
    if (/^--[a-z][a-z-]*$/.test(a) && next !== undefined && /^[-−][\d.]/.test(next)) {
      out.push(`${a}=${next}`);
      k++;
    } else out.push(a);
  }
  return out;
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...given] = argv;
  const rest = joinNegativeValues(given);
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(usage());
    return name === undefined ? 2 : 0;
  }
  const command = (commands as Record<string, Command>)[name];
  if (!command) {
    process.stderr.write(`epochwright: unknown command ${JSON.stringify(name)}\n\n${usage()}`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    process.stdout.write(command.help);
    return 0;
  }
  try {
    process.stdout.write(await command.run(rest));
    return 0;
  } catch (err) {
    if (err instanceof UsageError || err instanceof InputError) {
      process.stderr.write(`epochwright ${name}: ${err.message}\n`);
      return 2;
    }
    if (
      err instanceof TypeError &&
      (err as NodeJS.ErrnoException).code?.startsWith('ERR_PARSE_ARGS')
    ) {
      process.stderr.write(`epochwright ${name}: ${retiredIdOption(err.message) ?? err.message}\n`);
      return 2;
    }
    process.stderr.write(
      `epochwright ${name}: ${err instanceof Error ? err.message : String(err)}\n`,
    );
    return 1;
  }
}

if (
  import.meta.url === `file://${process.argv[1]}` ||
  process.argv[1]?.endsWith('server/cli/main.ts')
) {
  main(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
