/**
 * The Rømer delay's range and largest value come from the line-of-sight extremes of the orbit, with
 * ω: checked against the line-of-sight position z of predictBatch sampled densely over one orbit.
 * Orbits are invented (demo values, not check values).
 */
import { describe, expect, it } from 'vitest';
import {
  physicalQuantities,
  predictBatch,
  romerDelayDays,
  validateOrbit,
} from '../../../server/science/orbit/index.ts';

const SAMPLES = 400_000;

function sampledZ(omegaDeg: number, e: number, iDeg: number) {
  const orbit = validateOrbit({
    elements: {
      periodYears: 15,
      periapsis: '2030-01-01T00:00:00Z',
      eccentricity: e,
      semiMajorAxisArcsec: 0.1,
      inclinationDeg: iDeg,
      ascendingNodeDeg: 40,
      argPeriapsisDeg: omegaDeg,
    },
    distancePc: 9000,
  });
  const jd = new Float64Array(SAMPLES);
  for (let k = 0; k < SAMPLES; k++) jd[k] = orbit.periapsisJd + (orbit.periodDays * k) / SAMPLES;
  const z = predictBatch(orbit, jd).lineOfSightAu;
  let lo = Infinity,
    hi = -Infinity;
  for (const v of z) {
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  return { q: physicalQuantities(orbit), lo, hi };
}

describe('Rømer delay range', () => {
  for (const [omega, e, i] of [
    [0, 0.88, 134],
    [66, 0.88, 134],
    [90, 0.6, 70],
    [250, 0.95, 20],
    [180, 0.3, 100],
  ] as const) {
    it(`equals the sampled line-of-sight extremes for ω = ${omega}°, e = ${e}, i = ${i}°`, () => {
      const { q, lo, hi } = sampledZ(omega, e, i);
      // Dense sampling in time misses the extreme by at most (dz/dt·Δt)²-order terms: 1e-6 relative
      // (common practice, no source).
      const tol = 1e-6 * romerDelayDays(hi - lo);
      expect(Math.abs(q.romerDelayRangeDays - romerDelayDays(hi - lo))).toBeLessThan(tol);
      expect(Math.abs(q.largestRomerDelayDays - romerDelayDays(hi))).toBeLessThan(tol);
    });
  }

  it('is 2a·sin i for ω = 90° and 2a·sin i·√(1 − e²) for ω = 0°', () => {
    // dz/dν = 0 where cos(ν + ω) = −e·cos ω: range 2a·sin i·√(1 − e²cos²ω); common practice, no source.
    const right = sampledZ(90, 0.88, 134).q;
    const flat = sampledZ(0, 0.88, 134).q;
    const twoASinI = romerDelayDays(2 * right.semiMajorAxisAu * Math.sin((134 * Math.PI) / 180));
    expect(right.romerDelayRangeDays / twoASinI).toBeCloseTo(1, 12);
    expect(flat.romerDelayRangeDays / twoASinI).toBeCloseTo(Math.sqrt(1 - 0.88 ** 2), 12);
  });
});
