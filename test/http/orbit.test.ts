import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { MEEUS_57A } from '../fixtures/orbits.ts';

const app = createApp({ maxBodyBytes: 64 * 1024 });
const post = (
  path: string,
  body: unknown,
  headers: Record<string, string> = { 'content-type': 'application/json' },
) =>
  app.request(path, {
    method: 'POST',
    headers,
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });

describe('POST /api/ephemeris', () => {
  it('reproduces Meeus Example 57.a (θ = 318.42°, ρ = 0.4110″) from its elements', async () => {
    // Meeus, Astronomical Algorithms, 2nd ed., Example 57.a (from memory)
    const res = await post('/api/ephemeris', { orbit: MEEUS_57A, epochs: ['J1980.0'] });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      predictions: {
        positionAngleDeg: number;
        separationMas: number;
        radialVelocityKmS: number | null;
      }[];
      orbit: { physical: unknown };
    };
    expect(Math.abs(body.predictions[0]!.positionAngleDeg - 318.42)).toBeLessThan(0.01);
    expect(Math.abs(body.predictions[0]!.separationMas - 411.0)).toBeLessThan(0.1);
    expect(body.predictions[0]!.radialVelocityKmS).toBeNull();
    expect(body.orbit.physical).toBeNull();
  });

  it('accepts a range with a step and gives one row per epoch', async () => {
    const res = await post('/api/ephemeris', {
      orbit: { ...MEEUS_57A, distancePc: 20 },
      epochs: { start: '2030-01-01', end: '2031-01-01', step: 'P30D' },
    });
    const body = (await res.json()) as {
      predictions: { epoch: string; radialVelocityKmS: number }[];
    };
    expect(body.predictions).toHaveLength(13);
    expect(body.predictions[1]!.epoch).toBe('2030-01-31T00:00:00.000Z');
    expect(typeof body.predictions[0]!.radialVelocityKmS).toBe('number');
  });

  it('names the field, the value and the rule for an out-of-range element (422)', async () => {
    const bad = { ...MEEUS_57A, elements: { ...MEEUS_57A.elements, eccentricity: 1.2 } };
    const res = await post('/api/ephemeris', { orbit: bad, epochs: ['J1980'] });
    expect(res.status).toBe(422);
    const body = (await res.json()) as {
      error: {
        code: string;
        message: string;
        details: { field: string; value: unknown; rule: string };
      };
    };
    expect(body.error.details.field).toBe('orbit.elements.eccentricity');
    expect(body.error.details.value).toBe(1.2);
    expect(body.error.details.rule).toMatch(/0 ≤ e < 1/);
  });

  it('answers 400 with every field for a malformed body, 400 for broken JSON, 415 without JSON, 413 when too large', async () => {
    const res = await post('/api/ephemeris', {
      orbit: { elements: { periodYears: 'ten' } },
      epochs: [],
    });
    expect(res.status).toBe(400);
    const body = (await res.json()) as {
      error: { code: string; details: { issues: { field: string }[] } };
    };
    expect(body.error.code).toBe('invalid_request');
    expect(body.error.details.issues.map((i) => i.field)).toContain('epochs');
    expect((await post('/api/ephemeris', '{"orbit": ')).status).toBe(400);
    expect((await post('/api/ephemeris', 'x', { 'content-type': 'text/plain' })).status).toBe(415);
    const huge = {
      orbit: MEEUS_57A,
      epochs: Array.from({ length: 5000 }, () => '2030-01-01T00:00:00Z'),
    };
    expect((await post('/api/ephemeris', huge)).status).toBe(413);
  });

  it('refuses an unknown epoch form with its position in the list', async () => {
    const res = await post('/api/ephemeris', {
      orbit: MEEUS_57A,
      epochs: ['2030-01-01', 'next Tuesday'],
    });
    expect(res.status).toBe(422);
    expect(
      ((await res.json()) as { error: { details: { field: string } } }).error.details.field,
    ).toBe('epochs.1');
  });
});

describe('POST /api/events', () => {
  it('lists periapsis passages with their 1σ from the covariance', async () => {
    const orbit = {
      ...MEEUS_57A,
      covariance: {
        parameters: ['periodYears', 'periapsisDays'],
        matrix: [
          [0.01, 0],
          [0, 4],
        ],
      },
    };
    const res = await post('/api/events', {
      orbit,
      start: '1900-01-01',
      end: '2100-01-01',
      kinds: ['periapsis'],
    });
    expect(res.status).toBe(200);
    const body = (await res.json()) as {
      events: { kind: string; orbitNumber: number; sigmaDays: number }[];
    };
    // Passages 1934.0, 1975.6, 2017.3, 2058.9 fall in 1900–2100 (T + kP with Meeus 57.a's P and T).
    expect(body.events.length).toBe(4);
    // σ² = σ_T² + k²σ_P² (linear propagation of t_k = T + kP; common practice, no source)
    for (const e of body.events) {
      const expected = Math.sqrt(4 + e.orbitNumber ** 2 * 0.01 * 365.25 ** 2);
      expect(Math.abs(e.sigmaDays - expected) / expected).toBeLessThan(1e-4);
    }
  });

  it('takes a covariance asymmetric by one ulp through the Monte Carlo path (events and ephemeris)', async () => {
    // Off-diagonal terms that differ in the last bit, as a matrix read back from JSON or an
    // inverse often does; it passes validation (asymmetry below 1e-9), so it must not give a 500.
    const c = 0.05;
    const orbit = {
      ...MEEUS_57A,
      covariance: {
        parameters: ['periodYears', 'periapsisDays', 'eccentricity'],
        matrix: [
          [0.01, c, 1e-5],
          [c * (1 + Number.EPSILON), 4, 2e-4],
          [1e-5 * (1 + Number.EPSILON), 2e-4 * (1 - Number.EPSILON), 1e-6],
        ],
      },
    };
    expect(orbit.covariance.matrix[1]![0]).not.toBe(orbit.covariance.matrix[0]![1]); // really asymmetric
    const events = await post('/api/events', {
      orbit,
      start: '1900-01-01',
      end: '2100-01-01',
      kinds: ['periapsis'],
      monteCarlo: { draws: 200, seed: 7 },
    });
    expect(events.status).toBe(200);
    const ephemeris = await post('/api/ephemeris', {
      orbit,
      epochs: ['J2030.0'],
      monteCarlo: { draws: 200, seed: 7 },
    });
    expect(ephemeris.status).toBe(200);
  });

  it('refuses a reversed interval and an unknown kind', async () => {
    const r1 = await post('/api/events', {
      orbit: MEEUS_57A,
      start: '2030-01-01',
      end: '2020-01-01',
    });
    expect(r1.status).toBe(422);
    const r2 = await post('/api/events', {
      orbit: MEEUS_57A,
      start: '2020-01-01',
      end: '2030-01-01',
      kinds: ['eclipse'],
    });
    expect(r2.status).toBe(422); // an unknown choice breaks a rule: README "HTTP API" (422)
  });
});

describe('GET /api/health and unknown paths', () => {
  it('answers health and 404 in the JSON error shape', async () => {
    const h = await app.request('/api/health');
    expect(h.status).toBe(200);
    expect(((await h.json()) as { status: string }).status).toBe('ok');
    const nf = await app.request('/api/nowhere');
    expect(nf.status).toBe(404);
    expect(((await nf.json()) as { error: { code: string } }).error.code).toBe('not_found');
  });
});
