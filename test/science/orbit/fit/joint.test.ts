/**
 * Several stars around one primary share its mass, distance, velocity and frame: a joint fit of
 * three stars must pin the mass down better than any one of them and recover the invented mass and
 * distance (demo values, not check values) within 3σ.
 */
import { describe, expect, it } from 'vitest';
import { fitOrbits, type StarInput } from '../../../../server/science/orbit/fit/index.ts';
import type { OrbitInput } from '../../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const MASS = 3.2e7; // M☉, invented
const DISTANCE = 16_000; // pc, invented
const J2015 = 2457023.5;

function star(
  name: string,
  periodYears: number,
  periapsis: string,
  e: number,
  i: number,
  node: number,
  arg: number,
  seed: number,
): { input: StarInput; truth: OrbitInput } {
  const aArcsec = Math.cbrt(MASS * periodYears ** 2) / DISTANCE; // Kepler's third law: a[au]³ = M P²
  const truth: OrbitInput = {
    elements: {
      periodYears,
      periapsis,
      eccentricity: e,
      semiMajorAxisArcsec: aArcsec,
      inclinationDeg: i,
      ascendingNodeDeg: node,
      argPeriapsisDeg: arg,
    },
    distancePc: DISTANCE,
    systemicVelocityKmS: 0,
  };
  const r = new SeededRandom(seed);
  const measurements = simulate(
    truth,
    {
      astrometryJd: epochs(J2015, 12 * 365.25, 24, r, 20),
      sigmaMas: 0.4,
      velocityJd: epochs(J2015 + 50, 11.5 * 365.25, 12, r, 20),
      sigmaRadialVelocityKmS: 12,
    },
    seed + 1,
  );
  return {
    input: {
      name,
      measurements,
      hints: { periodYears: { min: periodYears * 0.8, max: periodYears * 1.25 } },
    },
    truth,
  };
}

describe('joint fit of three stars around one primary', () => {
  const stars = [
    star('Kestra-1', 12, 'J2019.0', 0.85, 120, 200, 70, 101),
    star('Kestra-2', 18, 'J2016.5', 0.6, 50, 300, 150, 202),
    star('Kestra-3', 9, 'J2022.2', 0.93, 85, 60, 250, 303),
  ];

  it('shares the mass and distance, with a smaller mass uncertainty than any single star', () => {
    const singles = stars.map((s) => {
      const r = fitOrbits({ stars: [s.input] });
      const m = r.stars[0]!.quantities.find((q) => q.name === 'massSolar')!;
      return { name: s.input.name, mass: m.value, sigma: m.sigma };
    });
    const joint = fitOrbits({ stars: stars.map((s) => s.input) });
    const m = joint.parameters.find((p) => p.name === 'massSolar')!;
    const d = joint.parameters.find((p) => p.name === 'distancePc')!;
    for (const s of singles)
      console.log(
        `single ${s.name}: M = ${(s.mass / 1e6).toFixed(3)} ± ${(s.sigma / 1e6).toFixed(3)} ×10⁶ M☉`,
      );
    console.log(
      `joint: M = ${(m.value / 1e6).toFixed(3)} ± ${(m.sigma / 1e6).toFixed(3)} ×10⁶ M☉, d = ${d.value.toFixed(0)} ± ${d.sigma.toFixed(0)} pc, χ²/dof = ${joint.reducedChi2!.toFixed(3)}`,
    );
    for (const s of singles) expect(m.sigma).toBeLessThan(s.sigma);
    expect(Math.abs(m.value - MASS)).toBeLessThan(3 * m.sigma);
    expect(Math.abs(d.value - DISTANCE)).toBeLessThan(3 * d.sigma);
    expect(joint.reducedChi2!).toBeGreaterThan(0.7);
    expect(joint.reducedChi2!).toBeLessThan(1.3);
    // Each star's semi-major axis now follows from the shared M and d, with its uncertainty propagated.
    for (const [k, s] of joint.stars.entries()) {
      const a = s.quantities.find((q) => q.name === 'semiMajorAxisArcsec')!;
      const truthA = (stars[k]!.truth.elements as { semiMajorAxisArcsec: number })
        .semiMajorAxisArcsec;
      expect(a.fitted).toBe(false);
      expect(Math.abs(a.value - truthA)).toBeLessThan(3 * a.sigma);
    }
  });
});
