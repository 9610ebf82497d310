import { describe, expect, it } from 'vitest';
import { binary, kepler } from 'astronomia';
import { predictBatch, validateOrbit } from '../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../server/science/random.ts';
import { jdToJulianEpoch } from '../../../server/science/time/index.ts';

// Independent implementation: the npm package `astronomia` (Meeus, Astronomical Algorithms, ch. 30
// and 57). Tolerance 1e-6 relative in ρ and 1e-6° in θ, from the orbit-engine issue.
describe('positions of random visual-binary orbits against astronomia', () => {
  it('agree for 300 orbits × 5 epochs within 1e-6 in ρ (relative) and θ', () => {
    const rng = new SeededRandom(20261201);
    let worstRho = 0;
    let worstTheta = 0;
    let count = 0;
    for (let n = 0; n < 300; n++) {
      const P = 2 + rng.uniform() * 400; // years
      const T = 1900 + rng.uniform() * 200; // Julian epoch
      const e = rng.uniform() * 0.97;
      const a = 0.05 + rng.uniform() * 5;
      const i = rng.uniform() * 180;
      const node = rng.uniform() * 360;
      const w = rng.uniform() * 360;
      const orbit = validateOrbit({
        elements: {
          periodYears: P,
          periapsis: `J${T}`,
          eccentricity: e,
          semiMajorAxisArcsec: a,
          inclinationDeg: i,
          ascendingNodeDeg: node,
          argPeriapsisDeg: w,
        },
      });
      const jd = Float64Array.from({ length: 5 }, () => 2451545 + (rng.uniform() - 0.5) * 73_000);
      const ours = predictBatch(orbit, jd);
      for (let k = 0; k < jd.length; k++) {
        const year = jdToJulianEpoch(jd[k]!);
        const M = binary.meanAnomaly(year, T, P);
        const E = kepler.kepler3(e, M); // Meeus ch. 30 third method: bisection, robust for any e
        const [theta, rho] = binary.position(
          a,
          e,
          (i * Math.PI) / 180,
          (node * Math.PI) / 180,
          (w * Math.PI) / 180,
          E,
        );
        const thetaDeg = ((((theta * 180) / Math.PI) % 360) + 360) % 360;
        const dTheta = Math.abs(((ours.positionAngleDeg[k]! - thetaDeg + 540) % 360) - 180);
        const dRho = Math.abs(ours.separationMas[k]! / 1000 - rho) / rho;
        worstTheta = Math.max(worstTheta, dTheta);
        worstRho = Math.max(worstRho, dRho);
        count++;
      }
    }
    console.log(
      `vs astronomia over ${count} positions: worst |Δθ| ${worstTheta.toExponential(2)}°, worst |Δρ|/ρ ${worstRho.toExponential(2)}`,
    );
    expect(worstRho).toBeLessThan(1e-6);
    expect(worstTheta).toBeLessThan(1e-6);
  });
});
