/**
 * The backends every store test runs against (one shared suite, docs/STYLE.md item 5): a real libSQL
 * file in a fresh temporary folder, and an in-memory libSQL database.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { count } from 'drizzle-orm';
import * as schema from '../../db/schema.ts';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';
import { databaseOf } from '../../server/store/testing.ts';

export interface Backend {
  name: string;
  open(): Promise<{ store: Store; cleanup(): void }>;
}

export const BACKENDS: Backend[] = [
  {
    name: 'libSQL file',
    async open() {
      const dir = mkdtempSync(join(tmpdir(), 'epochwright-store-'));
      const store = createStore(await openDatabase({ url: `file:${join(dir, 'test.db')}` }));
      return {
        store,
        cleanup: () => {
          store.close();
          rmSync(dir, { recursive: true, force: true });
        },
      };
    },
  },
  {
    name: 'libSQL in memory',
    async open() {
      const store = createStore(await openDatabase({ url: ':memory:' }));
      return { store, cleanup: () => store.close() };
    },
  },
];

/** Rows in every table: compared before and after a rejected request to prove nothing was written. */
export async function tableCounts(store: Store): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const [name, table] of Object.entries(schema)) {
    if (typeof table !== 'object' || table === null || !('getSQL' in table)) continue;
    const [{ n }] = (await databaseOf(store)
      .db.select({ n: count() })
      .from(table as typeof schema.users)) as [{ n: number }];
    out[name] = n;
  }
  return out;
}

export interface Fixture {
  store: Store;
  app: ReturnType<typeof createApp>;
  tokens: { lead: string; observer: string; viewer: string };
  ids: {
    system: number;
    target: number;
    site: number;
    campaign: number;
    night: number;
    block: number;
  };
  /** fetch through app.request with a role's token and JSON body. */
  call(
    role: 'lead' | 'observer' | 'viewer' | null,
    method: string,
    path: string,
    body?: unknown,
  ): Promise<Response>;
}

/** An invented orbit for the shared fixture (round values of our own; no real star). */
export const ORBIT_WREN = {
  elements: {
    periodYears: 14.2,
    periapsis: '2027-06-14T06:00:00Z',
    eccentricity: 0.74,
    semiMajorAxisArcsec: 0.094,
    inclinationDeg: 71,
    ascendingNodeDeg: 143,
    argPeriapsisDeg: 298,
  },
  distancePc: 11500,
};

/** Users of each role and one of every entity, made through the store. */
export async function fixture(
  store: Store,
  options: { maxBodyBytes?: number } = {},
): Promise<Fixture> {
  const a = LOCAL_OPERATOR;
  const tokens = {
    lead: (await store.users.createWithToken(a, { name: 'lead one', role: 'lead' })).secret,
    observer: (await store.users.createWithToken(a, { name: 'observer one', role: 'observer' }))
      .secret,
    viewer: (await store.users.createWithToken(a, { name: 'viewer one', role: 'viewer' })).secret,
  };
  const system = await store.systems.create(a, {
    name: 'Test Deep',
    raDeg: 263.8,
    decDeg: -21.7,
    distancePc: 11500,
  });
  const target = await store.targets.create(a, { systemId: system.id, name: 'Wren' });
  await store.orbitSolutions.create(a, { targetId: target.id, orbit: ORBIT_WREN });
  const site = await store.sites.create(a, {
    name: 'Test Ridge',
    latitudeDeg: -24.9,
    longitudeDeg: -69.5,
    elevationM: 2700,
    timeZone: 'America/Santiago',
  });
  const campaign = await store.campaigns.create(a, {
    name: 'Test campaign',
    // From before the tests' clock (2026-12-01, vitest.config.ts), so its night is over and may be
    // logged, through next year, where allocations are planned.
    startDate: '2026-01-01',
    endDate: '2027-12-31',
    goals: { cadenceDays: 14, kinds: ['astrometry'] },
    targetIds: [target.id],
    siteIds: [site.id],
  });
  const night = await store.nights.create(a, {
    siteId: site.id,
    campaignId: campaign.id,
    date: '2026-06-10',
  });
  const block = await store.blocks.create(a, {
    nightId: night.id,
    targetId: target.id,
    kind: 'astrometry',
    startUtc: '2026-06-11T04:00:00Z',
    endUtc: '2026-06-11T05:00:00Z',
  });
  const app = createApp({
    store,
    ...(options.maxBodyBytes ? { maxBodyBytes: options.maxBodyBytes } : {}),
  });
  const call = async (
    role: 'lead' | 'observer' | 'viewer' | null,
    method: string,
    path: string,
    body?: unknown,
  ) =>
    app.request(path, {
      method,
      headers: {
        ...(role ? { authorization: `Bearer ${tokens[role]}` } : {}),
        ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
      },
      ...(body !== undefined
        ? { body: typeof body === 'string' ? body : JSON.stringify(body) }
        : {}),
    });
  return {
    store,
    app,
    tokens,
    ids: {
      system: system.id,
      target: target.id,
      site: site.id,
      campaign: campaign.id,
      night: night.id,
      block: block.id,
    },
    call,
  };
}
