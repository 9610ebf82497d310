/**
 * `npm run bench`: runs every test/bench/*.bench.ts module's run() in turn and prints its BENCH lines
 * (format in docs/DESIGN.md: value, unit, and the ratio against a baseline run in the same process).
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';

const only = process.argv.slice(2);
const dir = import.meta.dirname;
const files = readdirSync(dir)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.startsWith(o)))
  .sort();
let failed = false;
for (const f of files) {
  try {
    const mod = (await import(pathToFileURL(join(dir, f)).href)) as {
      run: () => Promise<string[]>;
    };
    for (const line of await mod.run()) console.log(line);
  } catch (err) {
    failed = true;
    console.error(`bench ${f} failed: ${err instanceof Error ? err.stack : String(err)}`);
  }
}
process.exitCode = failed ? 1 : 0;
