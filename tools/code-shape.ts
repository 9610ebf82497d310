/**
 * The code's shape, measured so it can be measured again: top-level functions longer than a limit
 * and lines longer than 120 characters, outside tests and generated files.
 *
 *   npx tsx tools/code-shape.ts [--longer-than 80] [--list] [--with-tests]
 *
 * A "top-level function" is a function declaration, or a const bound to an arrow or function
 * expression, at a module's top level (exported or not); its length is from its first line to its
 * last, comments inside included. Parsed with oxc-parser (knip's parser), so strings, templates and
 * regular expressions cannot fool the count.
 *
 * Hot numeric kernels may stay long (one straight pass, no allocation, nothing to gain from a call
 * per step); each is listed in KERNELS with its reason, carries a step-by-step comment, and is
 * reported apart from the long functions.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { parseSync } from 'oxc-parser';

const ROOTS = ['server', 'client/src', 'db', 'descriptors', 'tools'];
const SKIP = [/node_modules/, /\/dist\//, /schema\.d\.ts$/, /\/migrations\//];
const WIDE = 120;

/** Long on purpose: file and function, with the reason. */
const KERNELS: Record<string, string> = {
  'server/science/orbit/fit/model.ts keplerianModel':
    'every LM evaluation, every row: values and the analytic Jacobian in one pass',
  'server/science/sky/season.ts seasonMap':
    'targets × nights, millions of samples: place of date and counts inlined',
  'server/science/orbit/predict.ts writeState':
    'once per epoch in every batch prediction and fit evaluation: one pass into the columns',
};

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (SKIP.some((r) => r.test(path))) continue;
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (/\.(ts|tsx|mjs)$/.test(name)) out.push(path);
  }
  return out;
}

interface FunctionSpan {
  file: string;
  name: string;
  lines: number;
}

/** The line number (1-based) of each character offset, by the offsets of the line starts. */
function lineOf(starts: number[], offset: number): number {
  let lo = 0;
  let hi = starts.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (starts[mid]! <= offset) lo = mid;
    else hi = mid - 1;
  }
  return lo + 1;
}

// biome-ignore lint/suspicious/noExplicitAny: the ESTree nodes are walked by their `type` only
type Node = any;

function topLevelFunctions(file: string, text: string): FunctionSpan[] {
  const { program } = parseSync(file, text);
  const starts = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === '\n') starts.push(i + 1);
  const span = (name: string, n: Node): FunctionSpan => ({
    file,
    name,
    lines: lineOf(starts, n.end) - lineOf(starts, n.start) + 1,
  });
  const out: FunctionSpan[] = [];
  for (const statement of program.body as Node[]) {
    const d: Node =
      statement.type === 'ExportNamedDeclaration' || statement.type === 'ExportDefaultDeclaration'
        ? statement.declaration
        : statement;
    if (!d) continue;
    if (d.type === 'FunctionDeclaration') out.push(span(d.id?.name ?? 'default', d));
    if (d.type === 'VariableDeclaration')
      for (const v of d.declarations as Node[])
        if (v.init && /^(ArrowFunctionExpression|FunctionExpression)$/.test(v.init.type))
          out.push(span(v.id.name, v.init));
  }
  return out;
}

const args = process.argv.slice(2);
const limitAt = args.indexOf('--longer-than');
const limit = limitAt >= 0 ? Number(args[limitAt + 1]) : 80;
const roots = args.includes('--with-tests') ? [...ROOTS, 'test'] : ROOTS;
const files = roots.flatMap((r) => sourceFiles(r));
const functions: FunctionSpan[] = [];
const wide: number[] = [];
const wideAt: string[] = [];
for (const file of files) {
  const text = readFileSync(file, 'utf8');
  functions.push(...topLevelFunctions(file, text));
  text.split('\n').forEach((line, i) => {
    if (line.length > WIDE) {
      wide.push(line.length);
      wideAt.push(`${relative('.', file)}:${i + 1} ${line.length}`);
    }
  });
}
const over = functions.filter((f) => f.lines > limit).sort((a, b) => b.lines - a.lines);
const isKernel = (f: FunctionSpan) => `${f.file} ${f.name}` in KERNELS;
const long = over.filter((f) => !isKernel(f));
const kernels = over.filter(isKernel);
console.log(`${files.length} files, ${functions.length} top-level functions`);
console.log(`functions over ${limit} lines: ${long.length} (longest ${long[0]?.lines ?? 0})`);
console.log(`hot numeric kernels over ${limit} lines, exempt: ${kernels.length}`);
console.log(
  `lines over ${WIDE} characters: ${wide.length}, over 200: ${wide.filter((n) => n > 200).length}, ` +
    `longest ${Math.max(0, ...wide)}`,
);
if (args.includes('--list')) {
  for (const f of long) console.log(`  ${f.lines}\t${f.file} ${f.name}`);
  for (const f of kernels)
    console.log(`  kernel ${f.lines}\t${f.file} ${f.name}: ${KERNELS[`${f.file} ${f.name}`]}`);
  for (const w of wideAt) console.log(`  wide ${w}`);
}
