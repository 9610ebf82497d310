/**
 * The analytic Jacobian of the fit against central finite differences of the same residuals, for
 * every orientation form and measurement kind. Tolerance: 1e-5 of the column's largest entry
 * (central differences with steps of ~1e-7 relative are good to ~1e-8 here; common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { checkRequest } from '../../../../server/science/orbit/fit/request.ts';
import { build } from '../../../../server/science/orbit/fit/solve.ts';
import {
  finiteDifferenceProblem,
  makeProblem,
} from '../../../../server/science/orbit/fit/problem.ts';
import type { FitRequest } from '../../../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const J2020 = 2458849.5;
const rng = new SeededRandom(7);
const star = (
  name: string,
  periodYears: number,
  e: number,
  iDeg: number,
  withRv: boolean,
  polar = false,
) => ({
  name,
  measurements: simulate(
    {
      elements: {
        periodYears,
        periapsis: 'J2021.3',
        eccentricity: e,
        semiMajorAxisArcsec: 0.1 * periodYears ** (2 / 3),
        inclinationDeg: iDeg,
        ascendingNodeDeg: 130,
        argPeriapsisDeg: 250,
      },
      distancePc: 16_000,
      systemicVelocityKmS: 12,
    },
    {
      astrometryJd: epochs(J2020, 3000, 12, rng, 20),
      sigmaMas: 0.5,
      polar,
      correlation: polar ? 0 : 0.3,
      ...(withRv
        ? { velocityJd: epochs(J2020 + 100, 2500, 8, rng, 10), sigmaRadialVelocityKmS: 8 }
        : {}),
    },
    11,
  ),
});

function worstRelativeError(request: FitRequest): number {
  const req = checkRequest(request);
  const b = build(req, req.stars, true);
  // Evaluate away from the truth so no residual is special: every element moved a little.
  const theta = new Float64Array(b.L.params.length);
  const truthish: Record<string, number> = {
    periodYears: 9.1 * 365.25,
    periapsisDays: 2459300,
    eccentricity: 0.62,
    semiMajorAxisArcsec: 450,
    inclinationDeg: 1.1,
    ascendingNodeDeg: 2.2,
    argPeriapsisDeg: 4.5,
    aArcsec: -120,
    bArcsec: 300,
    fArcsec: 210,
    gArcsec: 90,
    distancePc: 16_050,
    massSolar: 1.8e7,
    systemicVelocityKmS: 10,
    offsetRaMas: 0.3,
    offsetDecMas: -0.2,
    driftRaMasYr: 0.05,
    driftDecMasYr: -0.04,
    massRatio: 0.6,
    lightFraction: 0.2,
  };
  b.L.params.forEach((p, j) => {
    theta[j] = truthish[p.key]! * (1 + 0.01 * (j % 3));
  });
  const analytic = makeProblem(b.L, theta, b.free, b.priors);
  const numeric = finiteDifferenceProblem(analytic);
  const x = Float64Array.from(b.free, (j) => theta[j]!);
  const Ja = analytic.evaluate(x, true).J!,
    Jn = numeric.evaluate(x, true).J!;
  const n = analytic.n,
    rows = analytic.rows;
  let worst = 0;
  for (let j = 0; j < n; j++) {
    let colMax = 0,
      diffMax = 0;
    for (let i = 0; i < rows; i++) {
      colMax = Math.max(colMax, Math.abs(Jn[i * n + j]!));
      diffMax = Math.max(diffMax, Math.abs(Ja[i * n + j]! - Jn[i * n + j]!));
    }
    worst = Math.max(worst, diffMax / colMax);
  }
  return worst;
}

describe('fit derivatives against central finite differences', () => {
  const cases: [string, FitRequest][] = [
    [
      'Thiele–Innes form, correlated offsets, frame offset and drift',
      { stars: [star('A', 9, 0.6, 60, false)], frame: { offset: true, drift: true } },
    ],
    [
      'Campbell form with radial velocities (distance, γ)',
      { stars: [star('B', 9, 0.6, 60, true)] },
    ],
    [
      'velocities of both bodies about the barycentre (mass ratio q)',
      {
        stars: [
          {
            name: 'H',
            measurements: star('H', 9, 0.6, 60, true).measurements.map((m, k) =>
              m.kind === 'radial-velocity'
                ? { ...m, component: k % 2 ? 'primary' : 'secondary' }
                : m,
            ),
          },
        ],
      },
    ],
    [
      'photocentre offsets with both bodies (mass ratio q, light fraction β), frame offset',
      {
        stars: [
          {
            name: 'J',
            measurements: star('J', 9, 0.6, 60, true).measurements.map((m, k) =>
              m.kind === 'radial-velocity'
                ? { ...m, component: k % 2 ? 'primary' : 'secondary' }
                : m.kind === 'offsets' && k % 3 === 0
                  ? { ...m, component: 'photocentre' }
                  : m,
            ),
          },
        ],
        frame: { offset: true },
      },
    ],
    ['separation and position angle', { stars: [star('C', 9, 0.6, 60, true, true)] }],
    [
      'joint fit: shared mass and distance, a from Kepler’s third law',
      {
        stars: [
          star('D', 9, 0.6, 60, true),
          star('E', 14, 0.3, 120, true),
          star('F', 6, 0.85, 40, false),
        ],
      },
    ],
    [
      'relativistic terms switched on (Keplerian part analytic, correction by differences)',
      {
        stars: [star('G', 9, 0.6, 60, true)],
        relativity: {
          romer: true,
          gravitationalRedshift: true,
          transverseDoppler: true,
          precession: true,
        },
      },
    ],
  ];
  for (const [name, request] of cases) {
    it(name, () => {
      const worst = worstRelativeError(request);
      console.log(
        `derivatives, ${name}: worst |analytic − numeric| / column max = ${worst.toExponential(2)}`,
      );
      expect(worst).toBeLessThan(1e-5);
    });
  }
});
