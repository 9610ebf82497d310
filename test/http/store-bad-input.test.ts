/**
 * Bad input for every write endpoint of the store: a clear error (status, code, the field named)
 * and not one row changed anywhere, checked by counting every table before and after.
 * Statuses: 400 malformed or wrong shape (a missing field, a wrong type, an unknown key), 404
 * unknown record in the path, 409 clash with stored state, 413 body too large, 415 not JSON, 422 a
 * well-formed value that breaks a rule (a range, a format, a choice, a refinement)
 * (RFC 9110 §15.5 and RFC 4918 §11.2 for 422, from memory; the split is README's "HTTP API").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, ORBIT_WREN, fixture, tableCounts, type Fixture } from '../store/backends.ts';

type Role = 'lead' | 'observer' | 'viewer';
interface Case {
  name: string;
  role: Role;
  method: string;
  path: string;
  body: unknown;
  status: number;
  field?: string;
}

function cases(f: Fixture): Case[] {
  const { ids } = f;
  const offsets = {
    targetId: ids.target,
    kind: 'offsets',
    epoch: '2026-06-11T04:30:00Z',
    dRaMas: 1,
    dDecMas: 2,
    sigmaDRaMas: 0.3,
    sigmaDDecMas: 0.3,
    instrument: 'imager',
  };
  return [
    {
      name: 'system without a name',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { raDeg: 1, decDeg: 2 },
      status: 400,
      field: 'name',
    },
    {
      name: 'system with a right ascension past 24 h',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'A', raDeg: '25:00:00', decDeg: 2 },
      status: 422,
      field: 'raDeg',
    },
    {
      name: 'system north of the pole',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'A', raDeg: 1, decDeg: 95 },
      status: 422,
      field: 'decDeg',
    },
    {
      name: 'system with an unknown field',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'A', raDeg: 1, decDeg: 2, colour: 'red' },
      status: 400,
    },
    {
      name: 'system with a name already used',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'Test Deep', raDeg: 1, decDeg: 2 },
      status: 409,
    },
    {
      name: 'patch of a system that does not exist',
      role: 'lead',
      method: 'PATCH',
      path: '/api/systems/9999',
      body: { notes: 'x' },
      status: 404,
    },
    {
      name: 'patch of a system to an impossible declination',
      role: 'lead',
      method: 'PATCH',
      path: `/api/systems/${ids.system}`,
      body: { decDeg: -91 },
      status: 422,
      field: 'decDeg',
    },
    {
      name: 'delete of a system still holding targets',
      role: 'lead',
      method: 'DELETE',
      path: `/api/systems/${ids.system}`,
      body: undefined,
      status: 409,
    },
    {
      name: 'system moving 30″ a year',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'A', raDeg: 1, decDeg: 2, pmRaMasYr: 30_000 },
      status: 422,
      field: 'pmRaMasYr',
    },
    {
      name: 'system positioned at no epoch',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: { name: 'A', raDeg: 1, decDeg: 2, positionEpoch: 'last spring' },
      status: 422,
      field: 'positionEpoch',
    },
    {
      name: 'patch of a system to an epoch without a zone',
      role: 'lead',
      method: 'PATCH',
      path: `/api/systems/${ids.system}`,
      body: { positionEpoch: '2016-01-01T12:00' },
      status: 422,
      field: 'positionEpoch',
    },
    {
      name: 'patch of a system to a proper motion the sky engine refuses',
      role: 'lead',
      method: 'PATCH',
      path: `/api/systems/${ids.system}`,
      body: { pmDecMasYr: -25_000, notes: 'changed' },
      status: 422,
      field: 'pmDecMasYr',
    },
    {
      name: 'target of an unknown system',
      role: 'lead',
      method: 'POST',
      path: '/api/targets',
      body: { systemId: 9999, name: 'x' },
      status: 422,
      field: 'systemId',
    },
    {
      name: 'target with a text magnitude',
      role: 'lead',
      method: 'POST',
      path: '/api/targets',
      body: { systemId: ids.system, name: 'x', magnitude: 'bright' },
      status: 400,
      field: 'magnitude',
    },
    {
      name: 'orbit with e = 1.2',
      role: 'lead',
      method: 'POST',
      path: '/api/orbit-solutions',
      body: {
        targetId: ids.target,
        orbit: { ...ORBIT_WREN, elements: { ...ORBIT_WREN.elements, eccentricity: 1.2 } },
      },
      status: 422,
      field: 'orbit.elements.eccentricity',
    },
    {
      name: 'orbit without elements',
      role: 'lead',
      method: 'POST',
      path: '/api/orbit-solutions',
      body: { targetId: ids.target, orbit: {} },
      status: 400,
    },
    {
      name: 'orbit of an unknown target',
      role: 'lead',
      method: 'POST',
      path: '/api/orbit-solutions',
      body: { targetId: 9999, orbit: ORBIT_WREN },
      status: 422,
      field: 'targetId',
    },
    {
      name: 'fitted orbit without its measurements',
      role: 'lead',
      method: 'POST',
      path: '/api/orbit-solutions',
      body: { targetId: ids.target, orbit: ORBIT_WREN, provenance: 'fitted' },
      status: 422,
      field: 'fittedFrom',
    },
    {
      name: 'site in an unknown time zone',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: { name: 'P', latitudeDeg: 1, longitudeDeg: 1, elevationM: 1, timeZone: 'Mars/Olympus' },
      status: 422,
      field: 'timeZone',
    },
    {
      name: 'site at latitude 91',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: { name: 'P', latitudeDeg: 91, longitudeDeg: 1, elevationM: 1, timeZone: 'UTC' },
      status: 422,
      field: 'latitudeDeg',
    },
    {
      name: 'site whose second mask point is above the zenith',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: {
        name: 'P',
        latitudeDeg: 1,
        longitudeDeg: 1,
        elevationM: 1,
        timeZone: 'UTC',
        horizonMask: [
          { azimuthDeg: 0, altitudeDeg: 10 },
          { azimuthDeg: 90, altitudeDeg: 95 },
        ],
      },
      status: 422,
      field: 'horizonMask.1.altitudeDeg',
    },
    {
      name: 'site whose mask gives one azimuth twice',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: {
        name: 'P',
        latitudeDeg: 1,
        longitudeDeg: 1,
        elevationM: 1,
        timeZone: 'UTC',
        horizonMask: [
          { azimuthDeg: 90, altitudeDeg: 10 },
          { azimuthDeg: 90, altitudeDeg: 12 },
        ],
      },
      status: 422,
      field: 'horizonMask',
    },
    {
      name: 'site whose mask is not a list',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: {
        name: 'P',
        latitudeDeg: 1,
        longitudeDeg: 1,
        elevationM: 1,
        timeZone: 'UTC',
        horizonMask: { azimuthDeg: 90, altitudeDeg: 10 },
      },
      status: 400,
      field: 'horizonMask',
    },
    {
      name: 'site mask point with an unknown field',
      role: 'lead',
      method: 'POST',
      path: '/api/sites',
      body: {
        name: 'P',
        latitudeDeg: 1,
        longitudeDeg: 1,
        elevationM: 1,
        timeZone: 'UTC',
        horizonMask: [{ azimuthDeg: 90, altitudeDeg: 10, height: 3 }],
      },
      status: 400,
    },
    {
      name: 'patch of a site to a mask at azimuth 360',
      role: 'lead',
      method: 'PATCH',
      path: `/api/sites/${ids.site}`,
      body: { horizonMask: [{ azimuthDeg: 360, altitudeDeg: 10 }], notes: 'changed' },
      status: 422,
      field: 'horizonMask.0.azimuthDeg',
    },
    {
      name: 'patch of an orbit solution (immutable)',
      role: 'lead',
      method: 'PATCH',
      path: '/api/orbit-solutions/1',
      body: { notes: 'changed' },
      status: 405,
    },
    {
      name: 'campaign ending before it starts',
      role: 'lead',
      method: 'POST',
      path: '/api/campaigns',
      body: {
        name: 'C2',
        startDate: '2027-05-01',
        endDate: '2027-04-01',
        goals: { cadenceDays: 7, kinds: ['astrometry'] },
      },
      status: 422,
      field: 'endDate',
    },
    {
      name: 'campaign naming a good and an unknown target',
      role: 'lead',
      method: 'POST',
      path: '/api/campaigns',
      body: {
        name: 'C2',
        startDate: '2027-01-01',
        endDate: '2027-04-01',
        goals: { cadenceDays: 7, kinds: ['astrometry'] },
        targetIds: [ids.target, 9999],
      },
      status: 422,
      field: 'targetIds.1',
    },
    {
      name: 'campaign without a measurement kind',
      role: 'lead',
      method: 'POST',
      path: '/api/campaigns',
      body: {
        name: 'C2',
        startDate: '2027-01-01',
        endDate: '2027-04-01',
        goals: { cadenceDays: 7, kinds: [] },
      },
      status: 422,
      field: 'goals.kinds',
    },
    {
      name: 'night on 30 February',
      role: 'observer',
      method: 'POST',
      path: '/api/nights',
      body: { siteId: ids.site, date: '2027-02-30' },
      status: 422,
      field: 'date',
    },
    {
      name: 'night outside its campaign',
      role: 'observer',
      method: 'POST',
      path: '/api/nights',
      body: { siteId: ids.site, campaignId: ids.campaign, date: '2028-01-05' },
      status: 422,
      field: 'date',
    },
    {
      name: 'second night for the same site and date',
      role: 'observer',
      method: 'POST',
      path: '/api/nights',
      body: { siteId: ids.site, date: '2026-06-10' },
      status: 409,
    },
    {
      name: 'block ending before it starts',
      role: 'observer',
      method: 'POST',
      path: '/api/blocks',
      body: {
        nightId: ids.night,
        targetId: ids.target,
        kind: 'astrometry',
        startUtc: '2026-06-11T05:00:00Z',
        endUtc: '2026-06-11T04:00:00Z',
      },
      status: 422,
      field: 'endUtc',
    },
    {
      name: 'block outside its night',
      role: 'observer',
      method: 'POST',
      path: '/api/blocks',
      body: {
        nightId: ids.night,
        targetId: ids.target,
        kind: 'astrometry',
        startUtc: '2026-06-12T05:00:00Z',
        endUtc: '2026-06-12T06:00:00Z',
      },
      status: 422,
      field: 'startUtc',
    },
    {
      name: 'block of an unknown kind',
      role: 'observer',
      method: 'POST',
      path: '/api/blocks',
      body: {
        nightId: ids.night,
        targetId: ids.target,
        kind: 'imaging',
        startUtc: '2026-06-11T05:00:00Z',
        endUtc: '2026-06-11T06:00:00Z',
      },
      status: 422,
      field: 'kind',
    },
    {
      name: 'block time without a zone',
      role: 'observer',
      method: 'POST',
      path: '/api/blocks',
      body: {
        nightId: ids.night,
        targetId: ids.target,
        kind: 'astrometry',
        startUtc: '2026-06-11T05:00:00',
        endUtc: '2026-06-11T06:00:00Z',
      },
      status: 422,
      field: 'startUtc',
    },
    {
      name: 'block in an unknown night',
      role: 'observer',
      method: 'POST',
      path: '/api/blocks',
      body: {
        nightId: 9999,
        targetId: ids.target,
        kind: 'astrometry',
        startUtc: '2026-06-11T05:00:00Z',
        endUtc: '2026-06-11T06:00:00Z',
      },
      status: 422,
      field: 'nightId',
    },
    {
      name: 'block patch with a stale version',
      role: 'observer',
      method: 'PATCH',
      path: `/api/blocks/${ids.block}`,
      body: { notes: 'x', version: 7 },
      status: 409,
    },
    {
      name: 'report with a Strehl ratio above 1',
      role: 'observer',
      method: 'POST',
      path: '/api/night-reports',
      body: { nightId: ids.night, strehlRatio: 1.5 },
      status: 422,
      field: 'strehlRatio',
    },
    {
      name: 'report whose second outcome names an unknown block',
      role: 'observer',
      method: 'POST',
      path: '/api/night-reports',
      body: {
        nightId: ids.night,
        outcomes: [
          { blockId: ids.block, status: 'obtained' },
          { blockId: 9999, status: 'lost' },
        ],
      },
      status: 422,
      field: 'outcomes.1.blockId',
    },
    {
      name: 'offsets without Δδ',
      role: 'observer',
      method: 'POST',
      path: '/api/measurements',
      body: { ...offsets, dDecMas: undefined },
      status: 422,
      field: 'dDecMas',
    },
    {
      name: 'radial velocity carrying an offset',
      role: 'observer',
      method: 'POST',
      path: '/api/measurements',
      body: {
        ...offsets,
        kind: 'radial-velocity',
        radialVelocityKmS: 100,
        sigmaRadialVelocityKmS: 5,
      },
      status: 422,
    },
    {
      name: 'measurement at no epoch',
      role: 'observer',
      method: 'POST',
      path: '/api/measurements',
      body: { ...offsets, epoch: 'yesterday' },
      status: 422,
      field: 'epoch',
    },
    {
      name: 'measurement with a correlation of 2',
      role: 'observer',
      method: 'POST',
      path: '/api/measurements',
      body: { ...offsets, correlation: 2 },
      status: 422,
      field: 'correlation',
    },
    {
      name: 'measurement of an unknown target',
      role: 'observer',
      method: 'POST',
      path: '/api/measurements',
      body: { ...offsets, targetId: 9999 },
      status: 422,
      field: 'targetId',
    },
    {
      name: 'user with an unknown role',
      role: 'lead',
      method: 'POST',
      path: '/api/users',
      body: { name: 'x', role: 'admin' },
      status: 422,
      field: 'role',
    },
    {
      name: 'user with a name already used',
      role: 'lead',
      method: 'POST',
      path: '/api/users',
      body: { name: 'lead one', role: 'viewer' },
      status: 409,
    },
    {
      name: 'malformed JSON',
      role: 'lead',
      method: 'POST',
      path: '/api/systems',
      body: '{"name": "A",',
      status: 400,
    },
  ];
}

describe.each(BACKENDS)('bad input on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  beforeAll(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store, { maxBodyBytes: 4096 });
  });
  afterAll(() => cleanup());

  it('rejects every bad write with a clear error and changes nothing', async () => {
    const before = await tableCounts(f.store);
    const blockBefore = await f.store.blocks.get(f.ids.block);
    const rowsBefore = [
      await f.store.systems.get(f.ids.system),
      await f.store.sites.get(f.ids.site),
      await f.store.orbitSolutions.get(1),
    ];
    for (const c of cases(f)) {
      const res = await f.call(c.role, c.method, c.path, c.body);
      const text = await res.text();
      expect(res.status, `${c.name}: ${text}`).toBe(c.status);
      const err = JSON.parse(text) as {
        error: {
          code: string;
          message: string;
          details?: { field?: string; issues?: { field: string }[] };
        };
      };
      expect(err.error.message.length, c.name).toBeGreaterThan(0);
      if (c.field) {
        const fields = [
          err.error.details?.field,
          ...(err.error.details?.issues ?? []).map((i) => i.field),
        ];
        expect(fields, `${c.name}: ${text}`).toContain(c.field);
      }
      expect(await tableCounts(f.store), c.name).toEqual(before);
    }
    expect(await f.store.blocks.get(f.ids.block)).toEqual(blockBefore); // the report that failed on its second outcome did not touch the first block
    expect([
      await f.store.systems.get(f.ids.system),
      await f.store.sites.get(f.ids.site),
      await f.store.orbitSolutions.get(1),
    ]).toEqual(rowsBefore); // failed patches left the rows as they were
  });

  it('refuses bodies over the size limit and bodies that are not JSON', async () => {
    const before = await tableCounts(f.store);
    const big = await f.call('lead', 'POST', '/api/systems', {
      name: 'Big',
      raDeg: 1,
      decDeg: 1,
      notes: 'x'.repeat(5000),
    });
    expect(big.status).toBe(413); // RFC 9110 §15.5.14 Content Too Large; limit 4096 bytes set in this test
    const plain = await f.app.request('/api/systems', {
      method: 'POST',
      headers: { authorization: `Bearer ${f.tokens.lead}`, 'content-type': 'text/plain' },
      body: '{"name":"A","raDeg":1,"decDeg":1}',
    });
    expect([400, 415]).toContain(plain.status); // RFC 9110 §15.5.16 Unsupported Media Type (hono's JSON validator may answer 400)
    expect(await tableCounts(f.store)).toEqual(before);
  });

  it('rejects a malformed CSV and a CSV with bad rows, listing every bad row, writing nothing', async () => {
    const before = await tableCounts(f.store);
    const post = (kind: string, body: string, type = 'text/csv') =>
      f.app.request(`/api/imports/${kind}`, {
        method: 'POST',
        headers: { authorization: `Bearer ${f.tokens.lead}`, 'content-type': type },
        body,
      });
    const broken = await post(
      'measurements',
      'system,target,kind,epoch,instrument\n"Test Deep,Wren,offsets\n',
    );
    expect(broken.status).toBe(422);
    const rows = [
      'system,target,kind,epoch,dRaMas,dDecMas,sigmaDRaMas,sigmaDDecMas,instrument',
      'Test Deep,Wren,offsets,2026-06-11T04:00:00Z,1,2,0.3,0.3,imager',
      'Test Deep,Wren,offsets,2026-06-11T04:10:00Z,abc,2,0.3,0.3,imager',
      'Test Deep,Wren,offsets,2026-06-11T04:20:00Z,1,2,0.3,0.3,imager',
      'Test Deep,Tarn,offsets,2026-06-11T04:30:00Z,1,2,0.3,0.3,imager',
      'Test Deep,Wren,offsets,someday,1,2,-0.3,0.3,imager',
    ].join('\n');
    const bad = await post('measurements', rows);
    expect(bad.status).toBe(422);
    const report = (
      (await bad.json()) as {
        error: {
          details: {
            problems: { line: number; column: string; value: unknown; rule: string }[];
            written: number;
          };
        };
      }
    ).error.details;
    expect(report.written).toBe(0);
    expect(report.problems.map((p) => [p.line, p.column])).toEqual([
      [3, 'dRaMas'],
      [5, 'target'],
      [6, 'epoch'],
      [6, 'sigmaDRaMas'],
    ]); // the bad cells planted above
    expect(report.problems[0]!.value).toBe('abc');
    const header = await post('measurements', 'system,target,kind,epoch,instrument,colour\n');
    expect(
      ((await header.json()) as { error: { details: { problems: { column: string }[] } } }).error
        .details.problems[0]!.column,
    ).toBe('colour');
    expect(
      (await post('measurements', rows.split('\n').slice(0, 2).join('\n'), 'application/json'))
        .status,
    ).toBe(415);
    expect(
      (
        await f.app.request('/api/imports/measurements', {
          method: 'POST',
          headers: { authorization: `Bearer ${f.tokens.viewer}`, 'content-type': 'text/csv' },
          body: rows,
        })
      ).status,
    ).toBe(403);
    expect(await tableCounts(f.store)).toEqual(before);
  });
});
