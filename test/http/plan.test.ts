/**
 * The planning endpoint and CLI on the demo campaign: VC s1 (invented) passes periapsis on
 * 2027-06-14 in the demo scenario (server/store/demo/scenario.ts), so it is flagged from 2026-12-01.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../server/cli/main.ts';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';

let store: Store;
let dir: string;
let token: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-plan-'));
  store = createStore(await openDatabase({ url: `file:${join(dir, 'plan.db')}` }));
  await store.loadDemo(LOCAL_OPERATOR, { today: '2026-12-01' });
  token = (
    await store.users.createWithToken(LOCAL_OPERATOR, { name: 'plan viewer', role: 'viewer' })
  ).secret;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('GET /api/campaigns/{id}/flags', () => {
  it('flags the demo periapsis months ahead with reasons', async () => {
    const app = createApp({ store });
    const res = await app.request('/api/campaigns/1/flags?at=2026-12-01T00:00:00Z', {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as {
      flags: { kind: string; target: string; date: string; reason: string }[];
    };
    const peri = body.flags.find((f) => f.kind === 'periapsis-ahead' && f.target === 'VC s1')!;
    expect(peri.date.slice(0, 7)).toBe('2027-06'); // the demo scenario's periapsis of VC s1 (invented), Rømer delay included
    expect(peri.reason).toMatch(/within 365 days/);
    expect((await app.request('/api/campaigns/1/flags')).status).toBe(401); // no token: RFC 9110 §15.5.2 (from memory)
  });

  it('shows the same flags through the CLI', async () => {
    const out: string[] = [];
    const write = process.stdout.write.bind(process.stdout);
    process.stdout.write = ((s: string) => {
      out.push(s);
      return true;
    }) as typeof process.stdout.write;
    let code: number;
    try {
      code = await main([
        'flags',
        '--campaign',
        '1',
        '--at',
        '2026-12-01T00:00:00Z',
        '--database',
        `file:${join(dir, 'plan.db')}`,
      ]);
    } finally {
      process.stdout.write = write;
    }
    expect(code).toBe(0);
    expect(out.join('')).toMatch(/periapsis-ahead\s+VC s1/);
  });
});
