/**
 * One file, many writers: the server (its app over a store on a file) takes imports, small writes
 * and list reads while the command line imports into the same file from another process. Every
 * write must succeed (waiting for the other writer, never SQLITE_BUSY or a stale snapshot), and
 * afterwards the server must see what the file holds and keep taking writes.
 * (SQLite WAL: one writer at a time, readers see the snapshot their transaction began with;
 * sqlite.org "Write-Ahead Logging" and "Result and Error Codes" SQLITE_BUSY_SNAPSHOT, from memory.)
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createStore, openDatabase } from '../../server/store/index.ts';
import { fixture, type Fixture } from './backends.ts';

const BIN = join(import.meta.dirname, '../../server/cli/bin.mjs');
const ROWS = 8000;
const HEAD = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';

/** A measurements file with epochs of its own (so no row repeats another file's). */
function csvFile(startJd: number, rows: number): string {
  const lines = [HEAD];
  for (let i = 0; i < rows; i++)
    lines.push(
      `Test Deep,Wren,radial-velocity,JD ${(startJd + i * 0.004).toFixed(6)},${(i % 300) - 150},4,wedge spectrograph`,
    );
  return lines.join('\n');
}

function cli(args: string[]): Promise<{ code: number; stderr: string }> {
  return new Promise((done) => {
    execFile(process.execPath, [BIN, ...args], { timeout: 240_000 }, (err, _out, stderr) =>
      done({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stderr }),
    );
  });
}

let dir: string;
let path: string;
let f: Fixture;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-writers-'));
  path = join(dir, 'shared.db');
  f = await fixture(createStore(await openDatabase({ url: `file:${path}` })));
});
afterAll(() => {
  f.store.close();
  rmSync(dir, { recursive: true, force: true });
});

const importOverHttp = (csv: string) =>
  f.app.request('/api/imports/measurements', {
    method: 'POST',
    headers: { authorization: `Bearer ${f.tokens.observer}`, 'content-type': 'text/csv' },
    body: csv,
  });

async function serverCount(): Promise<number> {
  const res = await f.call('viewer', 'GET', '/api/measurements?limit=1');
  expect(res.status).toBe(200);
  return ((await res.json()) as { total: number }).total;
}

async function fileCount(): Promise<number> {
  const other = await openDatabase({ url: `file:${path}` });
  const n = Number(
    (await other.client.execute('SELECT count(*) AS n FROM measurements')).rows[0]!.n,
  );
  other.close();
  return n;
}

it('takes the server and the CLI writing one file at once, and sees all of it afterwards', async () => {
  expect((await importOverHttp(csvFile(2_460_000, ROWS))).status).toBe(200);
  await serverCount(); // pool connections now hold prepared reads, as in a running server

  const cliFile = join(dir, 'cli.csv');
  writeFileSync(cliFile, csvFile(2_460_100, ROWS));
  const statuses: number[] = [];
  let running = true;
  const load = (async () => {
    for (let k = 0; running; k++) {
      const writes = [
        f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, { notes: `load ${k}` }),
        f.call('observer', 'POST', '/api/measurements', {
          targetId: f.ids.target,
          kind: 'radial-velocity',
          epoch: `JD ${2_460_300 + k * 0.01}`,
          radialVelocityKmS: k,
          sigmaRadialVelocityKmS: 3,
          instrument: 'load spectrograph',
        }),
      ];
      const reads = Array.from({ length: 5 }, () =>
        f.call('viewer', 'GET', '/api/measurements?limit=5'),
      );
      for (const r of await Promise.all([...writes, ...reads])) statuses.push(r.status);
      await new Promise((r) => setTimeout(r, 50));
    }
  })();
  const [viaCli, viaHttp] = await Promise.all([
    cli(['import', '--kind', 'measurements', '--file', cliFile, '--database', `file:${path}`]),
    importOverHttp(csvFile(2_460_200, ROWS)),
  ]);
  running = false;
  await load;

  expect(viaCli.code, viaCli.stderr).toBe(0);
  expect(viaHttp.status, await viaHttp.text()).toBe(200);
  expect(statuses.length).toBeGreaterThan(0);
  expect(statuses.filter((s) => s !== 200 && s !== 201)).toEqual([]); // every write and read under load answered
  expect(await serverCount()).toBe(await fileCount()); // the server reads what the file holds, no stale snapshot
  const after = await f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, { notes: 'after' });
  expect(after.status).toBe(200); // and writes go on
  expect(await fileCount()).toBeGreaterThanOrEqual(3 * ROWS);
}, 300_000);
