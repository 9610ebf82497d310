/**
 * Fitted relativity factors: simulated data of a deep orbit with factor 1 (general relativity)
 * recover 1 within the reported σ over seeded realizations, and Newtonian data recover 0; the pulls
 * z = (fitted − truth)/σ must look like draws of a unit normal. Invented system (demo values, not
 * check values): 6 × 10⁶ M☉ at 10 kpc, P = 10 yr, e = 0.9; 60 offsets at 0.05 mas over 16 years,
 * 30 velocities at 10 km/s and 12 more in the four months around periapsis.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type FitResult } from '../../../../server/science/orbit/fit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { DEEP_PERIAPSIS_JD, deepStar } from './deep-star.ts';
import { epochs, simulate } from './simulate.ts';

const J2022 = 2459580.5;
const PERIAPSIS_JD = DEEP_PERIAPSIS_JD;
const truth = deepStar;

function fitOnce(factor: number, seed: number): FitResult {
  const r = new SeededRandom(seed);
  const measurements = simulate(
    truth(factor),
    {
      astrometryJd: epochs(J2022 - 4 * 365.25, 16 * 365.25, 60, r, 30),
      sigmaMas: 0.05,
      velocityJd: [
        ...epochs(J2022 - 4 * 365.25, 16 * 365.25, 30, r, 30),
        ...epochs(PERIAPSIS_JD - 60, 120, 12, r, 2),
      ],
      sigmaRadialVelocityKmS: 10,
    },
    seed + 1000,
  );
  return fitOrbits({
    stars: [{ name: 'Wren', measurements, hints: { periodYears: { min: 9.5, max: 10.5 } } }],
    freeFactors: ['redshiftFactor', 'precessionFactor'],
  });
}

function pulls(factor: number, seeds: number[]) {
  const z: Record<string, number[]> = { redshiftFactor: [], precessionFactor: [] };
  for (const seed of seeds) {
    const fit = fitOnce(factor, seed);
    for (const f of fit.relativity.factors) z[f.name]!.push((f.value - factor) / f.sigma);
  }
  return Object.entries(z).map(([name, zs]) => {
    const mean = zs.reduce((a, b) => a + b, 0) / zs.length;
    const rms = Math.sqrt(zs.reduce((a, b) => a + b * b, 0) / zs.length);
    const worst = Math.max(...zs.map(Math.abs));
    console.log(
      `factor ${factor}, ${name}: ${zs.length} fits, mean z ${mean.toFixed(2)}, rms z ${rms.toFixed(2)}, worst |z| ${worst.toFixed(2)}`,
    );
    return { name, mean, rms, worst, n: zs.length };
  });
}

describe('relativity factors fitted with their σ', () => {
  it('reports both factors, their significance against 0 and 1, and the terms they switch on', () => {
    const fit = fitOnce(1, 7);
    expect(fit.relativity.terms).toEqual({
      romer: false,
      gravitationalRedshift: true,
      transverseDoppler: true,
      precession: true,
    });
    expect(fit.relativity.reasons.precession).toMatch(/precession factor is fitted/);
    for (const f of fit.relativity.factors) {
      expect(f.fitted).toBe(true);
      expect(f.detectionSigma).toBeCloseTo(Math.abs(f.value) / f.sigma, 12);
      expect(f.departureFromGrSigma).toBeCloseTo(Math.abs(f.value - 1) / f.sigma, 12);
      expect(f.detectionSigma).toBeGreaterThan(5); // this plan detects both (see the forecast)
    }
    expect(fit.stars[0]!.orbit.relativityFactors).toBeDefined();
  });

  // Pull checks (common practice, no source): for N unit-normal pulls the mean has σ = 1/√N and
  // the rms has σ ≈ √(1/(2N)) about 1; we allow 3.5σ on each (rms 0.38–1.62 for N = 16, 0.12–1.88
  // for N = 8) and no |z| > 4. Run by hand over 40 realizations: rms 1.08 (precession), 0.88 (redshift).
  for (const [factor, seeds] of [
    [1, Array.from({ length: 16 }, (_, k) => 11 + 17 * k)],
    [0, Array.from({ length: 8 }, (_, k) => 5 + 23 * k)],
  ] as const) {
    it(`recovers factor ${factor} within the reported σ over ${seeds.length} realizations`, () => {
      for (const p of pulls(factor, [...seeds])) {
        expect(Math.abs(p.mean)).toBeLessThan(3.5 / Math.sqrt(p.n));
        expect(Math.abs(p.rms - 1)).toBeLessThan(3.5 * Math.sqrt(1 / (2 * p.n)));
        expect(p.worst).toBeLessThan(4);
      }
    });
  }

  it('refuses an unknown factor, naming the field', () => {
    expect(() =>
      fitOrbits({
        stars: [{ name: 'Wren', measurements: [] }],
        freeFactors: ['lightBending' as 'redshiftFactor'],
      }),
    ).toThrow(/freeFactors\.0/);
  });
});
