/**
 * Orbit fitting over HTTP: the stateless POST /api/fit, and fits of the demo campaign's stored
 * measurements (preview, then accepted by a lead as a new current orbit-solution version while the
 * earlier versions stay). Orbits here are invented demo values.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { LOCAL_OPERATOR, type Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { epochs, simulate } from '../science/orbit/fit/simulate.ts';

const post = (app: ReturnType<typeof createApp>, path: string, body: unknown, token?: string) =>
  app.request(path, {
    method: 'POST',
    body: JSON.stringify(body),
    headers: {
      'content-type': 'application/json',
      ...(token ? { authorization: `Bearer ${token}` } : {}),
    },
  });

const truth = {
  elements: {
    periodYears: 10,
    periapsis: 'J2018.1',
    eccentricity: 0.4,
    semiMajorAxisArcsec: 0.15,
    inclinationDeg: 60,
    ascendingNodeDeg: 160,
    argPeriapsisDeg: 45,
  },
  distancePc: 40,
  systemicVelocityKmS: 21,
};
const r = new SeededRandom(4);
const measurements = simulate(
  truth,
  {
    astrometryJd: epochs(2457023.5, 12 * 365.25, 20, r, 20),
    sigmaMas: 0.8,
    velocityJd: epochs(2457123.5, 11 * 365.25, 10, r, 20),
    sigmaRadialVelocityKmS: 0.4,
  },
  5,
);

describe('POST /api/fit (stateless)', () => {
  const app = createApp();
  it('fits measurements in the body and returns parameters, covariance and residuals', async () => {
    const res = await post(app, '/api/fit', {
      stars: [{ name: 'Tarn', measurements, hints: { periodYears: { min: 8, max: 12 } } }],
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as {
      parameters: { name: string; value: number; sigma: number }[];
      residuals: unknown[];
      covariance: { parameters: string[] };
      reducedChi2: number;
    };
    expect(body.residuals).toHaveLength(measurements.length);
    expect(body.covariance.parameters).toContain('Tarn.eccentricity');
    const e = body.parameters.find((p) => p.name === 'Tarn.eccentricity')!;
    expect(Math.abs(e.value - 0.4)).toBeLessThan(3 * e.sigma); // the invented truth within 3σ (common practice, no source)
  });

  it('answers 422 naming the field for a bad value, and 422 fit_refused when the data cannot constrain the orbit', async () => {
    const bad = await post(app, '/api/fit', {
      stars: [
        {
          name: 'Tarn',
          measurements: measurements.map((m, k) => (k === 1 ? { ...m, epoch: 'someday' } : m)),
        },
      ],
    });
    expect(bad.status).toBe(422);
    expect(
      ((await bad.json()) as { error: { details: { field: string } } }).error.details.field,
    ).toBe('stars.0.measurements.1.epoch');
    const few = await post(app, '/api/fit', {
      stars: [{ name: 'Tarn', measurements: measurements.slice(0, 3) }],
    });
    expect(few.status).toBe(422);
    const err = ((await few.json()) as { error: { code: string; details: { reason: string } } })
      .error;
    expect(err.code).toBe('fit_refused');
    expect(err.details.reason).toBe('too-few-measurements');
    expect((await post(app, '/api/fit', { stars: [], lossy: 1 })).status).toBe(400); // unknown key and empty list: schema errors
  });

  it('answers one page of residuals with a summary of all, and every residual as CSV', async () => {
    const stars = [{ name: 'Tarn', measurements, hints: { periodYears: { min: 8, max: 12 } } }];
    const page = await post(app, '/api/fit', { stars, residualPage: { offset: 5, limit: 10 } });
    expect(page.status, await page.clone().text()).toBe(200);
    const body = (await page.json()) as {
      residuals: { index: number; residual: number[]; normalized: number[] }[];
      residualPage: { offset: number; limit: number; total: number };
      residualSummary: {
        total: number;
        groups: { kind: string; count: number; rmsNormalized: number }[];
      };
    };
    expect(body.residualPage).toEqual({ offset: 5, limit: 10, total: measurements.length });
    expect(body.residuals.map((x) => x.index)).toEqual([5, 6, 7, 8, 9, 10, 11, 12, 13, 14]);
    expect(body.residualSummary.total).toBe(measurements.length);
    // 20 offsets and 10 velocities, simulated at their σ: RMS of (o−c)/σ near 1 (constructed case)
    expect(body.residualSummary.groups.map((g) => [g.kind, g.count])).toEqual([
      ['offsets', 20],
      ['radial-velocity', 10],
    ]);
    for (const g of body.residualSummary.groups) {
      expect(g.rmsNormalized).toBeGreaterThan(0.4);
      expect(g.rmsNormalized).toBeLessThan(1.6);
    }
    for (const [limit, offset] of [
      [0, 0],
      [10_001, 0],
      [5, -1],
    ] as const) {
      const bad = await post(app, '/api/fit', { stars, residualPage: { offset, limit } });
      expect(bad.status).toBe(422);
      const field = ((await bad.json()) as { error: { details: { field: string } } }).error.details
        .field;
      expect(field).toBe(offset < 0 ? 'residualPage.offset' : 'residualPage.limit');
    }
    const csv = await post(app, '/api/fit/residuals', { stars });
    expect(csv.status, await csv.clone().text()).toBe(200);
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/);
    const lines = (await csv.text()).trim().split('\n');
    expect(lines[0]).toBe(
      'star,index,id,kind,component,epoch,jd,residual_1,unit_1,residual_2,unit_2,normalized_1,normalized_2,outlier',
    );
    expect(lines.length).toBe(1 + measurements.length);
    // Line 1 + k is residual k, at full precision: the page's numbers exactly.
    const cells = lines[1 + 7]!.split(',');
    const seventh = body.residuals.find((x) => x.index === 7)!;
    expect(Number(cells[7])).toBe(seventh.residual[0]);
    expect(Number(cells[11])).toBe(seventh.normalized[0]);
  });

  it('documents the fit endpoints in the OpenAPI document', async () => {
    const doc = (await (
      await createApp({ store: undefined }).request('/api/openapi.json')
    ).json()) as { paths: Record<string, { post?: unknown }> };
    expect(doc.paths['/fit']?.post).toBeDefined();
  });
});

describe('fits of stored measurements (demo campaign)', () => {
  let dir: string;
  let store: Store;
  let lead: string;
  let viewer: string;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'epochwright-fit-'));
    const started = await startStore({
      url: `file:${join(dir, 'fit.db')}`,
      demo: true,
    });
    store = started.store;
    lead = started.firstLead!.secret;
    viewer = (
      await store.users.createWithToken(LOCAL_OPERATOR, { name: 'fit viewer', role: 'viewer' })
    ).secret;
  });
  afterAll(() => {
    store.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('previews a target fit, refuses accept to a viewer, stores it for a lead and keeps the old version', async () => {
    const app = createApp({ store });
    const targets = (await store.targets.list({})).items as { id: number; name: string }[];
    const s2 = targets.find((t) => t.name === 'Morrow')!;
    const preview = await post(app, `/api/targets/${s2.id}/fit`, {}, viewer);
    expect(preview.status, await preview.clone().text()).toBe(200);
    const pv = (await preview.json()) as {
      targets: { measurementIds: number[] }[];
      result: {
        reducedChi2: number;
        stars: { quantities: { name: string; value: number; sigma: number }[] }[];
      };
    };
    expect(pv.targets[0]!.measurementIds.length).toBeGreaterThan(7);
    // The demo's Morrow has P = 9.6 yr (server/store/demo/scenario.ts, invented).
    const p = pv.result.stars[0]!.quantities.find((q) => q.name === 'periodYears')!;
    expect(Math.abs(p.value - 9.6)).toBeLessThan(3 * p.sigma);
    expect((await post(app, `/api/targets/${s2.id}/fit/accept`, {}, viewer)).status).toBe(403);
    expect((await post(app, `/api/targets/${s2.id}/fit`, {})).status).toBe(401);

    const accepted = await post(
      app,
      `/api/targets/${s2.id}/fit/accept`,
      { notes: 'first fitted solution' },
      lead,
    );
    expect(accepted.status, await accepted.clone().text()).toBe(201);
    const acc = (await accepted.json()) as {
      solutions: {
        id: number;
        version: number;
        current: boolean;
        provenance: string;
        fittedFrom: number[];
        reference: string;
      }[];
    };
    expect(acc.solutions[0]!.current).toBe(true);
    expect(acc.solutions[0]!.provenance).toBe('fitted');
    expect(acc.solutions[0]!.fittedFrom).toEqual(pv.targets[0]!.measurementIds);
    expect(acc.solutions[0]!.reference).toMatch(/χ² = .* degrees of freedom/);
    const doc = (await (await app.request('/api/openapi.json')).json()) as {
      paths: Record<string, unknown>;
    };
    for (const path of [
      '/targets/{id}/fit',
      '/targets/{id}/fit/accept',
      '/targets/{id}/fit/residuals',
      '/systems/{id}/fit',
      '/systems/{id}/fit/accept',
      '/systems/{id}/fit/residuals',
    ])
      expect(Object.keys(doc.paths)).toContain(path);
    // Every stored residual as CSV, for a viewer; refused without a token.
    const csv = await post(app, `/api/targets/${s2.id}/fit/residuals`, {}, viewer);
    expect(csv.status, await csv.clone().text()).toBe(200);
    expect((await csv.text()).trim().split('\n').length).toBe(
      1 + pv.targets[0]!.measurementIds.length,
    );
    expect((await post(app, `/api/targets/${s2.id}/fit/residuals`, {})).status).toBe(401);
    const versions = (await store.orbitSolutions.list({})).items.filter(
      (v) => v.targetId === s2.id,
    );
    expect(versions.length).toBe(3); // the demo's entered and fitted versions, and this one
    expect(versions.filter((v) => v.current).map((v) => v.id)).toEqual([acc.solutions[0]!.id]);
    // The target's ephemeris now comes from the fitted solution, with its covariance.
    const eph = await app.request(
      `/api/targets/${s2.id}/ephemeris?start=2027-01-01T00:00:00Z&end=2027-02-01T00:00:00Z&step=P10D`,
      { headers: { authorization: `Bearer ${viewer}` } },
    );
    expect(eph.status, await eph.clone().text()).toBe(200);
    const ephBody = JSON.stringify(await eph.json());
    expect(ephBody).toContain(`"version":${acc.solutions[0]!.version}`);
  });

  it('fits a system jointly (some or all of its targets) and names a measurement that is not the target’s', async () => {
    const app = createApp({ store });
    const systems = (await store.systems.list({})).items as { id: number; name: string }[];
    const targets = (await store.targets.list({})).items as { id: number; name: string }[];
    const vesper = systems.find((s) => s.name === 'Vesper Core')!;
    const [s1, s2] = ['Ilex', 'Morrow'].map((n) => targets.find((t) => t.name === n)!.id);
    const res = await post(
      app,
      `/api/systems/${vesper.id}/fit`,
      { relativity: {}, targetIds: [s1, s2] },
      viewer,
    );
    expect(res.status, await res.clone().text()).toBe(200);
    const body = (await res.json()) as {
      targets: unknown[];
      result: { parameters: { name: string; value: number; sigma: number }[] };
    };
    expect(body.targets.length).toBe(2);
    const m = body.result.parameters.find((q) => q.name === 'massSolar')!;
    expect(Math.abs(m.value - 2e7)).toBeLessThan(3 * m.sigma); // scenario.ts: Vesper Core, 2 × 10⁷ M☉ (invented)
    // All four stars, started from their current solutions as well as from the search: the two on 30–50-year
    // orbits seen for seven years add little, but the shared mass and distance still come out.
    const all = await post(app, `/api/systems/${vesper.id}/fit`, { relativity: {} }, viewer);
    expect(all.status, await all.clone().text()).toBe(200);
    const allBody = (await all.json()) as {
      targets: unknown[];
      result: { parameters: { name: string; value: number; sigma: number }[] };
    };
    expect(allBody.targets.length).toBe(4);
    const m4 = allBody.result.parameters.find((q) => q.name === 'massSolar')!;
    const d4 = allBody.result.parameters.find((q) => q.name === 'distancePc')!;
    expect(Math.abs(m4.value - 2e7)).toBeLessThan(3 * m4.sigma); // scenario.ts (invented)
    expect(Math.abs(d4.value - 15_000)).toBeLessThan(3 * d4.sigma); // scenario.ts: 15 000 pc (invented)
    const wrong = await post(app, `/api/targets/${s1}/fit`, { measurementIds: [999999] }, viewer);
    expect(wrong.status).toBe(422);
    expect(
      ((await wrong.json()) as { error: { details: { field: string } } }).error.details.field,
    ).toBe('measurementIds.0');
  });
});
