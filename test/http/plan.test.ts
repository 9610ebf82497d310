/**
 * The planning endpoint and CLI on the demo campaign: its headline star (invented) passes periapsis
 * about seven months after the clock (server/store/demo/scenario.ts), so it is flagged now.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../server/cli/main.ts';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { nowIso } from '../../server/clock.ts';
import { HEADLINE, demoPeriapsis } from '../../server/store/demo/scenario.ts';

const AT = `${nowIso().slice(0, 10)}T00:00:00Z`;

let store: Store;
let dir: string;
let token: string;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-plan-'));
  store = createStore(await openDatabase({ url: `file:${join(dir, 'plan.db')}` }));
  await store.loadDemo(LOCAL_OPERATOR, {});
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
    const res = await app.request(`/api/campaigns/1/flags?at=${AT}`, {
      headers: { authorization: `Bearer ${token}` },
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as {
      flags: { kind: string; target: string; date: string; reason: string }[];
    };
    const peri = body.flags.find((f) => f.kind === 'periapsis-ahead' && f.target === HEADLINE)!;
    const sigma = (peri as unknown as { periapsis: { sigmaDays: number } }).periapsis.sigmaDays;
    expect(
      Math.abs(Date.parse(peri.date) - Date.parse(demoPeriapsis(AT))) / 86_400_000,
    ).toBeLessThan(4 * sigma + 1); // the demo scenario's periapsis (invented), as fitted to the demo's measurements: within 4σ and a day of light time
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
        '--campaign-id',
        '1',
        '--at',
        AT,
        '--database',
        `file:${join(dir, 'plan.db')}`,
      ]);
    } finally {
      process.stdout.write = write;
    }
    expect(code).toBe(0);
    expect(out.join('')).toMatch(new RegExp(`periapsis-ahead\\s+${HEADLINE}`));
  });
});
