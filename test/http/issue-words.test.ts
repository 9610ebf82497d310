/**
 * A malformed request is refused in our words, the same for the API, the CLI and the client:
 * "must be at most 1", never zod's "Too big: expected number to be <=1" (the wording issue 15 saw).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, type Fixture } from '../store/backends.ts';

const backend = BACKENDS[1]!;
let env: Awaited<ReturnType<(typeof backend)['open']>>;
let f: Fixture;
beforeAll(async () => {
  env = await backend.open();
  f = await fixture(env.store);
});
afterAll(() => env.cleanup());

const rulesOf = async (method: string, path: string, body: unknown) => {
  const res = await f.call('lead', method, path, body);
  const j = (await res.json()) as {
    error: {
      details: { issues?: { field: string; rule: string }[]; field?: string; rule?: string };
    };
  };
  return {
    status: res.status,
    rules: Object.fromEntries(
      (
        j.error.details.issues ?? [{ field: j.error.details.field!, rule: j.error.details.rule! }]
      ).map((i) => [i.field, i.rule]),
    ),
  };
};

describe('refusals in our words', () => {
  it('bounds, types, choices and unknown fields (constructed cases)', async () => {
    const r = await rulesOf('POST', '/api/night-reports', {
      nightId: f.ids.night,
      strehlRatio: 1.5,
      seeingArcsec: 'good',
      timeLostHours: -1,
      outcomes: [{ blockId: f.ids.block, status: 'fine' }],
      mood: 'calm',
    });
    expect(r.status).toBe(400);
    expect(r.rules).toMatchObject({
      strehlRatio: 'must be at most 1',
      seeingArcsec: 'must be a number',
      timeLostHours: 'must be at least 0',
      'outcomes.0.status': expect.stringMatching(/^must be one of "planned", "obtained"/),
    });
    expect(Object.values(r.rules).join(' ')).toMatch(/does not take: mood/);
    expect(Object.values(r.rules).join(' ')).not.toMatch(/Too big|Too small|Invalid|expected/);
    const sys = await rulesOf('POST', '/api/systems', {
      name: '',
      raDeg: 250,
      decDeg: -20,
      pmRaMasYr: 'fast',
    });
    expect(sys.rules).toMatchObject({ name: 'must not be empty', pmRaMasYr: 'must be a number' });
    const night = await rulesOf('POST', '/api/nights', { siteId: f.ids.site, date: '2027-13-01' });
    expect(night.rules).toMatchObject({ date: 'must be a calendar date YYYY-MM-DD' });
  });
});
