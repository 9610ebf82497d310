/**
 * The store's HTTP API against each backend (a real libSQL file in a temporary folder, and
 * in-memory libSQL): migrations from empty, create/read/update/delete of every resource, roles,
 * the 409 on a stale version, paging and filters. Requests go through app.request(), no server.
 * Status codes are those of RFC 9110 §15 (from memory) as DESIGN.md assigns them.
 */
import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { MIGRATIONS_FOLDER } from '../../server/store/database.ts';
import { BACKENDS, ORBIT_S1, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface Journal { entries: { tag: string }[] }

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
    const journal = JSON.parse(readFileSync(`${MIGRATIONS_FOLDER}/meta/_journal.json`, 'utf8')) as Journal;
    const tables = (await f.store.database.client.execute("SELECT name FROM sqlite_master WHERE type = 'table'")).rows.map((r) => r.name);
    for (const t of ['users', 'tokens', 'systems', 'targets', 'orbit_solutions', 'sites', 'campaigns', 'campaign_targets', 'campaign_sites', 'nights', 'blocks', 'night_reports', 'block_outcomes', 'measurements', 'audit_trail']) {
      expect(tables).toContain(t); // db/schema.ts (the schema under test)
    }
    const applied = async () => Number((await f.store.database.client.execute('SELECT count(*) AS n FROM __drizzle_migrations')).rows[0]!.n);
    expect(await applied()).toBe(journal.entries.length); // db/migrations/meta/_journal.json, written by drizzle-kit
    await migrate(f.store.db, { migrationsFolder: MIGRATIONS_FOLDER });
    expect(await applied()).toBe(journal.entries.length); // a second migrate applies nothing (drizzle migrator: pending = newer than last applied)
    const fk = await f.store.database.client.execute('PRAGMA foreign_keys');
    expect(Number(fk.rows[0]![0])).toBe(1); // foreign keys on, as the issue requires
  });

  const resources = () => [
    { path: '/api/systems', role: 'lead' as const, create: { name: 'Second Deep', raDeg: 12.5, decDeg: 41.2 }, patch: { decDeg: 41.3 }, field: 'decDeg', value: 41.3 },
    { path: '/api/targets', role: 'lead' as const, create: { systemId: f.ids.system, name: 'T s9', magnitude: 15 }, patch: { magnitude: 15.5 }, field: 'magnitude', value: 15.5 },
    { path: '/api/sites', role: 'lead' as const, create: { name: 'Second Peak', latitudeDeg: 23.6, longitudeDeg: -105.9, elevationM: 2900, timeZone: 'America/Mazatlan' }, patch: { minAltitudeDeg: 25 }, field: 'minAltitudeDeg', value: 25 },
    { path: '/api/campaigns', role: 'lead' as const, create: { name: 'Second campaign', startDate: '2027-02-01', endDate: '2027-03-01', goals: { cadenceDays: 7, kinds: ['spectroscopy'] }, targetIds: [f.ids.target] }, patch: { endDate: '2027-04-01' }, field: 'endDate', value: '2027-04-01' },
    { path: '/api/nights', role: 'observer' as const, create: { siteId: f.ids.site, campaignId: f.ids.campaign, date: '2027-06-11' }, patch: { notes: 'windy' }, field: 'notes', value: 'windy' },
    { path: '/api/blocks', role: 'observer' as const, create: { nightId: f.ids.night, targetId: f.ids.target, kind: 'spectroscopy', startUtc: '2027-06-11T05:00:00Z', endUtc: '2027-06-11T06:00:00Z' }, patch: { notes: 'moved', version: 1 }, field: 'notes', value: 'moved' },
    { path: '/api/night-reports', role: 'observer' as const, create: { nightId: f.ids.night, seeingArcsec: 0.6, strehlRatio: 0.4, cloudCoverPct: 10, outcomes: [{ blockId: f.ids.block, status: 'obtained', exposureMinutes: 50 }] }, patch: { seeingArcsec: 0.8, version: 1 }, field: 'seeingArcsec', value: 0.8 },
    { path: '/api/measurements', role: 'observer' as const, create: { targetId: f.ids.target, blockId: f.ids.block, kind: 'offsets', epoch: '2027-06-11T04:30:00Z', dRaMas: 1.2, dDecMas: -9.9, sigmaDRaMas: 0.3, sigmaDDecMas: 0.3, instrument: 'test imager' }, patch: { dRaMas: 1.3 }, field: 'dRaMas', value: 1.3 },
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
      const removed = await f.call(r.role === 'observer' ? 'lead' : r.role, 'DELETE', `${r.path}/${row.id}`);
      expect(removed.status, `${r.path} delete: ${await removed.clone().text()}`).toBe(204); // RFC 9110 §15.3.5 No Content
      expect((await f.call('viewer', 'GET', `${r.path}/${row.id}`)).status).toBe(404); // RFC 9110 §15.5.5
    }
  });

  it('keeps orbit solutions as immutable versions with one current', async () => {
    const v2 = await f.call('lead', 'POST', '/api/orbit-solutions', { targetId: f.ids.target, orbit: { ...ORBIT_S1, elements: { ...ORBIT_S1.elements, eccentricity: 0.88 } }, reference: 'refit' });
    expect(v2.status).toBe(201);
    const body = (await v2.json()) as { id: number; version: number; current: boolean };
    expect([body.version, body.current]).toEqual([2, true]); // second version of the fixture's target; new versions become current by default
    const current = (await (await f.call('viewer', 'GET', `/api/orbit-solutions?targetId=${f.ids.target}&current=true`)).json()) as { items: { id: number }[] };
    expect(current.items.map((s) => s.id)).toEqual([body.id]); // exactly one current (partial unique index)
    expect((await f.call('lead', 'DELETE', `/api/orbit-solutions/${body.id}`)).status).toBe(409); // the current version cannot be removed
    const first = (await (await f.call('viewer', 'GET', `/api/orbit-solutions?targetId=${f.ids.target}&current=false`)).json()) as { items: { id: number }[] };
    expect((await f.call('lead', 'POST', `/api/orbit-solutions/${first.items[0]!.id}/current`)).status).toBe(200);
    expect((await f.call('lead', 'DELETE', `/api/orbit-solutions/${body.id}`)).status).toBe(204);
    expect((await f.call('lead', 'PATCH', `/api/orbit-solutions/${body.id}`, { notes: 'x' })).status).toBe(404); // versions have no update route
  });

  it('applies the roles: viewer reads, observer logs, lead edits orbits, campaigns and sites', async () => {
    const site = { name: 'Role Peak', latitudeDeg: 10, longitudeDeg: 10, elevationM: 1000, timeZone: 'UTC' };
    expect((await f.call(null, 'GET', '/api/sites')).status).toBe(401); // RFC 9110 §15.5.2: no credentials
    expect((await f.call(null, 'POST', '/api/sites', site)).status).toBe(401);
    expect((await f.call('viewer', 'GET', '/api/sites')).status).toBe(200);
    expect((await f.call('viewer', 'POST', '/api/sites', site)).status).toBe(403); // RFC 9110 §15.5.4: known but not allowed
    expect((await f.call('observer', 'POST', '/api/sites', site)).status).toBe(403);
    expect((await f.call('observer', 'POST', '/api/orbit-solutions', { targetId: f.ids.target, orbit: ORBIT_S1 })).status).toBe(403);
    expect((await f.call('observer', 'PATCH', `/api/campaigns/${f.ids.campaign}`, { notes: 'x' })).status).toBe(403);
    expect((await f.call('viewer', 'POST', '/api/nights', { siteId: f.ids.site, date: '2027-06-12' })).status).toBe(403);
    expect((await f.call('observer', 'POST', '/api/nights', { siteId: f.ids.site, date: '2027-06-12' })).status).toBe(201);
    expect((await f.call('lead', 'POST', '/api/sites', site)).status).toBe(201);
    const bad = await f.app.request('/api/sites', { headers: { authorization: 'Bearer ewt_not-a-token' } });
    expect(bad.status).toBe(401);
    const malformed = await f.app.request('/api/sites', { headers: { authorization: 'Basic abc' } });
    expect(malformed.status).toBe(401);
    // A revoked token stops working at once.
    const issued = (await (await f.call('lead', 'POST', '/api/users', { name: 'short stay', role: 'observer' })).json()) as { token: string; tokenId: number };
    const me = await f.app.request('/api/me', { headers: { authorization: `Bearer ${issued.token}` } });
    expect(((await me.json()) as { role: string }).role).toBe('observer'); // the role given in this test
    expect((await f.call('lead', 'DELETE', `/api/tokens/${issued.tokenId}`)).status).toBe(204);
    expect((await f.app.request('/api/me', { headers: { authorization: `Bearer ${issued.token}` } })).status).toBe(401);
    expect((await f.call('observer', 'GET', '/api/users')).status).toBe(403);
    // Tokens are stored hashed: the secret appears nowhere in the database.
    const stored = (await f.store.database.client.execute('SELECT hash FROM tokens')).rows.map((r) => String(r.hash));
    expect(stored).not.toContain(issued.token);
    expect(stored.every((h) => /^[0-9a-f]{64}$/.test(h))).toBe(true); // SHA-256 hex is 64 digits (FIPS 180-4)
  });

  it('answers 409 with the current version when a block or night report was changed meanwhile', async () => {
    const first = await f.call('observer', 'PATCH', `/api/blocks/${f.ids.block}`, { notes: 'first observer', version: 1 });
    expect(first.status).toBe(200);
    const second = await f.call('lead', 'PATCH', `/api/blocks/${f.ids.block}`, { notes: 'second observer', version: 1 });
    expect(second.status).toBe(409); // RFC 9110 §15.5.10 Conflict
    const err = (await second.json()) as { error: { code: string; details: { currentVersion: number } } };
    expect(err.error.code).toBe('stale_version');
    expect(err.error.details.currentVersion).toBe(2); // one update since version 1
    expect(((await (await f.call('viewer', 'GET', `/api/blocks/${f.ids.block}`)).json()) as { notes: string }).notes).toBe('first observer');

    const report = (await (await f.call('observer', 'POST', '/api/night-reports', { nightId: f.ids.night, seeingArcsec: 0.7 })).json()) as { id: number };
    expect((await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, { notes: 'a', version: 1 })).status).toBe(200);
    expect((await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, { notes: 'b', version: 1 })).status).toBe(409);
    expect((await f.call('observer', 'PATCH', `/api/night-reports/${report.id}`, { notes: 'c' })).status).toBe(400); // no version: a required field is missing, so refuse rather than overwrite
  });

  it('writes a report and its block outcomes together, and records who changed what', async () => {
    const res = await f.call('observer', 'POST', '/api/night-reports', { nightId: f.ids.night, timeLostHours: 2, timeLostReason: 'wind', outcomes: [{ blockId: f.ids.block, status: 'partial', exposureMinutes: 20 }] });
    expect(res.status).toBe(201);
    const body = (await res.json()) as { outcomes: { blockId: number; status: string }[]; authorId: number };
    expect(body.outcomes).toMatchObject([{ blockId: f.ids.block, status: 'partial' }]);
    const block = (await (await f.call('viewer', 'GET', `/api/blocks/${f.ids.block}`)).json()) as { status: string; version: number };
    expect([block.status, block.version]).toEqual(['partial', 2]); // outcome copied to the block, version bumped once
    const audit = (await (await f.call('lead', 'GET', '/api/audit?entity=night%20report')).json()) as { items: { userId: number; action: string }[] };
    expect(audit.items[0]).toMatchObject({ action: 'create', userId: body.authorId });
  });

  it('pages and filters lists', async () => {
    for (let d = 12; d <= 18; d++) expect((await f.call('observer', 'POST', '/api/nights', { siteId: f.ids.site, campaignId: f.ids.campaign, date: `2027-06-${d}` })).status).toBe(201);
    const seen: number[] = [];
    for (const offset of [0, 3, 6]) {
      const page = (await (await f.call('viewer', 'GET', `/api/nights?limit=3&offset=${offset}`)).json()) as { items: { id: number }[]; total: number };
      expect(page.total).toBe(8); // 1 fixture night + 7 made here
      seen.push(...page.items.map((n) => n.id));
    }
    expect(seen.length).toBe(8);
    expect(new Set(seen).size).toBe(8); // every night once across the pages
    const range = (await (await f.call('viewer', 'GET', '/api/nights?from=2027-06-14&to=2027-06-16')).json()) as { items: { date: string }[] };
    expect(range.items.map((n) => n.date)).toEqual(['2027-06-14', '2027-06-15', '2027-06-16']); // inclusive range, dates made here
    const bySite = (await (await f.call('viewer', 'GET', `/api/blocks?siteId=${f.ids.site}&campaignId=${f.ids.campaign}`)).json()) as { total: number };
    expect(bySite.total).toBe(1); // the fixture's one block
    expect((await f.call('viewer', 'GET', '/api/nights?limit=501')).status).toBe(400); // page size limit 500 (this API's rule)
  });

  it('serves a stored target’s ephemeris and events from its current solution, as the stateless endpoint does', async () => {
    const stored = (await (await f.call('viewer', 'GET', `/api/targets/${f.ids.target}/ephemeris?start=2027-06-01T00:00Z&end=2027-07-01T00:00Z&step=5d`)).json()) as { predictions: { dRaMas: number; epoch: string }[] };
    const direct = (await (await f.app.request('/api/ephemeris', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ orbit: ORBIT_S1, epochs: { start: '2027-06-01T00:00Z', end: '2027-07-01T00:00Z', step: '5d' } }) })).json()) as { predictions: { dRaMas: number }[] };
    expect(stored.predictions.length).toBe(7); // 30 days in steps of 5, both ends included
    expect(stored.predictions.map((p) => p.dRaMas)).toEqual(direct.predictions.map((p) => p.dRaMas)); // same engine, same orbit
    const csv = await (await f.call('viewer', 'GET', `/api/targets/${f.ids.target}/ephemeris?start=2027-06-01T00:00Z&end=2027-07-01T00:00Z&step=5d&format=csv`)).text();
    expect(csv.trim().split('\n').length).toBe(8); // header + 7 rows
    const events = (await (await f.call('viewer', 'GET', `/api/targets/${f.ids.target}/events?start=2027-01-01T00:00Z&end=2028-01-01T00:00Z&kinds=periapsis`)).json()) as { events: { epoch: string }[] };
    expect(events.events.length).toBe(1); // P = 14.2 yr: one passage in a year
    expect(Math.abs(Date.parse(events.events[0]!.epoch) - Date.parse('2027-06-14T06:00:00Z'))).toBeLessThan(86_400_000); // T of the fixture orbit; no light-time switch on, so within a day
  });

  it('publishes an OpenAPI document with the store routes and bearer sign-in', async () => {
    const doc = (await (await f.app.request('/api/openapi.json')).json()) as { paths: Record<string, unknown>; components: { securitySchemes: Record<string, { scheme: string }> } };
    for (const p of ['/systems', '/targets/{id}/ephemeris', '/orbit-solutions', '/sites', '/campaigns', '/nights', '/blocks', '/night-reports', '/measurements', '/imports/{kind}', '/campaigns/{id}/calendar.ics']) expect(Object.keys(doc.paths)).toContain(p);
    expect(doc.components.securitySchemes.bearer!.scheme).toBe('bearer'); // RFC 6750 bearer tokens
    expect(await tableCounts(f.store)).toMatchObject({ systems: 1, sites: 1 }); // reading the document writes nothing
  });
});
