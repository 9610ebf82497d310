/**
 * The store's CLI commands against a libSQL file in a temporary folder: account, import, export,
 * backup. Commands are called as main() calls them (run(argv) → stdout text, or a thrown error).
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ical from 'node-ical';
import { commands } from '../../server/cli/commands/index.ts';
import { UsageError } from '../../server/cli/io.ts';
import { InputError } from '../../server/science/errors.ts';
import {
  LOCAL_OPERATOR,
  createStore,
  locateDatabase,
  openDatabase,
} from '../../server/store/index.ts';
import { ORBIT_WREN } from '../store/backends.ts';

let dir: string;
let url: string;
const run = (name: string, ...argv: string[]) =>
  Promise.resolve(commands[name]!.run([...argv, '--database', url]));

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-cli-'));
  url = `file:${join(dir, 'cli.db')}`;
  const store = createStore(await openDatabase({ url }));
  const system = await store.systems.create(LOCAL_OPERATOR, {
    name: 'Cli Deep',
    raDeg: 263.8,
    decDeg: -21.7,
  });
  const target = await store.targets.create(LOCAL_OPERATOR, { systemId: system.id, name: 'Kite' });
  await store.orbitSolutions.create(LOCAL_OPERATOR, { targetId: target.id, orbit: ORBIT_WREN });
  const site = await store.sites.create(LOCAL_OPERATOR, {
    name: 'Cli Ridge',
    latitudeDeg: -24.9,
    longitudeDeg: -69.5,
    elevationM: 2700,
    timeZone: 'America/Santiago',
  });
  await store.campaigns.create(LOCAL_OPERATOR, {
    name: 'Cli campaign',
    startDate: '2027-01-01',
    endDate: '2027-12-31',
    goals: { cadenceDays: 14, kinds: ['astrometry'] },
    targetIds: [target.id],
    siteIds: [site.id],
  });
  store.close();
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('store commands', () => {
  it('account add prints a token that signs in with the given role', async () => {
    const out = await run('account', 'add', '--name', 'night lead', '--role', 'lead');
    const token = /token \(shown once\): (\S+)/.exec(out)![1]!;
    const store = createStore(await openDatabase({ url }));
    expect((await store.users.authenticate(token))?.user.role).toBe('lead'); // the role given above
    store.close();
    await expect(run('account', 'add', '--name', 'x', '--role', 'admin')).rejects.toBeInstanceOf(
      InputError,
    );
    await expect(run('account', 'frobnicate')).rejects.toBeInstanceOf(UsageError);
    expect(await run('account', 'list')).toMatch(/night lead\s+lead/);
  });

  it('account tokens lists tokens without secrets, and account revoke stops one at once', async () => {
    const out = await run('account', 'token', '--name', 'night lead', '--label', 'laptop');
    const [, id, secret] = /token id (\d+)\), shown once: (\S+)/.exec(out)!;
    const listed = JSON.parse(await run('account', 'tokens', '--name', 'night lead', '--json')) as {
      id: number;
      label: string;
      revokedAt: string | null;
    }[];
    expect(listed.map((t) => [t.id, t.label, t.revokedAt])).toEqual([
      [1, 'created at the command line', null],
      [Number(id), 'laptop', null],
    ]); // the two tokens made for this user in these tests
    expect(JSON.stringify(listed)).not.toContain(secret!); // secrets are shown once, never listed
    expect(await run('account', 'revoke', '--token-id', id!)).toMatch(
      new RegExp(`revoked token ${id} \\("laptop"\\) of "night lead" at \\d{4}-\\d\\d-\\d\\dT`),
    );
    const store = createStore(await openDatabase({ url }));
    expect(await store.users.authenticate(secret!)).toBeNull(); // revoked: no longer signs in
    store.close();
    expect(await run('account', 'tokens')).toMatch(
      new RegExp(`\\n\\s*${id}\\s+night lead\\s+lead\\s+laptop\\s+\\S+Z\\s+\\S+Z`),
    ); // table row with both dates
    const again = await run('account', 'revoke', '--token-id', id!).catch((e: unknown) => e);
    expect(again).toBeInstanceOf(InputError); // exit 2: bad input, not a failure
    expect((again as InputError).field).toBe('--token-id');
    await expect(run('account', 'revoke', '--token-id', 'first')).rejects.toBeInstanceOf(
      InputError,
    );
    await expect(run('account', 'revoke')).rejects.toBeInstanceOf(UsageError);
    await expect(run('account', 'tokens', '--name', 'nobody here')).rejects.toBeInstanceOf(
      InputError,
    );
  });

  it('import lists every bad row and writes nothing; a good file is written whole', async () => {
    const bad = join(dir, 'bad.csv');
    writeFileSync(
      bad,
      'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument\nCli Deep,Kite,radial-velocity,J2026.4,120,5,spec\nCli Deep,Kite,radial-velocity,J2026.5,fast,5,spec\nNowhere,Kite,radial-velocity,J2026.6,1,5,spec\n',
    );
    const err = await run('import', '--kind', 'measurements', '--file', bad).catch(
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(UsageError);
    expect((err as Error).message).toMatch(/2 problem/); // the two bad rows planted above
    expect((err as Error).message).toMatch(/3\s+radialVelocityKmS\s+"fast"/);
    expect((err as Error).message).toMatch(/4\s+system\s+"Nowhere"/);
    const good = join(dir, 'good.csv');
    writeFileSync(
      good,
      'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument\nCli Deep,Kite,radial-velocity,J2026.4,120,5,spec\nCli Deep,Kite,radial-velocity,J2026.5,130,5,spec\n',
    );
    expect(await run('import', '--kind', 'measurements', '--file', good, '--check-only')).toMatch(
      /checked 2 .* nothing written/,
    );
    expect(await run('export', 'measurements')).toBe(
      'system,target,kind,component,epoch,dRaMas,dDecMas,sigmaDRaMas,sigmaDDecMas,separationMas,positionAngleDeg,sigmaSeparationMas,sigmaPositionAngleDeg,correlation,radialVelocityKmS,sigmaRadialVelocityKmS,instrument,blockId,notes\n',
    ); // header only: nothing written so far
    expect(await run('import', '--kind', 'measurements', '--file', good)).toBe(
      'imported 2 rows of measurements\n',
    );
    const csv = await run('export', 'measurements');
    expect(csv.trim().split('\n').length).toBe(3); // header + the 2 rows of good.csv
  });

  it('exports an ephemeris and a calendar, and writes a backup', async () => {
    const eph = await run(
      'export',
      'ephemeris',
      '--target-id',
      '1',
      '--start',
      '2027-06-01T00:00Z',
      '--end',
      '2027-06-03T00:00Z',
      '--step',
      'P1D',
    );
    expect(eph.trim().split('\n').length).toBe(4); // header + 3 daily rows, both ends included
    const cal = ical.sync.parseICS(await run('export', 'calendar', '--campaign-id', '1'));
    const vevents = Object.values(cal).filter((c) => c?.type === 'VEVENT') as ical.VEvent[];
    expect(vevents.map((e) => String(e.summary))).toEqual(['Periapsis of Kite (Cli Deep)']); // one periapsis of Kite (P = 14.2 yr, ORBIT_WREN invented) in the window (no covariance: no σ, so a one-minute event), no nights, no blocks; its flag is not repeated
    const bad = await run('export', 'calendar', '--campaign-id', '1', '--at', 'someday').catch(
      (e: unknown) => e,
    );
    expect(bad).toBeInstanceOf(InputError); // exit 2: bad input (server/cli/main.ts)
    expect((bad as InputError).field).toBe('--at');
    const out = await run('backup', '--file', join(dir, 'copy.db'));
    const copy = await openDatabase({ url: `file:${/written to (.*)$/m.exec(out)![1]}` });
    expect(
      Number((await copy.client.execute('SELECT count(*) AS n FROM measurements')).rows[0]!.n),
    ).toBe(2); // the two imported above
    copy.close();
  });

  it('finds the database as the server does, refuses a missing one, and reads stored sites', async () => {
    // the one resolution, server and CLI alike (README "Configuration")
    expect(locateDatabase({}, { EPOCHWRIGHT_DATA_DIR: dir })).toEqual({
      url: `file:${join(dir, 'epochwright.db')}`,
      source: 'EPOCHWRIGHT_DATA_DIR',
    });
    expect(locateDatabase({}, { DATABASE_URL: url, EPOCHWRIGHT_DATA_DIR: dir }).source).toBe(
      'DATABASE_URL',
    );
    const missing = `file:${join(dir, 'nowhere', 'epochwright.db')}`;
    const refused = await Promise.resolve(
      commands.flags!.run(['--campaign-id', '1', '--database', missing]),
    ).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(InputError);
    expect((refused as InputError).rule).toMatch(/names no database/);
    expect(existsSync(join(dir, 'nowhere'))).toBe(false); // nothing created
    // a stored site and campaign instead of retyped JSON
    const night = JSON.parse(
      await run('night', '--site-id', '1', '--campaign-id', '1', '--date', '2027-06-15', '--json'),
    ) as { site: { name: string }; targets: { name: string }[] };
    expect(night.site.name).toBe('Cli Ridge');
    expect(night.targets.map((t) => t.name)).toEqual(['Kite (Cli Deep)']);
    await expect(run('night', '--campaign-id', '1', '--date', '2027-06-15')).rejects.toBeInstanceOf(
      UsageError,
    );
  });
});
