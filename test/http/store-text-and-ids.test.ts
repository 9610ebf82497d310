/**
 * Rules on the way in and out that every write path shares: no control characters in stored text,
 * ids in plain decimal, one epoch range, strict numbers in CSV, formula cells escaped in exports,
 * security headers, a private database file. Each refusal names the field and writes nothing
 * (table counts compared before and after, as in store-bad-input.test.ts).
 */
import { statSync } from 'node:fs';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createStore, openDatabase } from '../../server/store/index.ts';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface ErrorBody {
  error: {
    code: string;
    message: string;
    details?: {
      field?: string;
      issues?: { field: string; rule: string }[];
      problems?: { line: number; column: string; value: unknown; rule: string }[];
    };
  };
}

/** The fields an error names (a 400's issues or a 422's field). */
function namedFields(body: ErrorBody): string[] {
  const d = body.error.details;
  return [d?.field, ...(d?.issues ?? []).map((i) => i.field)].filter(
    (x): x is string => x !== undefined,
  );
}

describe.each(BACKENDS)('text, ids and epochs on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  beforeAll(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store);
  });
  afterAll(() => cleanup());

  /** Send, expect a refusal (400 shape, 422 rule) naming `field`, and no table changed. */
  async function refused(
    method: string,
    path: string,
    body: unknown,
    field: string,
    rule: RegExp,
  ): Promise<void> {
    const before = await tableCounts(f.store);
    const res = await f.call('lead', method, path, body);
    const text = await res.text();
    expect([400, 422], `${method} ${path}: ${text}`).toContain(res.status);
    const err = JSON.parse(text) as ErrorBody;
    expect(namedFields(err), text).toContain(field);
    expect(text).toMatch(rule);
    expect(await tableCounts(f.store), `${method} ${path}`).toEqual(before);
  }

  it('refuses control characters in text on POST and PATCH, keeping tab and newline in notes', async () => {
    const control = /control characters/;
    // U+0000 NUL and U+001B ESC are C0 control characters (Unicode 15, chart U+0000–U+007F, from memory)
    await refused(
      'POST',
      '/api/systems',
      { name: 'a\u0000b', raDeg: 1, decDeg: 2 },
      'name',
      control,
    );
    await refused(
      'PATCH',
      `/api/systems/${f.ids.system}`,
      { name: 'x\u001b[31m' },
      'name',
      control,
    );
    await refused(
      'POST',
      '/api/targets',
      { systemId: f.ids.system, name: 'T\u0007' },
      'name',
      control,
    );
    await refused('PATCH', `/api/sites/${f.ids.site}`, { notes: 'ok\u0000cut' }, 'notes', control);
    await refused(
      'POST',
      '/api/campaigns',
      {
        name: 'C\u0000',
        startDate: '2027-01-01',
        endDate: '2027-02-01',
        goals: { cadenceDays: 1, kinds: ['astrometry'] },
      },
      'name',
      control,
    );
    await refused('POST', '/api/users', { name: 'u\u0000', role: 'viewer' }, 'name', control);
    await refused(
      'POST',
      '/api/measurements',
      {
        targetId: f.ids.target,
        kind: 'radial-velocity',
        epoch: '2026-06-01T04:00:00Z',
        radialVelocityKmS: 10,
        sigmaRadialVelocityKmS: 1,
        instrument: 'spec\ttrograph',
      },
      'instrument',
      control,
    );
    const ok = await f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, {
      notes: 'line one\n\tline two\r\n',
    });
    expect(ok.status).toBe(200); // tab and line breaks are the free-text exceptions
  });

  it('takes path ids in plain decimal only', async () => {
    for (const id of ['0x2', '2.0', '1e0', '%202', '+1', '01', '0', '-1']) {
      const before = await tableCounts(f.store);
      const res = await f.call('lead', 'PATCH', `/api/systems/${id}`, { notes: 'changed' });
      const text = await res.text();
      expect(res.status, `${id}: ${text}`).toBe(400);
      expect(namedFields(JSON.parse(text) as ErrorBody), id).toContain('id');
      expect(await tableCounts(f.store)).toEqual(before);
    }
    expect((await f.store.systems.get(f.ids.system)).notes).not.toBe('changed');
    expect((await f.call('lead', 'GET', `/api/systems/${f.ids.system}`)).status).toBe(200);
    // A path that names no id is a malformed address (400); a query value in the wrong format breaks its rule (422).
    expect((await f.call('lead', 'GET', '/api/systems?limit=0x10')).status).toBe(422);
  });

  it('holds stored epochs to the years 1000–3000 in every form', async () => {
    const rule = /years 1000 and 3000/;
    for (const epoch of ['9999-01-01T00:00:00Z', 'JD 0'])
      await refused(
        'POST',
        '/api/measurements',
        {
          targetId: f.ids.target,
          kind: 'radial-velocity',
          epoch,
          radialVelocityKmS: 10,
          sigmaRadialVelocityKmS: 1,
          instrument: 'spec',
        },
        'epoch',
        rule,
      );
    await refused(
      'PATCH',
      `/api/systems/${f.ids.system}`,
      { positionEpoch: '9999-01-01T00:00:00Z' },
      'positionEpoch',
      rule,
    );
  });

  it('reads CSV numbers as plain decimals only, naming line and column', async () => {
    const before = await tableCounts(f.store);
    const head = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';
    const csv = [
      head,
      'Test Deep,Wren,radial-velocity,2026-06-01T04:00:00Z,0x10,1,spec',
      'Test Deep,Wren,radial-velocity,2026-06-01T05:00:00Z," 1 ",1,spec',
      'Test Deep,Wren,radial-velocity,2026-06-01T06:00:00Z,Infinity,1,spec',
      'Test Deep,Wren,radial-velocity,2026-06-01T07:00:00Z,-12.5e0,1,spec',
    ].join('\n');
    const res = await f.app.request('/api/imports/measurements?dryRun=true', {
      method: 'POST',
      headers: { authorization: `Bearer ${f.tokens.lead}`, 'content-type': 'text/csv' },
      body: csv,
    });
    expect(res.status).toBe(422);
    const problems = ((await res.json()) as ErrorBody).error.details!.problems!;
    expect(problems.map((p) => [p.line, p.column, p.value])).toEqual([
      [2, 'radialVelocityKmS', '0x10'],
      [3, 'radialVelocityKmS', ' 1 '],
      [4, 'radialVelocityKmS', 'Infinity'],
    ]); // the three bad cells planted above; -12.5e0 is a plain decimal
    expect(problems[0]!.rule).toMatch(/decimal number/);
    expect(await tableCounts(f.store)).toEqual(before);
  });

  it('escapes formula cells in the CSV export and reads them back as they were', async () => {
    const instrument = '=HYPERLINK("http://example.invalid","x")';
    const notes = '@SUM(1+1)';
    const created = await f.call('lead', 'POST', '/api/measurements', {
      targetId: f.ids.target,
      kind: 'radial-velocity',
      epoch: '2026-05-01T04:00:00Z',
      radialVelocityKmS: -12.5,
      sigmaRadialVelocityKmS: 1,
      instrument,
      notes,
    });
    expect(created.status).toBe(201);
    const csv = await (await f.call('viewer', 'GET', '/api/exports/measurements')).text();
    // OWASP "CSV Injection": prefix cells starting with = + - @ tab CR by a single quote (from memory)
    expect(csv).toContain(`"'=HYPERLINK(""http://example.invalid"",""x"")"`);
    expect(csv).toContain(`'@SUM(1+1)`);
    expect(csv).toContain(',-12.5,'); // a negative number is no formula: written as it is
    expect(csv).not.toMatch(/(^|,)"?=/m);
    const { parse } = await import('csv-parse/sync');
    const { cellValues } = await import('../../server/store/csv/read.ts');
    const [header, row] = parse(csv) as string[][];
    const back = cellValues(Object.fromEntries(header!.map((h, j) => [h, row![j]!])));
    expect([back.instrument, back.notes, back.radialVelocityKmS]).toEqual([
      instrument,
      notes,
      -12.5,
    ]);
  });

  it('refuses control characters in a token label', async () => {
    const before = await tableCounts(f.store);
    await expect(
      f.store.users.issueToken({ userId: null }, 'lead one', 'bad\u0000label'),
    ).rejects.toThrow(/control characters/);
    expect(await tableCounts(f.store)).toEqual(before);
  });

  it('bounds measured values and orbit periods by physical ranges', async () => {
    const offsets = {
      targetId: f.ids.target,
      kind: 'offsets',
      epoch: '2026-06-01T04:00:00Z',
      dRaMas: 1,
      dDecMas: 2,
      sigmaDRaMas: 0.3,
      sigmaDDecMas: 0.3,
      instrument: 'imager',
    };
    // the values of the issue's probe; the ranges are ours, documented on each field
    await refused('POST', '/api/measurements', { ...offsets, dRaMas: 1e308 }, 'dRaMas', /1000000/);
    await refused(
      'POST',
      '/api/measurements',
      { ...offsets, sigmaDDecMas: 1e-300 },
      'sigmaDDecMas',
      /0.0001/,
    );
    const { ORBIT_WREN } = await import('../store/backends.ts');
    await refused(
      'POST',
      '/api/orbit-solutions',
      {
        targetId: f.ids.target,
        orbit: { ...ORBIT_WREN, elements: { ...ORBIT_WREN.elements, periodYears: 1e308 } },
      },
      'orbit.elements.periodYears',
      /at most 1e\+7/,
    );
  });

  it('names the member field when orbit elements match neither form', async () => {
    const { ORBIT_WREN } = await import('../store/backends.ts');
    const campbell = { ...ORBIT_WREN.elements, periodYears: 'ten' };
    const thieleInnes = {
      kind: 'thiele-innes',
      periodYears: 10,
      periapsis: '2027-01-01T00:00:00Z',
      eccentricity: 0.5,
      aArcsec: 0.1,
      bArcsec: 0.1,
      fArcsec: 0.1,
    };
    for (const [elements, field] of [
      [campbell, 'orbit.elements.periodYears'],
      [thieleInnes, 'orbit.elements.gArcsec'],
    ] as const) {
      const res = await f.call('viewer', 'POST', '/api/ephemeris', {
        orbit: { elements },
        epochs: ['2027-01-01T00:00:00Z'],
      });
      const text = await res.text();
      expect(res.status, text).toBe(400);
      expect(namedFields(JSON.parse(text) as ErrorBody), text).toEqual([field]);
    }
  });

  it('reads coordinates as typed in stored systems and sites, and in the sky endpoints', async () => {
    // (16 + 41/60 + 12.5/3600) × 15 = 250.3020833…°, −(26 + 41/60 + 12/3600) = −26.6866…°
    // (sexagesimal arithmetic, common practice, no source)
    const res = await f.call('lead', 'POST', '/api/systems', {
      name: 'Typed Core',
      raDeg: '16:41:12.5',
      decDeg: '-26°41′12″',
    });
    const sys = (await res.json()) as { id: number; raDeg: number; decDeg: number };
    expect(res.status).toBe(201);
    expect(sys.raDeg).toBeCloseTo(250.3020833333, 9);
    expect(sys.decDeg).toBeCloseTo(-26.6866666667, 9);
    const patched = await f.call('lead', 'PATCH', `/api/systems/${sys.id}`, { raDeg: '16.69h' });
    expect(((await patched.json()) as { raDeg: number }).raDeg).toBeCloseTo(250.35, 10);
    await refused(
      'POST',
      '/api/systems',
      { name: 'Comma', raDeg: '250,3', decDeg: 1 },
      'raDeg',
      /use a decimal point: 250\.3/,
    );

    const site = { name: 'Sign Slip', latitudeDeg: '-31:30:00', elevationM: 2400 };
    // +68.93° in America/Argentina/San_Juan (UTC−3): the report's wrong-signed longitude
    await refused(
      'POST',
      '/api/sites',
      { ...site, longitudeDeg: 68.93, timeZone: 'America/Argentina/San_Juan' },
      'longitudeDeg',
      /likely correction: longitude -68\.9300°/,
    );
    await refused(
      'POST',
      '/api/sites',
      { ...site, longitudeDeg: -68.93, timeZone: 'America/Argentina/SanJuan' },
      'timeZone',
      /nearest valid names: \W{1,3}America\/Argentina\/San_Juan/,
    );
    const kept = await f.call('lead', 'POST', '/api/sites', {
      ...site,
      longitudeDeg: '-68d55m48s',
      timeZone: 'America/Argentina/San_Juan',
    });
    const row = (await kept.json()) as { id: number; latitudeDeg: number; longitudeDeg: number };
    expect(kept.status).toBe(201);
    expect([row.latitudeDeg, row.longitudeDeg]).toEqual([-31.5, -(68 + 55 / 60 + 48 / 3600)]);
    // a confirmed mismatch is stored as such, and a later patch of another field keeps it
    const confirmed = await f.call('lead', 'POST', '/api/sites', {
      ...site,
      name: 'Far Clock',
      longitudeDeg: 68.93,
      timeZone: 'America/Argentina/San_Juan',
      longitudeZoneConfirmed: true,
    });
    expect(confirmed.status).toBe(201);
    const later = await f.call(
      'lead',
      'PATCH',
      `/api/sites/${((await confirmed.json()) as { id: number }).id}`,
      {
        notes: 'keeps the capital’s clock',
      },
    );
    expect(later.status).toBe(200);

    const night = await f.call('viewer', 'POST', '/api/sky/night', {
      site: { ...site, longitudeDeg: '-68:55:48', timeZone: 'America/Argentina/San_Juan' },
      date: '2027-06-15',
      targets: [{ name: 'typed', raDeg: '17:35:22', decDeg: '-21:42:58' }],
    });
    expect(night.status, await night.clone().text()).toBe(200);
  });

  it('refuses to revoke the last active token of any lead, and allows it once another exists', async () => {
    const [own] = await f.store.users.listTokens('lead one');
    const before = await tableCounts(f.store);
    const refusedRevoke = await f.call('lead', 'DELETE', `/api/tokens/${own!.id}`);
    const text = await refusedRevoke.text();
    expect(refusedRevoke.status, text).toBe(409);
    expect(text).toMatch(/last active token of any lead/);
    expect(await tableCounts(f.store)).toEqual(before);
    expect(await f.store.users.authenticate(f.tokens.lead)).not.toBeNull(); // still signs in
    const spare = await f.store.users.issueToken({ userId: null }, 'lead one', 'spare');
    expect((await f.call('lead', 'DELETE', `/api/tokens/${own!.id}`)).status).toBe(204);
    f.tokens.lead = spare.secret; // the later tests sign in with the spare
  });

  it('sends the usual security headers', async () => {
    const res = await f.call(null, 'GET', '/api/health');
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(csp).toMatch(/frame-ancestors 'none'/); // CSP Level 2, frame-ancestors (W3C, from memory)
    expect(csp).toMatch(/script-src 'self'/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff'); // WHATWG Fetch, X-Content-Type-Options (from memory)
    expect(res.headers.get('x-frame-options')).toBe('DENY');
  });
});

describe('the database file', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'epochwright-mode-'));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('is created readable and writable by its owner only', async () => {
    const path = join(dir, 'sub', 'private.db');
    const store = createStore(await openDatabase({ url: `file:${path}` }));
    await store.systems.create({ userId: null }, { name: 'Mode Deep', raDeg: 1, decDeg: 1 });
    for (const p of [path, `${path}-wal`])
      expect((statSync(p).mode & 0o777).toString(8), p).toBe('600'); // POSIX mode bits: 0600 = owner read and write (common practice, no source)
    store.close();
  });
});
