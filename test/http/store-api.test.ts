/**
 * The store's HTTP API against each backend (a real libSQL file in a temporary folder, and
 * in-memory libSQL): migrations from empty, create/read/update/delete of every resource, roles,
 * the 409 on a stale version, paging and filters. Requests go through app.request(), no server.
 * Status codes are those of RFC 9110 §15 (from memory) as docs/DESIGN.md assigns them.
 */
import { readFileSync } from 'node:fs';
import { Body, DefineStar, Equator, Horizon, Observer } from 'astronomy-engine';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { MIGRATIONS_FOLDER } from '../../server/store/database.ts';
import { BACKENDS, ORBIT_WREN, fixture, tableCounts, type Fixture } from '../store/backends.ts';
import { databaseOf } from '../../server/store/testing.ts';
import { COMPUTE_PATHS } from '../../server/http/app.ts';

interface Journal {
  entries: { tag: string }[];
}

describe.each(BACKENDS)('store API on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  beforeEach(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store);
  });
  afterEach(() => cleanup());

  it('migrates an empty database to every table, and a second run changes nothing', async () => {
    const journal = JSON.parse(
      readFileSync(`${MIGRATIONS_FOLDER}/meta/_journal.json`, 'utf8'),
    ) as Journal;
    const tables = (
      await databaseOf(f.store).client.execute(
        "SELECT name FROM sqlite_master WHERE type = 'table'",
      )
    ).rows.map((r) => r.name);
    for (const t of [
      'users',
      'tokens',
      'systems',
      'targets',
      'orbit_solutions',
      'sites',
      'campaigns',
      'campaign_targets',
      'campaign_sites',
      'nights',
      'blocks',
      'night_reports',
      'block_outcomes',
      'measurements',
      'audit_trail',
    ]) {
      expect(tables).toContain(t); // db/schema.ts (the schema under test)
    }
    const applied = async () =>
      Number(
        (await databaseOf(f.store).client.execute('SELECT count(*) AS n FROM __drizzle_migrations'))
          .rows[0]!.n,
      );
    expect(await applied()).toBe(journal.entries.length); // db/migrations/meta/_journal.json, written by drizzle-kit
    await migrate(databaseOf(f.store).db, { migrationsFolder: MIGRATIONS_FOLDER });
    expect(await applied()).toBe(journal.entries.length); // a second migrate applies nothing (drizzle migrator: pending = newer than last applied)
    const fk = await databaseOf(f.store).client.execute('PRAGMA foreign_keys');
    expect(Number(fk.rows[0]![0])).toBe(1); // foreign keys on, as the issue requires
  });

  const resources = () => [
    {
      path: '/api/systems',
      role: 'lead' as const,
      create: { name: 'Second Deep', raDeg: 12.5, decDeg: 41.2 },
      patch: { decDeg: 41.3 },
      field: 'decDeg',
      value: 41.3,
    },
    {
      path: '/api/targets',
      role: 'lead' as const,
      create: { systemId: f.ids.system, name: 'Tarn', magnitude: 15 },
      patch: { magnitude: 15.5 },
      field: 'magnitude',
      value: 15.5,
    },
    {
      path: '/api/sites',
      role: 'lead' as const,
      create: {
        name: 'Second Peak',
        latitudeDeg: 23.6,
        longitudeDeg: -105.9,
        elevationM: 2900,
        timeZone: 'America/Mazatlan',
      },
      patch: { lowestAltitudeDeg: 25 },
      field: 'lowestAltitudeDeg',
      value: 25,
    },
    {
      path: '/api/campaigns',
      role: 'lead' as const,
      create: {
        name: 'Second campaign',
        startDate: '2027-02-01',
        endDate: '2027-03-01',
        goals: { cadenceDays: 7, kinds: ['spectroscopy'] },
        targetIds: [f.ids.target],
      },
      patch: { endDate: '2027-04-01' },
      field: 'endDate',
      value: '2027-04-01',
    },
    {
      path: '/api/nights',
      role: 'observer' as const,
      create: { siteId: f.ids.site, campaignId: f.ids.campaign, date: '2026-06-11' },
      patch: { notes: 'windy' },
      field: 'notes',
      value: 'windy',
    },
    {
      path: '/api/blocks',
      role: 'observer' as const,
      create: {
        nightId: f.ids.night,
        targetId: f.ids.target,
        kind: 'spectroscopy',
        startUtc: '2026-06-11T05:00:00Z',
        endUtc: '2026-06-11T06:00:00Z',
      },
      patch: { notes: 'moved', version: 1 },
      field: 'notes',
      value: 'moved',
    },
    {
      path: '/api/night-reports',
      role: 'observer' as const,
      create: {
        nightId: f.ids.night,
        seeingArcsec: 0.6,
        strehlRatio: 0.4,
        cloudCoverPct: 10,
        outcomes: [{ blockId: f.ids.block, status: 'obtained', exposureMinutes: 50 }],
      },
      patch: { seeingArcsec: 0.8, version: 1 },
      field: 'seeingArcsec',
      value: 0.8,
    },
    {
      path: '/api/measurements',
      role: 'observer' as const,
      create: {
        targetId: f.ids.target,
        blockId: f.ids.block,
        kind: 'offsets',
        epoch: '2026-06-11T04:30:00Z',
        dRaMas: 1.2,
        dDecMas: -9.9,
        sigmaDRaMas: 0.3,
        sigmaDDecMas: 0.3,
        instrument: 'test imager',
      },
      patch: { dRaMas: 1.3 },
      field: 'dRaMas',
      value: 1.3,
    },
  ];

  it('creates, reads, updates and deletes every resource', async () => {
    for (const r of resources()) {
      const created = await f.call(r.role, 'POST', r.path, r.create);
      expect(created.status, `${r.path} create: ${await created.clone().text()}`).toBe(201); // RFC 9110 §15.3.2 Created
      const row = (await created.json()) as { id: number };
      const read = await f.call('viewer', 'GET', `${r.path}/${row.id}`);
      expect(read.status).toBe(200); // RFC 9110 §15.3.1
      const changed = await f.call(r.role, 'PATCH', `${r.path}/${row.id}`, r.patch);
      expect(changed.status, `${r.path} patch: ${await changed.clone().text()}`).toBe(200);
      expect(((await changed.json()) as Record<string, unknown>)[r.field]).toBe(r.value); // the value sent in this test
      const removed = await f.call(
        r.role === 'observer' ? 'lead' : r.role,
        'DELETE',
        `${r.path}/${row.id}`,
      );
      expect(removed.status, `${r.path} delete: ${await removed.clone().text()}`).toBe(204); // RFC 9110 §15.3.5 No Content
      expect((await f.call('viewer', 'GET', `${r.path}/${row.id}`)).status).toBe(404); // RFC 9110 §15.5.5
    }
  });

  it('keeps orbit solutions as immutable versions with one current', async () => {
    const v2 = await f.call('lead', 'POST', '/api/orbit-solutions', {
      targetId: f.ids.target,
      orbit: { ...ORBIT_WREN, elements: { ...ORBIT_WREN.elements, eccentricity: 0.88 } },
      reference: 'refit',
    });
    expect(v2.status).toBe(201);
    const body = (await v2.json()) as { id: number; version: number; current: boolean };
    expect([body.version, body.current]).toEqual([2, true]); // second version of the fixture's target; new versions become current by default
    const current = (await (
      await f.call('viewer', 'GET', `/api/orbit-solutions?targetId=${f.ids.target}&current=true`)
    ).json()) as { items: { id: number }[] };
    expect(current.items.map((s) => s.id)).toEqual([body.id]); // exactly one current (partial unique index)
    expect((await f.call('lead', 'DELETE', `/api/orbit-solutions/${body.id}`)).status).toBe(409); // the current version cannot be removed
    const first = (await (
      await f.call('viewer', 'GET', `/api/orbit-solutions?targetId=${f.ids.target}&current=false`)
    ).json()) as { items: { id: number }[] };
    expect(
      (await f.call('lead', 'POST', `/api/orbit-solutions/${first.items[0]!.id}/current`)).status,
    ).toBe(200);
    expect((await f.call('lead', 'DELETE', `/api/orbit-solutions/${body.id}`)).status).toBe(204);
    const before = await tableCounts(f.store);
    const stored = await f.store.orbitSolutions.get(first.items[0]!.id);
    for (const method of ['PATCH', 'PUT']) {
      const res = await f.call('lead', method, `/api/orbit-solutions/${first.items[0]!.id}`, {
        notes: 'x',
      });
      expect(res.status, method).toBe(405); // RFC 9110 §15.5.6 Method Not Allowed (from memory): versions are immutable, the path exists
      expect(res.headers.get('allow')).toBe('DELETE, GET, HEAD'); // RFC 9110 §15.5.6: a 405 carries Allow; the routes of orbit-solutions.ts (HEAD answered by GET)
      const err = (await res.json()) as {
        error: { code: string; message: string; details: { allow: string[] } };
      };
      expect(err.error.code).toBe('method_not_allowed'); // docs/DESIGN.md error shape { error: { code, message, details } }
      expect(err.error.details.allow).toEqual(['DELETE', 'GET', 'HEAD']);
    }
    expect(await tableCounts(f.store)).toEqual(before);
    expect(await f.store.orbitSolutions.get(first.items[0]!.id)).toEqual(stored); // nothing changed
  });

  it('answers 405 with Allow on every other path that exists under other methods, and 404 where no route exists', async () => {
    const before = await tableCounts(f.store);
    const cases = [
      { method: 'POST', path: '/api/audit', allow: 'GET, HEAD' }, // the audit trail is written by the store only
      { method: 'DELETE', path: '/api/audit', allow: 'GET, HEAD' },
      { method: 'PATCH', path: `/api/nights/${f.ids.night}/visibility`, allow: 'GET, HEAD' }, // a computed view
      { method: 'PUT', path: `/api/targets/${f.ids.target}/ephemeris`, allow: 'GET, HEAD' },
      { method: 'GET', path: '/api/tokens/1', allow: 'DELETE' }, // a token secret is shown once, never read back
      { method: 'POST', path: '/api/me', allow: 'GET, HEAD' },
      { method: 'PUT', path: `/api/systems/${f.ids.system}`, allow: 'DELETE, GET, HEAD, PATCH' }, // PATCH is the update method here
    ];
    for (const c of cases) {
      const res = await f.call(
        'lead',
        c.method,
        c.path,
        c.method === 'GET' || c.method === 'DELETE' ? undefined : {},
      );
      expect(res.status, `${c.method} ${c.path}`).toBe(405); // RFC 9110 §15.5.6 (from memory)
      expect(res.headers.get('allow'), `${c.method} ${c.path}`).toBe(c.allow); // the routes this API declares for the path
    }
    expect((await f.call('lead', 'PATCH', '/api/no-such-thing/1', {})).status).toBe(404); // RFC 9110 §15.5.5: no route at all
    expect((await f.call(null, 'PATCH', `/api/orbit-solutions/1`, {})).status).toBe(405); // the method rule holds before sign-in (no token sent)
    expect(await tableCounts(f.store)).toEqual(before);
  });

  it('stores a site’s horizon mask in azimuth order, and the night view obeys it', async () => {
    const path = `/api/nights/${f.ids.night}/visibility`;
    type Report = {
      limits: { horizonMask: boolean; altitudeLimitDeg: number };
      targets: {
        windows: {
          start: { utc: string };
          end: { utc: string };
          hours: number;
          opensBy: string;
          closesBy: string;
        }[];
      }[];
    };
    const flat = (await (await f.call('viewer', 'GET', path)).json()) as Report;
    expect(flat.limits.horizonMask).toBe(false); // the fixture site has no mask
    // A wall of 70° over the eastern half (azimuth 10°–170°), 20° (below the 30° limit) over the western half.
    const mask = [
      { azimuthDeg: 350, altitudeDeg: 20 },
      { azimuthDeg: 10, altitudeDeg: 70 },
      { azimuthDeg: 190, altitudeDeg: 20 },
      { azimuthDeg: 170, altitudeDeg: 70 },
    ];
    const patched = await f.call('lead', 'PATCH', `/api/sites/${f.ids.site}`, {
      horizonMask: mask,
    });
    expect(patched.status, await patched.clone().text()).toBe(200);
    expect(
      ((await patched.json()) as { horizonMask: { azimuthDeg: number }[] }).horizonMask.map(
        (p) => p.azimuthDeg,
      ),
    ).toEqual([10, 170, 190, 350]); // the points sent above, sorted
    const masked = (await (await f.call('viewer', 'GET', path)).json()) as Report;
    expect(masked.limits.horizonMask).toBe(true);
    const [w0, w1] = [flat.targets[0]!.windows[0]!, masked.targets[0]!.windows[0]!];
    expect(w1.opensBy).toBe('horizon-mask');
    expect(w1.hours).toBeLessThan(w0.hours);
    // Where the engine opens and closes the window, astronomy-engine (an outside library) puts the star at the mask's and the limit's altitude.
    const site = await f.store.sites.get(f.ids.site);
    const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
    DefineStar(Body.Star1, 263.8 / 15, -21.7, 25_000); // the fixture system's ICRS position; its orbit offset (< 0.2″) is negligible here
    const horizon = (utc: string) => {
      const eq = Equator(Body.Star1, new Date(utc), observer, true, true);
      return Horizon(new Date(utc), observer, eq.ra, eq.dec, 'normal');
    };
    const open = horizon(w1.start.utc);
    const close = horizon(w1.end.utc);
    console.log(
      `mask window: opens at altitude ${open.altitude.toFixed(3)}° azimuth ${open.azimuth.toFixed(1)}°, closes at ${close.altitude.toFixed(3)}° azimuth ${close.azimuth.toFixed(1)}° (${w1.closesBy}); ${w1.hours.toFixed(2)} h vs ${w0.hours.toFixed(2)} h without the mask`,
    );
    expect(open.azimuth > 10 && open.azimuth < 170).toBe(true); // rising in the east, behind the 70° part of the mask
    expect(Math.abs(open.altitude - 70)).toBeLessThan(0.05); // the mask altitude set above; astronomy-engine's sea-level refraction differs from the site's by < 0.01° at 70°
    expect(w1.closesBy).toBe('altitude'); // on this June night the star sinks to the site limit before dawn ends darkness
    expect(close.azimuth > 190 && close.azimuth < 350).toBe(true); // setting in the west, where the 20° mask is below the site limit
    expect(Math.abs(close.altitude - masked.limits.altitudeLimitDeg)).toBeLessThan(0.05); // the site's minimum altitude (fixture default 30°)
  });

  it('keeps a system’s position epoch and proper motion, and the night view carries the position by them', async () => {
    const system = (await (
      await f.call('viewer', 'GET', `/api/systems/${f.ids.system}`)
    ).json()) as { positionEpoch: string };
    expect(system.positionEpoch).toBe('2000-01-01T12:00:00.000Z'); // J2000.0 = JD 2451545.0 = 2000 January 1, 12h (IAU 1976 standard epoch, from memory); the default
    const path = `/api/nights/${f.ids.night}/visibility`;
    type Report = {
      night: { start: { utc: string }; end: { utc: string } };
      targets: { raOfDateDeg: number; decOfDateDeg: number }[];
    };
    const place = async () => {
      const r = (await (await f.call('viewer', 'GET', path)).json()) as Report;
      return {
        ...r.targets[0]!,
        midMs: (Date.parse(r.night.start.utc) + Date.parse(r.night.end.utc)) / 2,
      };
    };
    const still = await place();
    const mu = { ra: 4000, dec: -3000 }; // mas/yr, invented for this test (large, so that the shift is tens of arcseconds)
    const patched = await f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, {
      pmRaMasYr: mu.ra,
      pmDecMasYr: mu.dec,
      positionEpoch: 'J2017.0',
    });
    expect(patched.status, await patched.clone().text()).toBe(200);
    expect(((await patched.json()) as { positionEpoch: string }).positionEpoch).toBe(
      '2016-12-31T18:00:00.000Z',
    ); // J2017.0 = JD 2451545.0 + 17 × 365.25 = JD 2457754.25, i.e. 2016 December 31, 18h (Julian epoch definition, IAU 1976, from memory)
    const moved = await place();
    const years = (still.midMs - Date.parse('2016-12-31T18:00:00Z')) / (365.25 * 86_400_000);
    const cosDec = Math.cos((-21.7 * Math.PI) / 180);
    const dRa = (moved.raOfDateDeg - still.raOfDateDeg) * cosDec * 3.6e6;
    const dDec = (moved.decOfDateDeg - still.decOfDateDeg) * 3.6e6;
    const err = Math.hypot(dRa - mu.ra * years, dDec - mu.dec * years);
    console.log(
      `proper motion over ${years.toFixed(3)} yr: moved (${(dRa / 1000).toFixed(3)}″, ${(dDec / 1000).toFixed(3)}″), expected (${((mu.ra * years) / 1000).toFixed(3)}″, ${((mu.dec * years) / 1000).toFixed(3)}″), off by ${(err / 1000).toFixed(3)}″`,
    );
    expect(err).toBeLessThan(300); // μ·Δt on the tangent plane (definition of proper motion, common practice, no source); 0.3″ allows the ~0.15° turn of the of-date axes from J2000 to 2027
    // The same position given at the night's own epoch: no time has passed, so the motion moves nothing.
    const atNight = await f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, {
      positionEpoch: new Date(still.midMs).toISOString(),
    });
    expect(atNight.status).toBe(200);
    const here = await place();
    expect(
      Math.hypot(
        (here.raOfDateDeg - still.raOfDateDeg) * cosDec,
        here.decOfDateDeg - still.decOfDateDeg,
      ) * 3.6e6,
    ).toBeLessThan(1); // zero elapsed time, zero motion (mas)
  });

  it('applies the roles: viewer reads, observer logs, lead edits orbits, campaigns and sites', async () => {
    const site = {
      name: 'Role Peak',
      latitudeDeg: 10,
      longitudeDeg: 10,
      elevationM: 1000,
      timeZone: 'UTC',
    };
    expect((await f.call(null, 'GET', '/api/sites')).status).toBe(401); // RFC 9110 §15.5.2: no credentials
    expect((await f.call(null, 'POST', '/api/sites', site)).status).toBe(401);
    expect((await f.call('viewer', 'GET', '/api/sites')).status).toBe(200);
    expect((await f.call('viewer', 'POST', '/api/sites', site)).status).toBe(403); // RFC 9110 §15.5.4: known but not allowed
    expect((await f.call('observer', 'POST', '/api/sites', site)).status).toBe(403);
    expect(
      (
        await f.call('observer', 'POST', '/api/orbit-solutions', {
          targetId: f.ids.target,
          orbit: ORBIT_WREN,
        })
      ).status,
    ).toBe(403);
    expect(
      (await f.call('observer', 'PATCH', `/api/campaigns/${f.ids.campaign}`, { notes: 'x' }))
        .status,
    ).toBe(403);
    expect(
      (await f.call('viewer', 'POST', '/api/nights', { siteId: f.ids.site, date: '2026-06-12' }))
        .status,
    ).toBe(403);
    expect(
      (await f.call('observer', 'POST', '/api/nights', { siteId: f.ids.site, date: '2026-06-12' }))
        .status,
    ).toBe(201);
    expect((await f.call('lead', 'POST', '/api/sites', site)).status).toBe(201);
    const bad = await f.app.request('/api/sites', {
      headers: { authorization: 'Bearer ewt_not-a-token' },
    });
    expect(bad.status).toBe(401);
    const malformed = await f.app.request('/api/sites', {
      headers: { authorization: 'Basic abc' },
    });
    expect(malformed.status).toBe(401);
    // A revoked token stops working at once.
    const issued = (await (
      await f.call('lead', 'POST', '/api/users', { name: 'short stay', role: 'observer' })
    ).json()) as { token: string; tokenId: number };
    const me = await f.app.request('/api/me', {
      headers: { authorization: `Bearer ${issued.token}` },
    });
    expect(((await me.json()) as { role: string }).role).toBe('observer'); // the role given in this test
    expect((await f.call('lead', 'DELETE', `/api/tokens/${issued.tokenId}`)).status).toBe(204);
    expect(
      (await f.app.request('/api/me', { headers: { authorization: `Bearer ${issued.token}` } }))
        .status,
    ).toBe(401);
    expect((await f.call('observer', 'GET', '/api/users')).status).toBe(403);
    // Tokens are stored hashed: the secret appears nowhere in the database.
    const stored = (await databaseOf(f.store).client.execute('SELECT hash FROM tokens')).rows.map(
      (r) => String(r.hash),
    );
    expect(stored).not.toContain(issued.token);
    expect(stored.every((h) => /^[0-9a-f]{64}$/.test(h))).toBe(true); // SHA-256 hex is 64 digits (FIPS 180-4)
  });

  it('answers 409 with the current version when a block or night report was changed meanwhile', async () => {
    const first = await f.call('observer', 'PATCH', `/api/blocks/${f.ids.block}`, {
      notes: 'first observer',
      version: 1,
    });
    expect(first.status).toBe(200);
    const second = await f.call('lead', 'PATCH', `/api/blocks/${f.ids.block}`, {
      notes: 'second observer',
      version: 1,
    });
    expect(second.status).toBe(409); // RFC 9110 §15.5.10 Conflict
    const err = (await second.json()) as {
      error: { code: string; details: { currentVersion: number } };
    };
    expect(err.error.code).toBe('stale_version');
    expect(err.error.details.currentVersion).toBe(2); // one update since version 1
    expect(
      (
        (await (await f.call('viewer', 'GET', `/api/blocks/${f.ids.block}`)).json()) as {
          notes: string;
        }
      ).notes,
    ).toBe('first observer');

    const report = (await (
      await f.call('observer', 'POST', '/api/night-reports', {
        nightId: f.ids.night,
        seeingArcsec: 0.7,
      })
    ).json()) as { id: number };
    expect(
      (
        await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, {
          notes: 'a',
          version: 1,
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, {
          notes: 'b',
          version: 1,
        })
      ).status,
    ).toBe(409);
    expect(
      (await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, { notes: 'c' })).status,
    ).toBe(400); // no version: a required field is missing, so refuse rather than overwrite
  });

  it('writes a report and its block outcomes together, and records who changed what', async () => {
    const res = await f.call('observer', 'POST', '/api/night-reports', {
      nightId: f.ids.night,
      timeLostHours: 2,
      timeLostReason: 'wind',
      outcomes: [{ blockId: f.ids.block, status: 'partial', exposureMinutes: 20 }],
    });
    expect(res.status).toBe(201);
    const body = (await res.json()) as {
      outcomes: { blockId: number; status: string }[];
      authorId: number;
    };
    expect(body.outcomes).toMatchObject([{ blockId: f.ids.block, status: 'partial' }]);
    const block = (await (await f.call('viewer', 'GET', `/api/blocks/${f.ids.block}`)).json()) as {
      status: string;
      version: number;
    };
    expect([block.status, block.version]).toEqual(['partial', 2]); // outcome copied to the block, version bumped once
    const audit = (await (
      await f.call('lead', 'GET', '/api/audit?entity=night%20report')
    ).json()) as { items: { userId: number; action: string }[] };
    expect(audit.items[0]).toMatchObject({ action: 'create', userId: body.authorId });
  });

  it('pages and filters lists', async () => {
    for (let d = 12; d <= 18; d++)
      expect(
        (
          await f.call('observer', 'POST', '/api/nights', {
            siteId: f.ids.site,
            campaignId: f.ids.campaign,
            date: `2026-06-${d}`,
          })
        ).status,
      ).toBe(201);
    const seen: number[] = [];
    for (const offset of [0, 3, 6]) {
      const page = (await (
        await f.call('viewer', 'GET', `/api/nights?limit=3&offset=${offset}`)
      ).json()) as { items: { id: number }[]; total: number };
      expect(page.total).toBe(8); // 1 fixture night + 7 made here
      seen.push(...page.items.map((n) => n.id));
    }
    expect(seen.length).toBe(8);
    expect(new Set(seen).size).toBe(8); // every night once across the pages
    const range = (await (
      await f.call('viewer', 'GET', '/api/nights?start=2026-06-14&end=2026-06-16')
    ).json()) as { items: { date: string }[] };
    expect(range.items.map((n) => n.date)).toEqual(['2026-06-14', '2026-06-15', '2026-06-16']); // inclusive range, dates made here
    const bySite = (await (
      await f.call('viewer', 'GET', `/api/blocks?siteId=${f.ids.site}&campaignId=${f.ids.campaign}`)
    ).json()) as { total: number };
    expect(bySite.total).toBe(1); // the fixture's one block
    expect((await f.call('viewer', 'GET', '/api/nights?limit=501')).status).toBe(422); // page size limit 500 (this API's rule): a range, so a broken rule
  });

  it('asks for a token on every computation, but not on health or the OpenAPI document', async () => {
    for (const path of COMPUTE_PATHS) {
      const anonymous = await f.call(null, 'POST', `/api${path}`, {});
      expect([path, anonymous.status]).toEqual([path, 401]); // sign-in before any work (this API's rule, README)
      const viewer = await f.call('viewer', 'POST', `/api${path}`, {});
      expect([path, viewer.status]).toEqual([path, 400]); // signed in: the empty body is then the problem
    }
    expect((await f.call(null, 'GET', '/api/health')).status).toBe(200);
    expect((await f.call(null, 'GET', '/api/openapi.json')).status).toBe(200);
  });

  it('serves a stored target’s ephemeris and events from its current solution, as the stateless endpoint does', async () => {
    const stored = (await (
      await f.call(
        'viewer',
        'GET',
        `/api/targets/${f.ids.target}/ephemeris?start=2027-06-01T00:00Z&end=2027-07-01T00:00Z&step=P5D`,
      )
    ).json()) as { predictions: { dRaMas: number; epoch: string }[] };
    const direct = (await (
      await f.call('viewer', 'POST', '/api/ephemeris', {
        orbit: ORBIT_WREN,
        epochs: { start: '2027-06-01T00:00Z', end: '2027-07-01T00:00Z', step: 'P5D' },
      })
    ).json()) as { predictions: { dRaMas: number }[] };
    expect(stored.predictions.length).toBe(7); // 30 days in steps of 5, both ends included
    expect(stored.predictions.map((p) => p.dRaMas)).toEqual(
      direct.predictions.map((p) => p.dRaMas),
    ); // same engine, same orbit
    const csv = await (
      await f.call(
        'viewer',
        'GET',
        `/api/targets/${f.ids.target}/ephemeris?start=2027-06-01T00:00Z&end=2027-07-01T00:00Z&step=P5D&format=csv`,
      )
    ).text();
    expect(csv.trim().split('\n').length).toBe(8); // header + 7 rows
    const events = (await (
      await f.call(
        'viewer',
        'GET',
        `/api/targets/${f.ids.target}/events?start=2027-01-01T00:00Z&end=2028-01-01T00:00Z&kinds=periapsis`,
      )
    ).json()) as { events: { epoch: string }[] };
    expect(events.events.length).toBe(1); // P = 14.2 yr: one passage in a year
    expect(
      Math.abs(Date.parse(events.events[0]!.epoch) - Date.parse('2027-06-14T06:00:00Z')),
    ).toBeLessThan(86_400_000); // T of the fixture orbit; no light-time switch on, so within a day
  });

  it('publishes an OpenAPI document with the store routes and bearer sign-in', async () => {
    const doc = (await (await f.app.request('/api/openapi.json')).json()) as {
      paths: Record<string, unknown>;
      components: { securitySchemes: Record<string, { scheme: string }> };
    };
    for (const p of [
      '/systems',
      '/targets/{id}/ephemeris',
      '/orbit-solutions',
      '/sites',
      '/campaigns',
      '/nights',
      '/blocks',
      '/night-reports',
      '/measurements',
      '/imports/{kind}',
      '/campaigns/{id}/calendar.ics',
    ])
      expect(Object.keys(doc.paths)).toContain(p);
    expect(doc.components.securitySchemes.bearer!.scheme).toBe('bearer'); // RFC 6750 bearer tokens
    expect(await tableCounts(f.store)).toMatchObject({ systems: 1, sites: 1 }); // reading the document writes nothing
  });
});
