/**
 * `--server URL --token T`: the CLI sends import and export to a running server over HTTP, so
 * the server's roles apply and the audit trail names the token's user (not the local operator).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { serve, type ServerType } from '@hono/node-server';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { commands } from '../../server/cli/commands/index.ts';
import { UsageError } from '../../server/cli/io.ts';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { ORBIT_WREN } from '../store/backends.ts';

let dir: string;
let store: Store;
let server: ServerType;
let base: string;
let lead: { id: number; secret: string };
let viewer: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-remote-'));
  store = createStore(await openDatabase({ url: `file:${join(dir, 'server.db')}` }));
  const l = await store.users.createWithToken(LOCAL_OPERATOR, {
    name: 'remote lead',
    role: 'lead',
  });
  lead = { id: l.user.id, secret: l.secret };
  viewer = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'watcher', role: 'viewer' }))
    .secret;
  const system = await store.systems.create(LOCAL_OPERATOR, {
    name: 'Far Deep',
    raDeg: '17:35:12',
    decDeg: '-21:42',
  });
  const target = await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Rook' });
  await store.orbitSolutions.create(LOCAL_OPERATOR, { targetId: target.id, orbit: ORBIT_WREN });
  server = serve({ fetch: createApp({ store }).fetch, port: 0, hostname: '127.0.0.1' });
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const run = (name: string, ...argv: string[]) => Promise.resolve(commands[name]!.run(argv));

it('imports through a running server, audited under the token’s user, and exports back', async () => {
  const file = join(dir, 'm.csv');
  writeFileSync(
    file,
    'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument\n' +
      'Far Deep,Rook,radial-velocity,2026-06-01T04:00:00Z,812.5,10,spectrograph A\n',
  );
  expect(
    await run(
      'import',
      '--kind',
      'measurements',
      '--file',
      file,
      '--server',
      base,
      '--token',
      lead.secret,
    ),
  ).toBe('imported 1 row of measurements\n');
  const audit = await store.audit.list({ entity: 'measurements' }, { limit: 10, offset: 0 });
  expect(audit.items.map((a) => a.userId)).toEqual([lead.id]); // the token's user, not null
  // a viewer's token may not import: the server's role rule, exit 2
  const refused = await run(
    'import',
    '--kind',
    'measurements',
    '--file',
    file,
    '--server',
    base,
    '--token',
    viewer,
  ).catch((e: unknown) => e);
  expect(refused).toBeInstanceOf(UsageError);
  expect((refused as Error).message).toMatch(/403 forbidden/);
  const csv = await run('export', 'measurements', '--server', base, '--token', viewer);
  expect(csv).toMatch(/Far Deep,Rook,radial-velocity,[^,]*,2026-06-01T04:00:00\.000Z/);
  await expect(run('export', 'measurements', '--server', base)).rejects.toBeInstanceOf(UsageError);
});

it('exports the archive through a running server with a lead’s token only, equal to the store’s', async () => {
  const text = await run('export', 'archive', '--server', base, '--token', lead.secret);
  const archive = JSON.parse(text) as { format: string; tables: Record<string, unknown[]> };
  const local = await store.archive();
  expect(archive.format).toBe('epochwright-archive');
  expect(archive.tables.systems).toEqual(local.tables.systems); // constructed case: the same rows
  expect(archive.tables.tokens).toBeUndefined(); // no way in travels with an archive
  const refused = await run('export', 'archive', '--server', base, '--token', viewer).catch(
    (e: unknown) => e,
  );
  expect(refused).toBeInstanceOf(UsageError);
  expect((refused as Error).message).toMatch(/403/);
  const res = await fetch(`${base}/api/exports/archive`, {
    headers: { authorization: `Bearer ${lead.secret}` },
  });
  expect(res.headers.get('content-disposition')).toMatch(/attachment; filename=/);
});

it('gives a campaign’s flags through a running server as the store gives them', async () => {
  const campaign = await store.campaigns.create(LOCAL_OPERATOR, {
    name: 'Remote season',
    startDate: '2027-01-01',
    endDate: '2027-12-31',
    goals: { cadenceDays: 14, kinds: ['astrometry'] },
    targetIds: [(await store.targets.list({}, { limit: 5 })).items[0]!.id],
  });
  const args = ['--campaign-id', String(campaign.id), '--at', '2027-02-01T00:00Z', '--json'];
  const remote = JSON.parse(await run('flags', ...args, '--server', base, '--token', viewer));
  const local = JSON.parse(
    await run('flags', ...args, '--database', `file:${join(dir, 'server.db')}`),
  );
  expect(remote).toEqual(local); // constructed case: one store, two ways in
  expect(remote.flags.length).toBeGreaterThan(0);
});

it('issues and lists tokens through a running server as the store lists them (lead only)', async () => {
  const issued = await run(
    'account',
    'token',
    '--name',
    'watcher',
    '--label',
    'laptop',
    '--server',
    base,
    '--token',
    lead.secret,
  );
  expect(issued).toMatch(/^new token for "watcher" \(token id \d+\), shown once: \S+/);
  const audit = await store.audit.list({ entity: 'token' }, { limit: 1, offset: 0 });
  expect(audit.items[0]!.userId).toBe(lead.id);
  const viaServer = await run(
    'account',
    'tokens',
    '--json',
    '--server',
    base,
    '--token',
    lead.secret,
  );
  const local = await run(
    'account',
    'tokens',
    '--json',
    '--database',
    `file:${join(dir, 'server.db')}`,
  );
  expect(JSON.parse(viaServer)).toEqual(JSON.parse(local)); // constructed case: one store, two ways in
  expect(viaServer).not.toMatch(/secret|hash/);
  const unknown = await run(
    'account',
    'tokens',
    '--name',
    'nobody',
    '--server',
    base,
    '--token',
    lead.secret,
  ).catch((e: unknown) => e);
  expect((unknown as Error).message).toMatch(/^--name: "nobody" does not name a user/);
  const refused = await run('account', 'tokens', '--server', base, '--token', viewer).catch(
    (e: unknown) => e,
  );
  expect((refused as Error).message).toMatch(/403/);
});
