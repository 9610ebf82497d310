/**
 * Which database, said everywhere: every store command's --help prints where the database is found
 * here and now (as the server would find it) and offers --server; every write says on stderr where
 * it goes, the database or the server and the token's user.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { serve, type ServerType } from '@hono/node-server';
import { afterAll, beforeAll, expect, it, vi } from 'vitest';
import { commands } from '../../server/cli/commands/index.ts';
import { createApp } from '../../server/http/app.ts';
import {
  LOCAL_OPERATOR,
  createStore,
  displayUrl,
  locateDatabase,
  openDatabase,
  type Store,
} from '../../server/store/index.ts';

/** Commands that need the database file itself (a server cannot copy, restore or create it). */
const DATABASE_ONLY = ['backup', 'restore', 'create-database'];

let dir: string;
let url: string;
let store: Store;
let server: ServerType;
let base: string;
let secret: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-resolution-'));
  url = `file:${join(dir, 'r.db')}`;
  store = createStore(await openDatabase({ url }));
  secret = (await store.users.createWithToken(LOCAL_OPERATOR, { name: 'Tomas Reyl', role: 'lead' }))
    .secret;
  server = serve({ fetch: createApp({ store }).fetch, port: 0, hostname: '127.0.0.1' });
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

it('prints the database found here and now in every store command’s help, and offers --server', () => {
  const here = locateDatabase();
  for (const [name, command] of Object.entries(commands)) {
    expect(command.help, name).toContain(
      `here and now: ${displayUrl(here.url)}, from ${here.source}`,
    );
    if (DATABASE_ONLY.includes(name)) expect(command.help, name).not.toMatch(/--server/);
    else expect(command.help, name).toMatch(/--server <url>.*\n.*audited under the token's user/);
  }
});

it('says on stderr where each write goes: the database, or the server and the token’s user', async () => {
  const said: string[] = [];
  const spy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => {
    said.push(String(chunk));
    return true;
  });
  try {
    await commands.system!.run([
      'add',
      '--name',
      'Quiet Well',
      '--ra',
      '120',
      '--dec',
      '10',
      '--database',
      url,
    ]);
    await commands.system!.run(['list', '--database', url]); // a read says nothing
    await commands.system!.run([
      'add',
      '--name',
      'Far Well',
      '--ra',
      '121',
      '--dec',
      '11',
      '--server',
      base,
      '--token',
      secret,
    ]);
  } finally {
    spy.mockRestore();
  }
  expect(said).toEqual([
    `epochwright: writing to ${url} (from given)\n`,
    `epochwright: writing through ${base} as "Tomas Reyl" (lead)\n`,
  ]);
});
