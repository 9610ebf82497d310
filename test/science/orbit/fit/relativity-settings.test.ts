/**
 * A fit says which relativistic terms were on and why, a joint fit keeps each star's own switches,
 * and a Newtonian fit of data that can see the terms warns. Invented system (demo values, not check
 * values): 6 × 10⁶ M☉ at 10 kpc.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type StarInput } from '../../../../server/science/orbit/fit/index.ts';
import type { OrbitInput } from '../../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const J2022 = 2459580.5;

function star(name: string, periodYears: number, aArcsec: number, e: number, seed: number) {
  const truth: OrbitInput = {
    elements: {
      periodYears,
      periapsis: 'J2027.0',
      eccentricity: e,
      semiMajorAxisArcsec: aArcsec,
      inclinationDeg: 60,
      ascendingNodeDeg: 100,
      argPeriapsisDeg: 30 + seed,
    },
    distancePc: 10_000,
    systemicVelocityKmS: 0,
    relativity: { gravitationalRedshift: true, transverseDoppler: true, precession: true },
  };
  const r = new SeededRandom(seed);
  const measurements = simulate(
    truth,
    {
      astrometryJd: epochs(J2022 - 3 * 365.25, 14 * 365.25, 40, r, 20),
      sigmaMas: 0.1,
      velocityJd: epochs(J2022 - 3 * 365.25, 14 * 365.25, 30, r, 20),
      sigmaRadialVelocityKmS: 10,
    },
    seed + 1,
  );
  return {
    name,
    measurements,
    hints: { periodYears: { min: periodYears * 0.9, max: periodYears * 1.1 } },
  } satisfies StarInput;
}

describe('relativity settings of a fit', () => {
  it('says a default fit is Newtonian and warns when the terms exceed the precision', () => {
    const fit = fitOrbits({ stars: [star('Wren', 10, 0.0843, 0.9, 3)] });
    expect(fit.relativity.terms.gravitationalRedshift).toBe(false);
    expect(fit.relativity.reasons.gravitationalRedshift).toMatch(/^off: not asked for/);
    expect(fit.warnings.join('\n')).toMatch(/star Wren: fitted without the gravitational redshift/);
    expect(fit.warnings.join('\n')).toMatch(
      /star Wren: fitted without the Schwarzschild precession/,
    );
  });

  it("keeps each star's own switches in a joint fit", () => {
    const a = { ...star('Wren', 10, 0.0843, 0.9, 3), relativity: { precession: true } };
    const b = star('Finch', 16, 0.1156, 0.5, 9);
    const fit = fitOrbits({
      stars: [a, b],
      relativity: { gravitationalRedshift: true, transverseDoppler: true },
      relativityOrigin: 'the test',
    });
    const [wren, finch] = fit.relativity.stars;
    expect(wren!.terms).toEqual({
      romer: false,
      gravitationalRedshift: true,
      transverseDoppler: true,
      precession: true,
    });
    expect(wren!.reasons.precession).toBe("on: the star's own switches (the test)");
    expect(finch!.terms.precession).toBe(false);
    expect(finch!.reasons.gravitationalRedshift).toBe('on: the test');
    expect(fit.stars[0]!.orbit.relativity?.precession).toBe(true);
    expect(fit.stars[1]!.orbit.relativity?.precession).toBe(false);
  });

  it('refuses a star switch that is not one, naming the field', () => {
    const s = { ...star('Wren', 10, 0.0843, 0.9, 3), relativity: { lensing: true } as never };
    expect(() => fitOrbits({ stars: [s] })).toThrow(/stars\.0\.relativity\.lensing/);
  });
});
