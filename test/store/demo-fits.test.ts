/**
 * The demo's kept fits (server/store/demo/kept-fits.ts, written by `npm run demo-fits`) are the
 * orbit engine's fits of the demo's own measurements, so they cannot go stale silently. Constructed
 * case: the reference is the same fit run now, on the measurements of a fresh load.
 * - At the anchor day they were made for, they equal a fit run now (to the stored periapsis's
 *   rounding, 1e-6 d).
 * - At an anchor 0.4 year later the scenario shifts as a whole, but each night's blocks follow that
 *   night's darkness (epochs move by minutes) and the Moon closes other blocks: a star whose
 *   measurements are still the kept fit's (epochs within 0.05 d, values within 0.05σ) keeps it, the
 *   others are fitted at load, and the result agrees with fits run now within 0.05σ per parameter
 *   and 2 % in σ.
 */
import { describe, expect, it } from 'vitest';
import { JULIAN_YEAR_DAYS } from '../../server/science/constants.ts';
import type { OrbitInput } from '../../server/science/orbit/index.ts';
import { parseEpoch } from '../../server/science/time/index.ts';
import { KEPT_FITS } from '../../server/store/demo/kept-fits.ts';
import { DESIGNED_ON } from '../../server/store/demo/scenario.ts';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';

/** Stars whose current solution at the last load was a kept fit (not one run at load). */
let keptAtLastLoad: string[] = [];

/** The current solution of every demo star, loaded at `now` with kept or fresh fits. */
async function currentOrbits(now: string, fitNow: boolean): Promise<Map<string, OrbitInput>> {
  const database = await openDatabase({ url: ':memory:' });
  try {
    const store = createStore(database);
    await store.loadDemo(LOCAL_OPERATOR, { now, fitNow });
    const names = new Map(
      (await store.targets.list({}, { limit: 100 })).items.map((t) => [t.id, t.name]),
    );
    const current = await store.orbitSolutions.list({ current: true }, { limit: 100 });
    keptAtLastLoad = current.items
      .filter((s) => s.reference.startsWith('demo fit, kept'))
      .map((s) => names.get(s.targetId)!);
    return new Map(current.items.map((s) => [names.get(s.targetId)!, s.orbit]));
  } finally {
    database.close();
  }
}

/** A covariance parameter's value in an orbit input (periapsisDays as a Julian Date). */
function parameterValue(orbit: OrbitInput, p: string): number {
  if (p === 'periapsisDays') return parseEpoch(orbit.elements.periapsis);
  if (p === 'distancePc') return orbit.distancePc!;
  if (p === 'systemicVelocityKmS') return orbit.systemicVelocityKmS ?? 0; // absent: γ held at 0
  if (p === 'massRatio') return orbit.massRatio!;

  return (orbit.elements as unknown as Record<string, number>)[p]!;
}

/** Every parameter's difference in σ of the kept solution, and the ratio of the σ. */
function compare(kept: Map<string, OrbitInput>, fresh: Map<string, OrbitInput>) {
  expect([...kept.keys()].sort()).toEqual([...fresh.keys()].sort());
  const rows: { star: string; p: string; inSigma: number; sigmaRatio: number }[] = [];
  for (const [star, k] of kept) {
    const f = fresh.get(star)!;
    const cov = k.covariance!;
    expect(f.covariance!.parameters).toEqual(cov.parameters);
    cov.parameters.forEach((p, i) => {
      const sigma = Math.sqrt(cov.matrix[i]![i]!);
      const freshSigma = Math.sqrt(f.covariance!.matrix[i]![i]!);
      const d = Math.abs(parameterValue(k, p) - parameterValue(f, p));
      // A parameter held fixed (σ 0) must be the same number.
      const inSigma = sigma > 0 ? d / sigma : d;
      rows.push({ star, p, inSigma, sigmaRatio: sigma > 0 ? freshSigma / sigma : 1 });
    });
  }
  expect(rows.length).toBeGreaterThan(30); // 6 stars, 7 to 10 parameters each
  return rows;
}

const worst = (rows: ReturnType<typeof compare>) =>
  rows.reduce((w, r) => (r.inSigma > w.inSigma ? r : w));

describe('the kept demo fits', () => {
  it('were made at the scenario’s own anchor day', () => {
    expect(KEPT_FITS.anchorDay).toBe(DESIGNED_ON);
  });

  it('equal a fit run now at that anchor', async () => {
    const now = `${KEPT_FITS.anchorDay}T12:00:00Z`;
    const kept = await currentOrbits(now, false);
    expect(keptAtLastLoad.length).toBe(6); // every star's kept fit is used: no fit at load
    const rows = compare(kept, await currentOrbits(now, true));
    expect(keptAtLastLoad).toEqual([]);
    const w = worst(rows);
    console.log(`kept vs fresh at ${now}: worst ${w.star}.${w.p} ${w.inSigma.toExponential(1)} σ`);
    for (const r of rows) {
      expect(r.inSigma, `${r.star}.${r.p}`).toBeLessThan(1e-6);
      expect(Math.abs(r.sigmaRatio - 1), `${r.star}.${r.p} σ`).toBeLessThan(1e-9);
    }
  });

  it('agree with a fit run now at an anchor 0.4 year later', async () => {
    const later = new Date(
      Date.parse(`${KEPT_FITS.anchorDay}T12:00:00Z`) + 0.4 * JULIAN_YEAR_DAYS * 86_400_000,
    ).toISOString();
    const loaded = await currentOrbits(later, false);
    const kept = keptAtLastLoad;
    const rows = compare(loaded, await currentOrbits(later, true));
    const w = worst(rows);
    const ratio = rows.reduce((m, r) => Math.max(m, Math.abs(r.sigmaRatio - 1)), 0);
    console.log(
      `kept vs fresh at ${later} (kept: ${kept.join(', ') || 'none'}): worst ${w.star}.${w.p} ${w.inSigma.toFixed(4)} σ, σ within ${(100 * ratio).toFixed(2)} %`,
    );
    for (const r of rows) {
      expect(r.inSigma, `${r.star}.${r.p}`).toBeLessThan(0.05);
      expect(Math.abs(r.sigmaRatio - 1), `${r.star}.${r.p} σ`).toBeLessThan(0.02);
    }
  });
});
