/**
 * `epochwright fit` on the demo campaign (invented): a CSV file in the export layout, the same
 * measurements from the store, and --accept storing a new current solution.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../server/cli/main.ts';
import { RESIDUAL_CSV_COLUMNS, type Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';
import { measurementsCsv } from '../../server/store/exports/measurements.ts';

let dir: string;
let store: Store;
let url: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-fit-cli-'));
  url = `file:${join(dir, 'demo.db')}`;
  store = (await startStore({ url, demo: true })).store;
  writeFileSync(join(dir, 'm.csv'), measurementsCsv(await store.exports.measurements()));
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [],
    err: string[] = [];
  const [w, e] = [
    process.stdout.write.bind(process.stdout),
    process.stderr.write.bind(process.stderr),
  ];
  process.stdout.write = ((s: string) => {
    out.push(s);
    return true;
  }) as typeof process.stdout.write;
  process.stderr.write = ((s: string) => {
    err.push(s);
    return true;
  }) as typeof process.stderr.write;
  try {
    const code = await main(args);
    return { code, out: out.join(''), err: err.join('') };
  } finally {
    process.stdout.write = w;
    process.stderr.write = e;
  }
}

describe('epochwright fit', () => {
  it('fits a target from a CSV file: table with residuals, JSON, and CSV of residuals', async () => {
    const file = join(dir, 'm.csv');
    const table = await run(['fit', '--file', file, '--target', 'Morrow', '--period', '7:13']);
    expect(table.code, table.err).toBe(0);
    expect(table.out).toMatch(/χ² = [\d.]+ for \d+ degrees of freedom/);
    const period = /Morrow\s+periodYears\s+([\d.]+)\s+([\d.]+)/.exec(table.out)!;
    expect(Math.abs(Number(period[1]) - 9.6)).toBeLessThan(3 * Number(period[2])); // scenario.ts: P = 9.6 yr (invented), within 3σ
    expect(table.out).toMatch(/residuals/);
    const json = JSON.parse(
      (await run(['fit', '--file', file, '--target', 'Morrow', '--period', '7:13', '--json'])).out,
    ) as { residuals: unknown[]; stars: unknown[] };
    const morrow = (await store.targets.list({})).items.find((t) => t.name === 'Morrow')!;
    expect(json.residuals.length).toBe(
      (await store.measurements.list({ targetId: morrow.id })).total,
    ); // one residual per measurement in the file
    const csv = (
      await run([
        'fit',
        '--file',
        file,
        '--target',
        'Morrow',
        '--period',
        '7:13',
        '--csv',
        '--residuals',
      ])
    ).out
      .trim()
      .split('\n');
    expect(csv[0]).toBe(RESIDUAL_CSV_COLUMNS.join(',')); // the same CSV as the HTTP fit's
    expect(csv.length).toBe(1 + (await store.measurements.list({ targetId: morrow.id })).total); // a header and one line per measurement
  });

  it('refuses too few measurements and bad usage with a message and a non-zero exit', async () => {
    const one = (await store.exports.measurements())
      .filter((m) => m.target === 'Lantern B')
      .slice(0, 1);
    writeFileSync(join(dir, 'one.csv'), measurementsCsv(one));
    const few = await run(['fit', '--file', join(dir, 'one.csv'), '--target', 'Lantern B']);
    expect(few.code).toBe(1);
    expect(few.err).toMatch(/Lantern B: 2 measurement components .* for 7 free parameters/);
    const bad = await run(['fit', '--file', join(dir, 'm.csv'), '--period', '7']);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--period: "7" must be <min>:<max>/);
  });

  it('fits stored measurements and --accept stores a new current version', async () => {
    const targets = (await store.targets.list({})).items as { id: number; name: string }[];
    const s2 = targets.find((t) => t.name === 'Morrow')!.id;
    const res = await run([
      'fit',
      '--target-id',
      String(s2),
      '--accept',
      '--notes',
      'from the CLI test',
      '--database',
      url,
    ]);
    expect(res.code, res.err).toBe(0);
    expect(res.out).toMatch(
      /stored Morrow \(target \d+\) as orbit solution \d+, version 3, now current/,
    );
    const versions = (await store.orbitSolutions.list({})).items.filter((v) => v.targetId === s2);
    expect(versions.map((v) => [v.version, v.current, v.provenance])).toEqual([
      [1, false, 'entered'],
      [2, false, 'fitted'], // the demo's own fit at load
      [3, true, 'fitted'],
    ]);
  });
});
