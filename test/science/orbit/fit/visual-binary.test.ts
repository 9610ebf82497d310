/**
 * A fitted orbit predicts what its elements predict: measurements simulated from the elements of
 * Meeus's visual binary example, fitted, then the fitted orbit's prediction for 1980.0 compared
 * with the book's θ and ρ.
 */
import { describe, expect, it } from 'vitest';
import { linearSigma, predict, validateOrbit } from '../../../../server/science/orbit/index.ts';
import { fitOrbits } from '../../../../server/science/orbit/fit/index.ts';
import { parseEpoch } from '../../../../server/science/time/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { MEEUS_57A } from '../../../fixtures/orbits.ts';
import { epochs, simulate } from './simulate.ts';

const J1980 = parseEpoch('J1980.0');
// Meeus, Astronomical Algorithms, 2nd ed., Example 57.a (from memory): at 1980.0 θ = 318.42°, ρ = 0.4110″.
const THETA_DEG = 318.42;
const RHO_MAS = 411.0;

function fitFrom(sigmaMas: number, seed: number) {
  // Separations and position angles over 1935–1975 (about one period), as a visual observer would have them.
  const jd = epochs(parseEpoch('J1935.0'), 40 * 365.25, 40, new SeededRandom(seed), 30);
  const measurements = simulate(MEEUS_57A, { astrometryJd: jd, sigmaMas, polar: true }, seed + 1);
  const result = fitOrbits({
    stars: [{ name: 'B57', measurements, hints: { periodYears: { min: 30, max: 60 } } }],
  });
  return { result, orbit: validateOrbit(result.stars[0]!.orbit) };
}

describe('fitted visual binary reproduces Meeus Example 57.a', () => {
  it('with measurements of negligible error: θ and ρ at 1980.0 to the book’s last digit', () => {
    const { result, orbit } = fitFrom(0.01, 57);
    const p = predict(orbit, J1980);
    console.log(
      `57.a from a fit (σ = 0.01 mas): θ = ${p.positionAngleDeg.toFixed(4)}°, ρ = ${p.separationMas.toFixed(3)} mas, χ²/dof = ${result.reducedChi2!.toFixed(3)}`,
    );
    expect(Math.abs(p.positionAngleDeg - THETA_DEG)).toBeLessThan(0.01);
    expect(Math.abs(p.separationMas - RHO_MAS)).toBeLessThan(0.1);
  });

  it('with 5 mas errors: the book’s θ and ρ lie within 3σ of the fitted prediction', () => {
    const { result, orbit } = fitFrom(5, 1957);
    const p = predict(orbit, J1980);
    const [sTheta, sRho] = linearSigma(
      orbit,
      (o) => {
        const q = predict(o, J1980);
        return [q.positionAngleDeg, q.separationMas];
      },
      new Set([0]),
    );
    console.log(
      `57.a from a fit (σ = 5 mas): θ = ${p.positionAngleDeg.toFixed(2)} ± ${sTheta!.toFixed(2)}°, ρ = ${p.separationMas.toFixed(1)} ± ${sRho!.toFixed(1)} mas, χ²/dof = ${result.reducedChi2!.toFixed(3)}`,
    );
    expect(Math.abs(p.positionAngleDeg - THETA_DEG)).toBeLessThan(3 * sTheta!);
    expect(Math.abs(p.separationMas - RHO_MAS)).toBeLessThan(3 * sRho!);
    expect(sRho!).toBeLessThan(5); // the fit sharpens: 40 epochs beat one
  });
});
