/**
 * Every route refuses a query parameter it does not declare, with a 400 naming the parameter and
 * the ones the route takes, before any work or write; the parameters it declares pass the check.
 * The routes and their parameters are read from the server's own OpenAPI document, so a new route
 * is covered without listing it here (constructed case).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface Operation {
  parameters?: { name: string; in: string }[];
}
type Json = {
  error: {
    code: string;
    message: string;
    details?: { issues?: { field: string; rule: string; code: string }[]; accepted?: string[] };
  };
};

let f: Fixture;
let cleanup: () => void;
let routes: { method: string; path: string; query: string[] }[];
beforeAll(async () => {
  const backend = await BACKENDS[1]!.open();
  cleanup = backend.cleanup;
  f = await fixture(backend.store);
  const doc = (await (await f.app.request('/api/openapi.json')).json()) as {
    paths: Record<string, Record<string, Operation>>;
  };
  routes = Object.entries(doc.paths).flatMap(([path, ops]) =>
    Object.entries(ops).map(([method, op]) => ({
      method: method.toUpperCase(),
      // Any id matches the route; the check runs before the id is read.
      path: `/api${path.replaceAll(/\{[^}]+\}/g, '1')}`,
      query: (op.parameters ?? [])
        .filter((p) => p.in === 'query')
        .map((p) => p.name)
        .sort(),
    })),
  );
});
afterAll(() => cleanup());

describe('query parameters', () => {
  it('refuses an undeclared one on every route, naming it and the accepted ones', async () => {
    expect(routes.length).toBeGreaterThan(60); // every documented route (72 when written)
    for (const r of routes) {
      const res = await f.app.request(`${r.path}?notAParameter=1`, { method: r.method });
      const body = (await res.json()) as Json;
      const where = `${r.method} ${r.path}`;
      expect(res.status, where).toBe(400);
      expect(body.error.details?.issues?.[0], where).toMatchObject({
        field: 'notAParameter',
        code: 'unknown_parameter',
      });
      expect(body.error.details?.accepted, where).toEqual(r.query);
      expect(body.error.message, where).toContain(
        r.query.length > 0 ? `accepted: ${r.query.join(', ')}` : 'it takes none',
      );
    }
  });

  it('lets every declared one through to the route', async () => {
    const withQuery = routes.filter((r) => r.query.length > 0);
    expect(withQuery.length).toBeGreaterThan(10);
    for (const r of withQuery) {
      const q = new URLSearchParams(r.query.map((n) => [n, 'x']));
      const res = await f.app.request(`${r.path}?${q}`, { method: r.method });
      const body = (await res.json().catch(() => ({}))) as Partial<Json>;
      const codes = (body.error?.details?.issues ?? []).map((i) => i.code);
      expect(codes, `${r.method} ${r.path}`).not.toContain('unknown_parameter');
    }
  });

  it('refuses a filter an export does not have instead of exporting everything', async () => {
    const res = await f.call('viewer', 'GET', '/api/exports/measurements?campaignId=3');
    expect(res.status).toBe(400);
    const body = (await res.json()) as Json;
    expect(body.error.message).toMatch(/^campaignId: is not a query parameter/);
    expect(body.error.details?.accepted).toContain('targetId');
  });

  it('names the new name of an old range filter', async () => {
    for (const [old, now] of [
      ['from', 'start'],
      ['to', 'end'],
    ]) {
      const res = await f.call('viewer', 'GET', `/api/measurements?${old}=2027-01-01`);
      expect(res.status).toBe(400);
      expect(((await res.json()) as Json).error.message).toContain(`(renamed: use ${now})`);
    }
  });

  it('writes nothing when a write carries an unknown parameter', async () => {
    const before = await tableCounts(f.store);
    const res = await f.call('lead', 'POST', '/api/systems?dryRun=true', {
      name: 'Query Check',
      raDeg: 10,
      decDeg: 20,
    });
    expect(res.status).toBe(400);
    expect(await tableCounts(f.store)).toEqual(before);
  });
});
