/**
 * Fits of many measurements search on an even subset and refine the best minimum on all of them
 * (solve.ts, COARSE_EPOCHS). The answer must be the full path's: the same minimum, the same σ.
 * The orbits are invented demo values; the reference is the fit without the subset (constructed case).
 */
import { describe, expect, it } from 'vitest';
import { checkRequest } from '../../../../server/science/orbit/fit/request.ts';
import { COARSE_EPOCHS, solveStar, thinned } from '../../../../server/science/orbit/fit/solve.ts';
import { COST_BOUNDS } from '../../../../server/jobs/cost.ts';
import { FitRefusal, fitOrbits } from '../../../../server/science/orbit/fit/index.ts';
import {
  epochExtent,
  readMeasurements,
} from '../../../../server/science/orbit/fit/measurements.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const truth = {
  elements: {
    periodYears: 12,
    periapsis: 'J2020.7',
    eccentricity: 0.8,
    semiMajorAxisArcsec: 0.11,
    inclinationDeg: 115,
    ascendingNodeDeg: 70,
    argPeriapsisDeg: 300,
  },
  distancePc: 14_200,
  systemicVelocityKmS: 3,
};

function request(nAst: number, nRv: number) {
  const r = new SeededRandom(31);
  const measurements = simulate(
    truth,
    {
      astrometryJd: epochs(2456000.5, 11 * 365.25, nAst, r, 5),
      sigmaMas: 0.5,
      velocityJd: epochs(2456100.5, 10 * 365.25, nRv, r, 5),
      sigmaRadialVelocityKmS: 15,
    },
    32,
  );
  return checkRequest({
    stars: [{ name: 'Vela-9', measurements, hints: { periodYears: { min: 10, max: 14 } } }],
  });
}

describe('the coarse start of a large fit', () => {
  it('reads 200,000 epochs (the cost bound) without overflowing the stack', () => {
    // All on one night: refused as single-phase, after the span of every epoch was taken.
    const one = {
      kind: 'offsets',
      dRaMas: 1,
      dDecMas: 2,
      sigmaDRaMas: 1,
      sigmaDDecMas: 1,
    } as const;
    const measurements = Array.from({ length: 200_000 }, (_, k) => ({
      ...one,
      epoch: 2460000.5 + k * 1e-9,
    }));
    expect(COST_BOUNDS.fitMeasurements).toBe(200_000);
    expect(epochExtent(measurements.map((m) => m.epoch))).toEqual({
      first: 2460000.5,
      last: 2460000.5 + 199_999e-9,
    });
    expect(() => fitOrbits({ stars: [{ name: 'Vela-9', measurements }] })).toThrow(FitRefusal);
  });

  it('keeps every kind and the whole time span in the subset', () => {
    const obs = readMeasurements(
      simulate(
        truth,
        {
          astrometryJd: epochs(2456000.5, 3000, 3000, new SeededRandom(1), 0),
          sigmaMas: 0.5,
          velocityJd: epochs(2456000.5, 3000, 30, new SeededRandom(2), 0),
          sigmaRadialVelocityKmS: 15,
        },
        3,
      ),
      'm',
    );
    const sub = thinned(obs, 300);
    const rv = sub.filter((m) => m.kind === 'radial-velocity');
    expect(rv.length).toBe(20); // at least 20 of a kind (or all of them): the layout stays the same
    expect(sub.length - rv.length).toBe(297); // 300 × 3000/3030, rounded (constructed case)
    const jd = sub.filter((m) => m.kind !== 'radial-velocity').map((m) => m.jd);
    expect(Math.min(...jd) - 2456000.5).toBeLessThan(10); // evenly spread: ends within one stride
    expect(2456000.5 + 3000 - Math.max(...jd)).toBeLessThan(10);
  });

  it('reaches the full path’s minimum, values and σ to 1e-3 σ', () => {
    const req = request(2400, 800);
    expect(req.stars[0]!.obs.length).toBeGreaterThan(COARSE_EPOCHS);
    const coarse = solveStar(req, req.stars[0]!, true);
    const full = solveStar(req, req.stars[0]!, true, true, 'analytic', Infinity);
    // Both are converged LM minima of the same χ²: they agree to its tolerance (1e-4 in χ², lm.ts).
    expect(Math.abs(coarse.lm.chi2 - full.lm.chi2)).toBeLessThan(1e-3);
    const sigma = full.covariance.map((row, j) => Math.sqrt(row[j]!));
    let worst = 0;
    full.problem.free.forEach((idx, j) => {
      worst = Math.max(worst, Math.abs(coarse.theta[idx]! - full.theta[idx]!) / sigma[j]!);
    });
    console.log(
      `coarse start vs full path: worst parameter difference ${worst.toExponential(2)} σ`,
    );
    expect(worst).toBeLessThan(1e-3);
    for (const [j, row] of coarse.covariance.entries())
      expect(Math.abs(Math.sqrt(row[j]!) / sigma[j]! - 1)).toBeLessThan(1e-3);
  });
});
