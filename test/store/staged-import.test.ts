/**
 * A measurements import is staged in short batches and moved in at once. While it is staged, other
 * writers go on; what they change is checked again at the swap: a twin stored mid-way, or a target
 * deleted, refuses the whole file with the row named, and nothing of it is written or left staged.
 * Other writes between the batches succeed (the import does not hold the write lock throughout).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  ImportRejected,
  LOCAL_OPERATOR,
  createStore,
  openDatabase,
  type Store,
} from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';
import {
  prepareMeasurements,
  prepareMeasurementsPacked,
  unpackMeasurements,
} from '../../server/store/csv/measurement-rows.ts';

const ROWS = 12_000;
const HEAD = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';
const line = (i: number, target = 'Cobble') =>
  `Stage Deep,${target},radial-velocity,JD ${2461000 + i * 0.01},${(i % 400) - 200},5,stage spectrograph`;
const file = (n: number) => [HEAD, ...Array.from({ length: n }, (_, i) => line(i))].join('\n');

async function count(store: Store, table: string): Promise<number> {
  const r = await databaseOf(store).client.execute(`SELECT count(*) AS n FROM ${table}`);
  return Number(r.rows[0]!.n);
}

describe('a staged measurements import', () => {
  let dir: string;
  let store: Store;
  let targetId: number;
  beforeEach(async () => {
    dir = mkdtempSync(join(tmpdir(), 'epochwright-stage-'));
    store = createStore(await openDatabase({ url: `file:${join(dir, 'stage.db')}` }));
    const system = await store.systems.create(LOCAL_OPERATOR, {
      name: 'Stage Deep',
      raDeg: 1,
      decDeg: 1,
    });
    targetId = (await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Cobble' }))
      .id;
  });
  afterEach(() => {
    store.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('lets other writes through between its batches and writes every row at the end', async () => {
    const seen: number[] = [];
    const report = await store.importCsv(LOCAL_OPERATOR, 'measurements', file(ROWS), {
      onRow: async (i) => {
        if (i !== 0) return;
        // Between the first and second batch: another write commits, and the file is not visible yet.
        await store.systems.create(LOCAL_OPERATOR, { name: 'Other Deep', raDeg: 2, decDeg: 2 });
        seen.push(await count(store, 'measurements'));
      },
    });
    expect(report.written).toBe(ROWS);
    expect(seen).toEqual([0]); // no reader saw part of the file (constructed case)
    expect(await count(store, 'measurements')).toBe(ROWS);
    expect(await count(store, 'measurement_staging')).toBe(0);
    expect(await count(store, 'import_runs')).toBe(0);
  });

  it('leaves the event loop free between its statements: staging, moving in and cleaning up', async () => {
    // The local driver is synchronous: an import written as one run of statements would hold the
    // server's thread (health included) until it ended. Counted as turns of the event loop, not time.
    let turns = 0;
    let ticking = true;
    const tick = () => {
      turns++;
      if (ticking) setImmediate(tick);
    };
    let turnsAtFirstBatch = -1;
    const report = await store.importCsv(LOCAL_OPERATOR, 'measurements', file(ROWS), {
      onRow: (i) => {
        if (i !== 0) return;
        turnsAtFirstBatch = turns;
        setImmediate(tick);
      },
    });
    ticking = false;
    expect(report.written).toBe(ROWS);
    // After the first batch: 7,000 rows staged at 250 a statement, moved in and deleted at 2,500.
    expect(turns - turnsAtFirstBatch).toBeGreaterThanOrEqual(28 + 3 + 3);
  });

  it("unpacks a worker's packed rows to the rows prepared here", () => {
    const text = file(4500);
    return expect(unpackMeasurements(prepareMeasurementsPacked(text))).resolves.toEqual(
      prepareMeasurements(text),
    );
  });

  it('refuses the whole file when a twin of a row is stored while it is staged', async () => {
    const err = await store
      .importCsv(LOCAL_OPERATOR, 'measurements', file(ROWS), {
        onRow: async (i) => {
          if (i !== 0) return;
          await store.measurements.create(LOCAL_OPERATOR, {
            targetId,
            kind: 'radial-velocity',
            epoch: `JD ${2461000 + 7 * 0.01}`,
            radialVelocityKmS: 7 - 200,
            sigmaRadialVelocityKmS: 5,
            instrument: 'stage spectrograph',
          });
        },
      })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ImportRejected);
    const problems = (err as ImportRejected).report.problems;
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ line: 9, column: '(row)' }); // file line 9 holds row 7 (header is line 1)
    expect(problems[0]!.rule).toMatch(/as stored measurement \d+/);
    expect(await count(store, 'measurements')).toBe(1); // only the twin written by the other writer
    expect(await count(store, 'measurement_staging')).toBe(0);
  });

  it('refuses the whole file when its target is deleted while it is staged', async () => {
    const err = await store
      .importCsv(LOCAL_OPERATOR, 'measurements', file(ROWS), {
        onRow: async (i) => {
          if (i === 0) await store.targets.remove(LOCAL_OPERATOR, targetId);
        },
      })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ImportRejected);
    expect((err as ImportRejected).report.problems[0]).toMatchObject({
      column: 'target',
      value: targetId,
    });
    expect(await count(store, 'measurements')).toBe(0);
    expect(await count(store, 'measurement_staging')).toBe(0);
  });

  it('refuses a second import of the same file staged at the same time', async () => {
    const text = file(ROWS);
    const results = await Promise.allSettled([
      store.importCsv(LOCAL_OPERATOR, 'measurements', text),
      store.importCsv(LOCAL_OPERATOR, 'measurements', text),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    const refused = results.find((r) => r.status === 'rejected') as PromiseRejectedResult;
    expect((refused.reason as ImportRejected).report.problems[0]!.rule).toMatch(/imported already/);
    expect(await count(store, 'measurements')).toBe(ROWS);
  });
});
