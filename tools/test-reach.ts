/**
 * Which source modules the tests reach through their imports, followed statically: from every unit
 * test file (and, apart, from the browser tests and the modules they start), the transitive closure
 * of `import` and `export … from` with a relative path. The modules outside both closures are
 * reached by no test; those inside the browser closure only are reached by browser tests only.
 *
 *   npx tsx tools/test-reach.ts
 *
 * A static count: a module imported is counted as reached (its top level runs), even if no function
 * of it is called; `npm run coverage` measures lines. Worker-thread entries (loaded by file name)
 * and processes the tests spawn (the CLI's bin.mjs, server/main.ts) are followed by name below.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { parseSync } from 'oxc-parser';

const SOURCES = ['server', 'client/src', 'db', 'descriptors'];
const SKIP = [/node_modules/, /\/dist\//, /\.d\.ts$/, /\/migrations\//];
/** Modules loaded by file name, not by import: the pool's worker, spawned entry points. */
const BY_NAME: Record<string, string[]> = {
  'server/jobs/pool.ts': ['server/jobs/worker.ts'],
  'test/cli/run-cli.ts': ['server/cli/main.ts'],
  'test/e2e/harness.ts': ['server/main.ts', 'client/src/main.tsx'],
  'test/e2e/global-setup.ts': ['server/main.ts', 'client/src/main.tsx'],
};

function files(dir: string, test: (p: string) => boolean): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (SKIP.some((r) => r.test(path))) continue;
    if (statSync(path).isDirectory()) out.push(...files(path, test));
    else if (test(path)) out.push(path);
  }
  return out;
}

function importsOf(file: string): string[] {
  const { module } = parseSync(file, readFileSync(file, 'utf8'));
  const specifiers = [
    ...module.staticImports.map((i) => i.moduleRequest.value),
    ...module.staticExports.flatMap((e) =>
      e.entries.flatMap((x) => (x.moduleRequest ? [x.moduleRequest.value] : [])),
    ),
    ...module.dynamicImports.flatMap((d) => {
      const text = readFileSync(file, 'utf8').slice(d.moduleRequest.start, d.moduleRequest.end);
      const m = /^['"`](.+)['"`]$/.exec(text);
      return m ? [m[1]!] : [];
    }),
  ];
  const out = specifiers
    .filter((s) => s.startsWith('.'))
    .map((s) => relative('.', resolve(dirname(file), s)))
    .filter((p) => existsSync(p));
  return [...out, ...(BY_NAME[file] ?? [])];
}

function closure(starts: string[]): Set<string> {
  const seen = new Set<string>();
  const queue = [...starts];
  while (queue.length) {
    const f = queue.pop()!;
    if (seen.has(f)) continue;
    seen.add(f);
    if (/\.(ts|tsx|mjs)$/.test(f)) queue.push(...importsOf(f));
  }
  return seen;
}

const isTest = (p: string) => /\.test\.tsx?$/.test(p);
const tests = files('test', isTest);
const unit = closure(tests.filter((t) => !t.startsWith('test/e2e/')));
const browser = closure(tests.filter((t) => t.startsWith('test/e2e/')));
const sources = SOURCES.flatMap((d) => files(d, (p) => /\.(ts|tsx)$/.test(p))).sort();
const none = sources.filter((s) => !unit.has(s) && !browser.has(s));
const browserOnly = sources.filter((s) => !unit.has(s) && browser.has(s));
console.log(
  `${sources.length} source modules; reached by unit tests ${sources.length - none.length - browserOnly.length}`,
);
console.log(`reached by browser tests only: ${browserOnly.length}`);
for (const s of browserOnly) console.log(`  ${s}`);
console.log(`reached by no test: ${none.length}`);
for (const s of none) console.log(`  ${s}`);
