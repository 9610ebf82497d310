/**
 * The audit trail names its writer: the user and the bearer token of an HTTP write, the
 * operating-system account of a local command line (via "cli"), the store itself for the demo;
 * an update records each changed field with its old and new value, a delete the row as it was, and
 * an import one entry. Constructed cases on the shared fixture (test/store/backends.ts).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { operatingSystemAccount } from '../../server/cli/actor.ts';
import { commands } from '../../server/cli/commands/index.ts';
import { createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { fixture, type Fixture } from '../store/backends.ts';

interface Entry {
  userId: number | null;
  actorName: string | null;
  via: string | null;
  tokenId: number | null;
  action: string;
  entity: string;
  entityId: number | null;
  detail: Record<string, unknown>;
}

describe('the audit trail', () => {
  let dir: string;
  let url: string;
  let store: Store;
  let f: Fixture;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'epochwright-audit-'));
    url = `file:${join(dir, 'audit.db')}`;
    store = createStore(await openDatabase({ url }));
    f = await fixture(store);
  });
  afterAll(() => {
    store.close();
    rmSync(dir, { recursive: true, force: true });
  });
  const trail = async (entity: string, entityId?: number) =>
    (
      (await (
        await f.call(
          'lead',
          'GET',
          `/api/audit?entity=${encodeURIComponent(entity)}${entityId ? `&entityId=${entityId}` : ''}`,
        )
      ).json()) as { items: Entry[] }
    ).items;

  it('names the user and token of an HTTP write, and the old value of each changed field', async () => {
    const me = (await (await f.call('lead', 'GET', '/api/me')).json()) as { id: number };
    const tokens = await store.users.listTokens('lead one');
    const patched = await f.call('lead', 'PATCH', `/api/systems/${f.ids.system}`, {
      distancePc: 11600,
      notes: 'distance revised',
    });
    expect(patched.status, await patched.clone().text()).toBe(200);
    const [entry] = await trail('system', f.ids.system);
    expect(entry).toMatchObject({
      action: 'update',
      userId: me.id,
      actorName: 'lead one',
      via: 'http',
    }); // the fixture's lead (test/store/backends.ts)
    expect(entry!.tokenId).toBeTypeOf('number');
    expect(tokens.map((t) => t.id)).toContain(entry!.tokenId); // the lead's own token
    expect(entry!.detail).toEqual({
      changed: {
        distancePc: { old: 11500, new: 11600 },
        notes: { old: '', new: 'distance revised' },
      },
    }); // constructed case: the fixture's system has 11500 pc and no notes
  });

  it('records a changed join table (a campaign’s targets) with its old and new ids', async () => {
    const t2 = (await (
      await f.call('lead', 'POST', '/api/targets', { systemId: f.ids.system, name: 'T audit' })
    ).json()) as { id: number };
    const res = await f.call('lead', 'PATCH', `/api/campaigns/${f.ids.campaign}`, {
      targetIds: [f.ids.target, t2.id],
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const [entry] = await trail('campaign', f.ids.campaign);
    expect(entry!.detail).toEqual({
      changed: { targetIds: { old: [f.ids.target], new: [f.ids.target, t2.id] } },
    });
  });

  it('keeps the row as it was on a delete', async () => {
    const made = (await (
      await f.call('lead', 'POST', '/api/systems', { name: 'Audit Gone', raDeg: 10, decDeg: 5 })
    ).json()) as { id: number };
    expect((await f.call('lead', 'DELETE', `/api/systems/${made.id}`)).status).toBe(204);
    const [entry] = await trail('system', made.id);
    expect(entry).toMatchObject({ action: 'delete', via: 'http' });
    expect(entry!.detail).toMatchObject({ id: made.id, name: 'Audit Gone', raDeg: 10, decDeg: 5 });
  });

  it('names the operating-system account of a command line, with one entry per import', async () => {
    const file = join(dir, 'rv.csv');
    writeFileSync(
      file,
      'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument\nTest Deep,Wren,radial-velocity,2026-04-01T04:00:00Z,120,5,spec\nTest Deep,Wren,radial-velocity,2026-04-02T04:00:00Z,121,5,spec\n',
    );
    // The command line opens the same file as the server (one store, many writers).
    await commands.import!.run(['--kind', 'measurements', '--file', file, '--database', url]);
    const entries = (await trail('measurements')).filter((e) => e.action === 'import');
    expect(entries.length).toBe(1); // one entry for the whole file
    expect(entries[0]).toMatchObject({
      userId: null,
      actorName: operatingSystemAccount(),
      via: 'cli',
      tokenId: null,
    });
    expect(entries[0]!.detail).toMatchObject({ rows: 2 });
  });
});
