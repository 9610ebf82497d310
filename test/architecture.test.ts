import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

// Data flows one way (DESIGN.md, Architecture): store → science → http/cli → client. Each layer may
// import only what sits below it.
const REPO = resolve(import.meta.dirname, '..');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    if (statSync(p).isDirectory()) return f === 'dist' || f === 'node_modules' ? [] : sources(p);
    return /\.(ts|tsx|mjs)$/.test(f) ? [p] : [];
  });
}

/** Every relative import of a file, resolved to a repo path. */
function imports(file: string): string[] {
  const src = readFileSync(file, 'utf8');
  return [...src.matchAll(/(?:from|import)\s*\(?\s*'(\.[^']+)'/g)].map((m) =>
    relative(REPO, resolve(file, '..', m[1]!)),
  );
}

function offending(layer: string, forbidden: string[]): string[] {
  return sources(join(REPO, layer)).flatMap((f) =>
    imports(f)
      .filter((i) => forbidden.some((x) => i.startsWith(x)))
      .map((i) => `${relative(REPO, f)} → ${i}`),
  );
}

describe('layers', () => {
  it('science imports no store, db, http, cli or client code', () => {
    expect(
      offending('server/science', ['server/store', 'server/http', 'server/cli', 'db/', 'client/']),
    ).toEqual([]);
  });
  it('the store imports no http, cli or client code', () => {
    expect(offending('server/store', ['server/http', 'server/cli', 'client/'])).toEqual([]);
  });
  it('the CLI imports no http or client code', () => {
    expect(offending('server/cli', ['server/http', 'client/'])).toEqual([]);
  });
  it('the client talks to the server only over HTTP', () => {
    expect(offending('client/src', ['server/', 'db/'])).toEqual([]);
  });
  it('finds imports at all (the check can fail)', () => {
    expect(imports(join(REPO, 'server/http/orbit.ts'))).toContain('server/science/orbit/index.ts');
  });
});
