/** Runs the real CLI entry (server/cli/bin.mjs) in a child process, as a user's shell would. */
import { execFile } from 'node:child_process';
import { join } from 'node:path';

const BIN = join(import.meta.dirname, '../../server/cli/bin.mjs');

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

export function cli(args: string[], env: NodeJS.ProcessEnv = process.env): Promise<CliResult> {
  return new Promise((resolve) => {
    execFile(process.execPath, [BIN, ...args], { timeout: 60_000, env }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr });
    });
  });
}
