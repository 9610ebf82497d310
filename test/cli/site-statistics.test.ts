/**
 * `site-statistics` through the real CLI on the demo (invented log with lost nights and invented
 * priors, server/store/demo/): the month table, JSON, a prior from CSV, and a bad CSV that exits 2
 * naming its line and writes nothing.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { tableCounts } from '../store/backends.ts';
import { cli } from './run-cli.ts';

let dir: string;
let url: string;
let store: Store;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-site-cli-'));
  url = `file:${join(dir, 'site.db')}`;
  store = createStore(await openDatabase({ url }));
  await store.loadDemo(LOCAL_OPERATOR, {});
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('epochwright site-statistics', () => {
  it('prints every month with the nights it rests on, and JSON with the rule', async () => {
    const table = await cli(['site-statistics', '--site-id', '1', '--database', url]);
    expect(table.code, table.stderr).toBe(0);
    expect(table.stdout).toMatch(/^Tolvane Ridge: \d+ night reports/);
    for (const m of ['Jan', 'Jun', 'Dec']) expect(table.stdout).toContain(`\n${m} `);
    expect(table.stdout).toContain('AO imager (demo)');
    const json = await cli(['site-statistics', '--site-id', '1', '--json', '--database', url]);
    const s = JSON.parse(json.stdout) as {
      months: { nights: number; loss: { prior: string } }[];
      year: { nights: number };
      rule: string;
    };
    expect(s.months).toHaveLength(12);
    expect(s.months.reduce((n, m) => n + m.nights, 0)).toBe(s.year.nights);
    expect(s.year.nights).toBeGreaterThan(5); // the demo's past season (invented)
    expect(s.months.every((m) => m.loss.prior === 'user')).toBe(true); // the demo's priors (invented)
    expect(s.rule).toMatch(/Beta/);
  });

  it('replaces the prior from CSV, and refuses a bad file naming its line', async () => {
    const good = join(dir, 'prior.csv');
    writeFileSync(good, 'month,clear_fraction,strength_nights\n3,0.9,20\n4,0.8\n');
    const r = await cli([
      'site-statistics',
      '--site-id',
      '2',
      '--set-prior',
      good,
      '--strength',
      '5',
      '--json',
      '--database',
      url,
    ]);
    expect(r.code, r.stderr).toBe(0);
    const s = JSON.parse(r.stdout) as { priors: (object | null)[] };
    expect(s.priors[2]).toEqual({ month: 3, clearFraction: 0.9, strengthNights: 20 });
    expect(s.priors[3]).toEqual({ month: 4, clearFraction: 0.8, strengthNights: 5 });
    expect(s.priors.filter((p) => p !== null)).toHaveLength(2);
    const before = await tableCounts(store);
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'month,clear_fraction\n3,0.9\n4,0,8\n');
    const b = await cli([
      'site-statistics',
      '--site-id',
      '2',
      '--set-prior',
      bad,
      '--database',
      url,
    ]);
    expect(b.code).toBe(2);
    expect(b.stdout).toBe('');
    expect(b.stderr).toMatch(/CSV|line 3/);
    writeFileSync(bad, 'month,clear_fraction\n3,0.9\n4,1.8\n');
    const c = await cli([
      'site-statistics',
      '--site-id',
      '2',
      '--set-prior',
      bad,
      '--database',
      url,
    ]);
    expect(c.code).toBe(2);
    expect(c.stderr).toContain('line 3 clear_fraction');
    expect(await tableCounts(store)).toEqual(before);
  });
});
