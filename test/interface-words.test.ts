/**
 * The names we replaced by our own words (DEVELOPERS.md, "Vocabulary") do not come back at any
 * interface: not as a key or parameter of the OpenAPI document, not in the CLI help, not in the
 * client's source. Each search is first shown to find a name that is there, so an empty search
 * cannot pass.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { commands } from '../server/cli/commands/index.ts';
import { openApiDocument } from '../tools/api-types/generate.ts';

/** Keys and parameter names replaced (the list of resemblances, items 3 and 4). */
const OLD_KEYS = [
  'constraints',
  'minAltitudeDeg',
  'maxAirmass',
  'minMoonSeparationDeg',
  'sunAvoidanceDeg',
  'sample',
  'walkers',
  'steps',
  'burn',
  // item 5: ranges are start/end with an ISO 8601 step
  'from',
  'to',
  'every',
  'stepMinutes',
  'curveStepMinutes',
  'everyHours',
  'everyNights',
];
/** Replaced CLI options (refused by name: server/cli/args.ts). */
const OLD_OPTIONS = [
  '--constraints',
  '--max-airmass',
  '--moon-distance',
  '--sample',
  '--from',
  '--to',
  '--every',
  '--every-nights',
];
/** Durations in the short forms of earlier versions (30d, 6h, 15min, 1yr) instead of ISO 8601. */
const SHORT_DURATION = /(?<![\w.])\d+(?:\.\d+)?(?:d|h|min|yr)\b/;
/** Replaced words, searched as whole words in every text (enum values included). */
const OLD_WORDS =
  /\b(constraints|minAltitudeDeg|maxAirmass|minMoonSeparationDeg|sunAvoidanceDeg|walkers|sun-avoidance|everyHours|everyNights)\b/;
/**
 * Look-alikes of real stars and of the real Galactic-centre object (item 6): S-numbered star names,
 * the demo's old "VC s1" names, and distances of about 8 kpc in examples.
 */
const REAL_LOOKALIKES = /\bS\d+\.[a-z]|\bVC s\d|distancePc=8\d{3}\b/;

/** Every property name and parameter name anywhere in a JSON document. */
function keysOf(node: unknown, out = new Set<string>()): Set<string> {
  if (Array.isArray(node)) for (const x of node) keysOf(x, out);
  else if (node && typeof node === 'object') {
    const o = node as Record<string, unknown>;
    if (o.properties && typeof o.properties === 'object')
      for (const k of Object.keys(o.properties)) out.add(k);
    if (typeof o.in === 'string' && typeof o.name === 'string') out.add(o.name);
    for (const v of Object.values(o)) keysOf(v, out);
  }
  return out;
}

function sourcesUnder(dir: string): { file: string; text: string }[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile() && /\.(ts|tsx|html|css)$/.test(e.name))
    .map((e) => {
      const file = join(e.parentPath, e.name);
      return { file, text: readFileSync(file, 'utf8') };
    });
}

function firstOldWord(text: string): string | null {
  return (OLD_WORDS.exec(text) ?? REAL_LOOKALIKES.exec(text))?.[0] ?? null;
}

describe('no replaced name survives at an interface', () => {
  it('in the OpenAPI document', async () => {
    const doc = await openApiDocument();
    const keys = keysOf(doc);
    expect(keys.has('highestAirmass') && keys.has('ensembleSize')).toBe(true); // the search sees keys
    expect(OLD_KEYS.filter((k) => keys.has(k))).toEqual([]);
    const text = JSON.stringify(doc);
    expect(firstOldWord(text)).toBeNull();
    expect(text).toContain('P30D'); // durations are documented in ISO 8601
    expect(SHORT_DURATION.exec(text)?.[0] ?? null).toBeNull();
  });

  it('in the CLI help', () => {
    const help = Object.values(commands)
      .map((c) => c.help)
      .join('\n');
    expect(help).toContain('--highest-airmass'); // the search sees options
    expect(OLD_OPTIONS.filter((o) => new RegExp(`${o}(?![\\w-])`).test(help))).toEqual([]);
    expect(firstOldWord(help)).toBeNull();
    expect(help).toContain('PT5M');
    // A right ascension in hours (16.69h) is a coordinate, not a duration: its lines are left out.
    const ra = /^.*right ascension.*$/gim;
    expect(help).toMatch(ra);
    expect(SHORT_DURATION.exec(help.replace(ra, ''))?.[0] ?? null).toBeNull();
  });

  it('in the README', () => {
    const readme = readFileSync(join(import.meta.dirname, '../README.md'), 'utf8');
    expect(readme).toContain('leastMoonDistanceDeg'); // the search reads the README
    // The release note names the old words once, on purpose; everything after it must not.
    const [, rest] = readme.split('## Safety');
    const body = readme.replace(/## Release notes[\s\S]*?## Safety/, '## Safety');
    expect(rest).toBeDefined();
    expect(firstOldWord(body)).toBeNull();
    // Coordinates legitimately end in d or h (250.3d, 16.69h): the input-forms table is left out of
    // the duration search, and must still hold its table.
    const forms = /## Input forms[\s\S]*?## HTTP API/.exec(body)?.[0];
    expect(forms).toContain('16.69h');
    expect(SHORT_DURATION.exec(body.replace(forms!, ''))?.[0] ?? null).toBeNull();
  });

  it("in the client's source", () => {
    const files = sourcesUnder(join(import.meta.dirname, '../client/src'));
    expect(files.some((f) => f.text.includes('leastMoonDistanceDeg'))).toBe(true); // the search reads the client
    const found = files.flatMap((f) => {
      const w = firstOldWord(f.text);
      return w ? [`${f.file}: ${w}`] : [];
    });
    expect(found).toEqual([]);
  });
});
