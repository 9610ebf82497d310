/**
 * `hints.startOnly`: one Levenberg–Marquardt run from `hints.start`, no search. Its use is a refit
 * after a few measurements changed (the demo at load), so the check is constructed that way: fit a
 * data set by the full search, drop a few measurements and add a few, and refit the new set both by
 * the full search and from the first solution alone. Both must reach the same minimum, with the same
 * covariance. Orbits are invented demo values (the recovery classes and a double-lined binary).
 */
import { describe, expect, it } from 'vitest';
import {
  fitOrbits,
  type FitResult,
  type MeasurementInput,
  type StarHints,
} from '../../../../server/science/orbit/fit/index.ts';
import { InputError } from '../../../../server/science/errors.ts';
import { toCampbellInput, validateOrbit } from '../../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { simulateBinary } from './binary-simulate.ts';
import { CLASSES } from './classes.ts';
import { epochs } from './simulate.ts';

/** A fit's solution as a start. */
function startOf(r: FitResult): NonNullable<StarHints['start']> {
  const o = r.stars[0]!.orbit;
  return {
    elements: toCampbellInput(validateOrbit(o)),
    ...(o.distancePc !== undefined ? { distancePc: o.distancePc } : {}),
    ...(o.systemicVelocityKmS !== undefined ? { systemicVelocityKmS: o.systemicVelocityKmS } : {}),
    ...(o.massRatio !== undefined ? { massRatio: o.massRatio } : {}),
  };
}

const fitStar = (measurements: MeasurementInput[], hints: StarHints, relativity = false) =>
  fitOrbits({
    stars: [{ name: 'X', measurements, hints }],
    ...(relativity ? { relativity: { gravitationalRedshift: true, precession: true } } : {}),
  });

/** Every parameter's difference in σ, and the worst relative difference of the σ. */
function agreement(a: FitResult, b: FitResult) {
  expect(b.covariance.parameters).toEqual(a.covariance.parameters);
  let inSigma = 0;
  let sigmaRatio = 0;
  a.parameters.forEach((p, k) => {
    const q = b.parameters[k]!;
    if (p.sigma === 0) return;
    inSigma = Math.max(inSigma, Math.abs(p.value - q.value) / p.sigma);
    sigmaRatio = Math.max(sigmaRatio, Math.abs(q.sigma / p.sigma - 1));
  });
  return { inSigma, sigmaRatio };
}

/** Two invented double-lined binary data sets (q = 0.6, 3.6 M☉ at 31.5 pc). */
function binary(seed: number): MeasurementInput[] {
  const truth = {
    elements: {
      periodYears: 6,
      periapsis: 'J2019.3',
      eccentricity: 0.45,
      semiMajorAxisArcsec: 0.1611,
      inclinationDeg: 62,
      ascendingNodeDeg: 130,
      argPeriapsisDeg: 75,
    },
    distancePc: 31.5,
    systemicVelocityKmS: 12,
  };
  const r = new SeededRandom(seed);
  const j0 = 2457023.5;
  return simulateBinary(
    truth,
    0.6,
    {
      astrometryJd: epochs(j0, 8 * 365.25, 24, r, 20),
      sigmaMas: 1,
      primaryJd: epochs(j0 + 50, 7 * 365.25, 16, r, 20),
      secondaryJd: epochs(j0 + 80, 7 * 365.25, 16, r, 20),
      sigmaKmS: 0.5,
    },
    seed + 1,
  );
}

const cases: [string, () => MeasurementInput[], StarHints, boolean][] = [
  [
    'astrometry only (Thiele–Innes)',
    () => CLASSES.circular!.measurements(5),
    CLASSES.circular!.hints,
    false,
  ],
  [
    'astrometry and velocities',
    () => CLASSES.eccentric!.measurements(5),
    CLASSES.eccentric!.hints,
    false,
  ],
  [
    'a star around a compact object, relativity on',
    () => CLASSES.covered!.measurements(5),
    CLASSES.covered!.hints,
    true,
  ],
  [
    'a double-lined binary (mass ratio)',
    () => binary(11),
    { periodYears: { min: 4, max: 9 } },
    false,
  ],
];

describe('a fit from a given start alone', () => {
  it.each(cases)(
    'reaches the search’s minimum after a few measurements change: %s',
    (_, make, hints, rel) => {
      const all = make();
      // The first set lacks the last three measurements; the second lacks the first two.
      const before = fitStar(all.slice(0, -3), hints, rel);
      const after = all.slice(2);
      const searched = fitStar(after, hints, rel);
      const started = fitStar(after, { start: startOf(before), startOnly: true }, rel);
      const { inSigma, sigmaRatio } = agreement(searched, started);
      console.log(
        `${_}: from the earlier fit, worst ${inSigma.toExponential(1)} σ, σ within ${(100 * sigmaRatio).toExponential(1)} %, ${started.iterations} iterations`,
      );
      // Tolerances: the LM's own convergence (a relative drop in χ² below its tolerance), far below 1σ.
      expect(started.converged).toBe(true);
      expect(Math.abs(started.chi2 - searched.chi2)).toBeLessThan(
        1e-3 * Math.max(1, searched.chi2),
      );
      expect(inSigma).toBeLessThan(0.01);
      expect(sigmaRatio).toBeLessThan(0.01);
    },
  );

  it('runs no search: from a start at half the period it stays in that start’s basin', () => {
    const c = CLASSES.eccentric!;
    const m = c.measurements(5);
    const searched = fitStar(m, c.hints);
    const el = toCampbellInput(validateOrbit(c.truth));
    const start = {
      elements: { ...el, periodYears: el.periodYears / 2 },
      distancePc: c.truth.distancePc!,
      systemicVelocityKmS: c.truth.systemicVelocityKmS!,
    };
    const stuck = fitStar(m, { start, startOnly: true });
    const withSearch = fitStar(m, { ...c.hints, start });
    console.log(
      `start at P/2: χ² ${stuck.chi2.toFixed(1)} from it alone, ${withSearch.chi2.toFixed(1)} with the search (${searched.chi2.toFixed(1)} by the search alone)`,
    );
    expect(stuck.chi2).toBeGreaterThan(10 * searched.chi2);
    expect(withSearch.chi2).toBeCloseTo(searched.chi2, 3);
  });

  it('needs a start, and says so by name', () => {
    const m = CLASSES.circular!.measurements(5);
    expect(() => fitStar(m, { startOnly: true })).toThrow(InputError);
    expect(() => fitStar(m, { startOnly: true })).toThrow(/stars\.0\.hints\.startOnly/);
    expect(() => fitStar(m, { startOnly: 'yes' as unknown as boolean })).toThrow(
      /must be true or false/,
    );
  });
});
