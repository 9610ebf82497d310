/**
 * Reads of many rows go page by page (store/yield.ts) and still answer in the order a single
 * statement gave: the measurements export by system, target (UTF-8 byte order, SQLite's BINARY
 * collation: sqlite.org "Datatypes In SQLite" §7.1, from memory) and epoch; a stored fit's
 * measurements by epoch. The rows are stored out of order, over more than one page. Names and
 * values are invented.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { createApp } from '../../server/http/app.ts';
import {
  measurementsCsv,
  type ExportedMeasurement,
} from '../../server/store/exports/measurements.ts';
import type { MeasurementFilter } from '../../server/store/repos/measurements.ts';
import { PAGE_ROWS } from '../../server/store/yield.ts';

// Over several read pages, and over one export part (CSV_ROWS_PER_JOB, 5,000 rows) in all.
const PER_TARGET = Math.max(Math.ceil(PAGE_ROWS * 1.3), 1800);
let store: Store;
let ids: Record<string, number>;

beforeAll(async () => {
  store = createStore(await openDatabase({ url: ':memory:' }));
  const system = await store.systems.create(LOCAL_OPERATOR, {
    name: 'Page Deep',
    raDeg: 1,
    decDeg: 1,
  });
  ids = {};
  // 'Z' sorts before 'a' in byte order, and 'é' (two UTF-8 bytes) after both.
  for (const name of ['a-star', 'Z-star', 'é-star'])
    ids[name] = (await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name })).id;
  const { client } = databaseOf(store);
  const values: string[] = [];
  // Interleaved targets, epochs descending: id order is neither target nor epoch order.
  for (let i = PER_TARGET - 1; i >= 0; i--)
    for (const id of Object.values(ids)) {
      const jd = 2460000.5 + i * 0.37;
      values.push(
        `(${id},'radial-velocity','JD ${jd}',${jd},${i % 50},3,'page spectrograph','2026-01-01T00:00:00Z','2026-01-01T00:00:00Z')`,
      );
    }
  await client.execute(
    `INSERT INTO measurements (target_id,kind,epoch,epoch_jd,radial_velocity_km_s,sigma_radial_velocity_km_s,instrument,created_at,updated_at) VALUES ${values.join(',')}`,
  );
});
afterAll(() => store.close());

describe('reads in pages', () => {
  it('export every measurement by system, target in byte order, then epoch', async () => {
    const rows = await store.exports.measurements({});
    expect(rows).toHaveLength(3 * PER_TARGET);
    const targetsInOrder = [...new Set(rows.map((r) => r.target))];
    expect(targetsInOrder).toEqual(['Z-star', 'a-star', 'é-star']);
    for (const name of targetsInOrder) {
      const jds = rows.filter((r) => r.target === name).map((r) => r.epochJd);
      expect(jds).toEqual([...jds].sort((a, b) => a - b));
    }
  });

  it('export with filters the rows of the whole export that match, in its order', async () => {
    const all = await store.exports.measurements({});
    const [lo, hi] = [2460000.5 + 100 * 0.37, 2460000.5 + 900 * 0.37];
    const cases = [
      [{ kind: 'offsets' as const }, () => false],
      [{ kind: 'radial-velocity' as const }, () => true],
      [{ targetId: ids['é-star'] }, (r) => r.target === 'é-star'],
      [{ start: `JD ${lo}`, end: `JD ${hi}` }, (r) => r.epochJd >= lo && r.epochJd <= hi],
      [{ systemId: 999 }, () => false],
    ] satisfies [MeasurementFilter, (r: ExportedMeasurement) => boolean][];
    for (const [filter, keep] of cases)
      expect([filter, await store.exports.measurements(filter)]).toEqual([
        filter,
        all.filter(keep),
      ]);
  });

  it('export over HTTP in parts that join to the one file', async () => {
    const { secret } = await store.users.createWithToken(LOCAL_OPERATOR, {
      name: 'page viewer',
      role: 'viewer',
    });
    const res = await createApp({ store }).request('/api/exports/measurements', {
      headers: { authorization: `Bearer ${secret}` },
    });
    expect(res.status).toBe(200);
    expect(await res.text()).toBe(measurementsCsv(await store.exports.measurements({})));
  });

  it('give a stored fit every measurement of its target in epoch order', async () => {
    const { request, targets } = await store.fits.prepare([ids['a-star']!], {});
    const jds = request.stars[0]!.measurements.map((m) => Number(String(m.epoch).slice(3)));
    expect(jds).toHaveLength(PER_TARGET);
    expect(jds.every(Number.isFinite)).toBe(true); // the epochs as stored above, 'JD …'
    expect(jds).toEqual([...jds].sort((a, b) => a - b));
    expect(targets[0]!.measurementIds).toHaveLength(PER_TARGET);
  });
});
