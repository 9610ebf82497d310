/**
 * The measurement's component (which body it is of) through the store, the CSV files, the API and
 * the stored fit: a double-lined binary imported from CSV is fitted with its mass ratio; a position
 * said to be of one body is refused naming the field, and nothing is written.
 *
 * Demo scenario (server/store/demo/scenario.ts, invented): the Lantern Pair, a visual binary.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { fitOrbits } from '../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../server/science/random.ts';
import {
  LOCAL_OPERATOR,
  createStore,
  measurementsCsv,
  openDatabase,
  type Store,
} from '../../server/store/index.ts';
import { simulateBinary } from '../science/orbit/fit/binary-simulate.ts';
import { epochs } from '../science/orbit/fit/simulate.ts';
import { tableCounts } from './backends.ts';

const J2015 = 2457023.5;
const YR = 365.25;
// Invented binary (demo values): q = 0.6 at 31.5 pc.
const truth = {
  elements: {
    periodYears: 6,
    periapsis: 'J2019.3',
    eccentricity: 0.45,
    semiMajorAxisArcsec: 0.1611,
    inclinationDeg: 62,
    ascendingNodeDeg: 130,
    argPeriapsisDeg: 75,
  },
  distancePc: 31.5,
  systemicVelocityKmS: 12,
};

describe('measurement component', () => {
  const env = {} as {
    store: Store;
    call: (m: string, p: string, b?: unknown) => Promise<Response>;
  };
  let targetId = 0;
  beforeAll(async () => {
    env.store = createStore(await openDatabase({ url: ':memory:' }));
    const system = await env.store.systems.create(LOCAL_OPERATOR, {
      name: 'Quill Pair',
      raDeg: 40,
      decDeg: -20,
    });
    targetId = (
      await env.store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Quill B' })
    ).id;
    const { secret } = await env.store.users.createWithToken(LOCAL_OPERATOR, {
      name: 'lead',
      role: 'lead',
    });
    const app = createApp({ store: env.store });
    env.call = async (method, path, body) =>
      app.request(path, {
        method,
        headers: { authorization: `Bearer ${secret}`, 'content-type': 'application/json' },
        ...(body === undefined ? {} : { body: JSON.stringify(body) }),
      });
  });
  afterAll(() => env.store.close());

  it('imports a double-lined binary from CSV and the stored fit gives its mass ratio', async () => {
    const r = new SeededRandom(21);
    const ms = simulateBinary(
      truth,
      0.6,
      {
        astrometryJd: epochs(J2015, 8 * YR, 24, r, 20),
        sigmaMas: 1,
        primaryJd: epochs(J2015 + 50, 7 * YR, 16, r, 20),
        secondaryJd: epochs(J2015 + 80, 7 * YR, 16, r, 20),
        sigmaKmS: 0.5,
      },
      22,
    );
    const header = [
      'system',
      'target',
      'kind',
      'component',
      'epoch',
      'dRaMas',
      'dDecMas',
      'sigmaDRaMas',
      'sigmaDDecMas',
      'radialVelocityKmS',
      'sigmaRadialVelocityKmS',
      'instrument',
    ];
    const lines = ms.map((m) => {
      const rec: Record<string, unknown> = {
        ...m,
        system: 'Quill Pair',
        target: 'Quill B',
        epoch: `JD ${m.epoch}`,
        instrument: m.kind === 'offsets' ? 'imager' : 'spectrograph',
      };
      return header.map((c) => rec[c] ?? '').join(',');
    });
    const report = await env.store.importCsv(
      LOCAL_OPERATOR,
      'measurements',
      [header.join(','), ...lines].join('\n'),
    );
    expect(report.written).toBe(ms.length);
    const stored = await env.store.exports.measurements({ targetId });
    const counts = Object.fromEntries(
      ['relative', 'primary', 'secondary'].map((c) => [
        c,
        stored.filter((m) => m.component === c).length,
      ]),
    );
    expect(counts).toEqual({ relative: 24, primary: 16, secondary: 16 });

    // The export carries the column, and reads back as the same components.
    const csv = measurementsCsv(await env.store.exports.measurements({ targetId }));
    expect(csv.split('\n')[0]).toMatch(/^system,target,kind,component,epoch,/);
    expect(csv).toMatch(/radial-velocity,primary,/);

    const prepared = await env.store.fits.prepare([targetId], {});
    const res = fitOrbits(prepared.request);
    const q = res.stars[0]!.quantities.find((x) => x.name === 'massRatio')!;
    expect(Math.abs(q.value - 0.6)).toBeLessThan(4 * q.sigma); // constructed case: q = 0.6
  });

  it('treats a primary and a secondary velocity at one epoch as two measurements, not twins', async () => {
    const base = {
      targetId,
      kind: 'radial-velocity',
      epoch: '2026-01-01T00:00:00Z', // before the tests' clock: no measurement is from the future
      radialVelocityKmS: 5,
      sigmaRadialVelocityKmS: 0.5,
      instrument: 'spectrograph',
    };
    const a = await env.call('POST', '/api/measurements', { ...base, component: 'primary' });
    const b = await env.call('POST', '/api/measurements', { ...base, component: 'secondary' });
    expect([a.status, b.status]).toEqual([201, 201]);
    expect((await a.json()).component).toBe('primary');
    const again = await env.call('POST', '/api/measurements', { ...base, component: 'secondary' });
    expect(again.status).toBe(409);
  });

  it('refuses a position said to be of one body, naming the field, and writes nothing', async () => {
    const before = await tableCounts(env.store);
    const res = await env.call('POST', '/api/measurements', {
      targetId,
      kind: 'offsets',
      component: 'primary',
      epoch: '2026-02-01T00:00:00Z',
      dRaMas: 1,
      dDecMas: 2,
      sigmaDRaMas: 0.5,
      sigmaDDecMas: 0.5,
      instrument: 'imager',
    });
    expect(res.status).toBe(422);
    const text = await res.text();
    expect(text).toContain('component');
    expect(text).toContain('positions are of the secondary relative to the primary');
    const csv = [
      'system,target,kind,component,epoch,dRaMas,dDecMas,sigmaDRaMas,sigmaDDecMas,instrument',
      'Quill Pair,Quill B,offsets,secondary,JD 2461000,1,2,0.5,0.5,imager',
    ].join('\n');
    await expect(env.store.importCsv(LOCAL_OPERATOR, 'measurements', csv)).rejects.toThrow(
      /component/,
    );
    expect(await tableCounts(env.store)).toEqual(before);
  });
});
