/**
 * Crash safety: a child process importing a large CSV is killed with SIGKILL after some of its
 * batches are staged; the file database then holds none of the import (staged rows only, which
 * the next open deletes), and a run left to finish holds all of it. (SQLite's atomic commit through the write-ahead log, from memory: sqlite.org "Atomic
 * Commit In SQLite" and "Write-Ahead Logging".)
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createClient } from '@libsql/client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';

const here = dirname(fileURLToPath(import.meta.url));
const child = join(here, 'crash-child.ts');
const ROWS = 12_000;

/** Staged rows, read without the store (whose open clears those of dead processes). */
async function countStaged(path: string): Promise<number> {
  const client = createClient({ url: `file:${path}` });
  const n = Number(
    (await client.execute('SELECT count(*) AS n FROM measurement_staging')).rows[0]!.n,
  );
  client.close();
  return n;
}

async function countMeasurements(path: string): Promise<{ n: number; integrity: string }> {
  const store = createStore(await openDatabase({ url: `file:${path}` }));
  const n = Number(
    (await databaseOf(store).client.execute('SELECT count(*) AS n FROM measurements')).rows[0]!.n,
  );
  const integrity = String(
    (await databaseOf(store).client.execute('PRAGMA integrity_check')).rows[0]![0],
  );
  store.close();
  return { n, integrity };
}

/** Run the child; with `killAtRow`, SIGKILL it once it reports that row. */
function runChild(
  path: string,
  killAtRow?: number,
): Promise<{ signal: NodeJS.Signals | null; code: number | null; out: string }> {
  return new Promise((done, fail) => {
    const p = spawn(process.execPath, ['--import', 'tsx', child, path, String(ROWS)], {
      cwd: resolve(here, '../..'),
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    p.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      if (killAtRow !== undefined && out.includes(`row ${killAtRow}\n`)) p.kill('SIGKILL');
    });
    p.stderr.on('data', (d: Buffer) => (err += d.toString()));
    p.on('error', fail);
    p.on('close', (code, signal) =>
      code !== 0 && signal === null
        ? fail(new Error(`child failed (${code}): ${err}`))
        : done({ signal, code, out }),
    );
  });
}

describe('an import killed mid-way', () => {
  let dir: string;
  const db = (name: string) => join(dir, name);
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'epochwright-crash-'));
    for (const name of ['killed.db', 'finished.db']) {
      const store = createStore(await openDatabase({ url: `file:${db(name)}` }));
      const system = await store.systems.create(LOCAL_OPERATOR, {
        name: 'Crash Deep',
        raDeg: 1,
        decDeg: 1,
      });
      await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Cobble' });
      store.close();
    }
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('leaves none of it when killed, all of it when finished', async () => {
    // Rows 0–4,999 are reported once the first batch of 5,000 is staged, 5,000 after the second.
    const killed = await runChild(db('killed.db'), 5000);
    expect(killed.signal).toBe('SIGKILL'); // the child really was killed…
    expect(killed.out).not.toContain('done'); // …before the import finished
    expect(await countStaged(db('killed.db'))).toBeGreaterThanOrEqual(10_000); // two batches staged and committed (constructed case)
    expect(await countMeasurements(db('killed.db'))).toEqual({ n: 0, integrity: 'ok' }); // none of the rows; PRAGMA integrity_check says "ok" for a sound file (sqlite.org pragma docs, from memory)
    expect(await countStaged(db('killed.db'))).toBe(0); // the open cleared the dead run's staged rows

    const finished = await runChild(db('finished.db'));
    expect(finished.out).toContain('done');
    expect(await countMeasurements(db('finished.db'))).toEqual({ n: ROWS, integrity: 'ok' }); // every row of the file made by the child
    expect(await countStaged(db('finished.db'))).toBe(0); // nothing left staged after the swap
  }, 180_000);
});
