import { describe, expect, it } from 'vitest';
import { solveKepler, solveKeplerBatch } from '../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../server/science/random.ts';

const DEG = Math.PI / 180;

describe("Kepler's equation", () => {
  it('reproduces Meeus Example 30.a: e = 0.100, M = 5° gives E = 5.554589°', () => {
    // Meeus, Astronomical Algorithms, 2nd ed. (1998), Example 30.a (from memory)
    expect(solveKepler(5 * DEG, 0.1) / DEG).toBeCloseTo(5.554589, 6);
  });

  it('reproduces the high-eccentricity example: e = 0.99, M = 2° gives E = 32.361007°', () => {
    // Meeus, Astronomical Algorithms, 2nd ed., Chapter 30 high-eccentricity example (from memory)
    expect(solveKepler(2 * DEG, 0.99) / DEG).toBeCloseTo(32.361007, 6);
  });

  it('leaves a residual |E − e sin E − M| ≤ 1e-14 rad for every e in [0, 1 − 1e-9] and M', () => {
    // Tolerance from the requirement of the orbit-engine issue; e up to 1 − 1e-9 covers e ≥ 0.99.
    const es = [
      0,
      1e-8,
      0.01,
      0.1,
      0.3,
      0.5,
      0.7,
      0.9,
      0.95,
      0.99,
      0.995,
      0.999,
      0.9999,
      0.99999,
      1 - 1e-7,
      1 - 1e-9,
    ];
    let worst = 0;
    let sumSq = 0;
    let count = 0;
    for (const e of es) {
      for (let j = 0; j <= 20_000; j++) {
        const base = -Math.PI + (2 * Math.PI * j) / 20_000;
        for (const M of [base, base * 1e-4, base * 1e-9]) {
          const E = solveKepler(M, e);
          const r = Math.abs(E - e * Math.sin(E) - M);
          worst = Math.max(worst, r);
          sumSq += r * r;
          count++;
        }
      }
    }
    console.log(
      `Kepler residual: worst ${worst.toExponential(2)} rad, RMS ${Math.sqrt(sumSq / count).toExponential(2)} rad over ${count} solves`,
    );
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it('leaves the same residual on 400 000 seeded random (M, e), half of them with e > 0.9', () => {
    // Exercises both the table-started fast path and the robust path (tolerance as above).
    const rng = new SeededRandom(99);
    const n = 400_000;
    const M = Float64Array.from({ length: n }, () => (rng.uniform() * 2 - 1) * Math.PI);
    const e = Float64Array.from({ length: n }, (_, i) =>
      i % 2 === 0 ? rng.uniform() : 1 - 0.1 * rng.uniform() ** 4,
    );
    const E = solveKeplerBatch(M, e);
    let worst = 0;
    for (let i = 0; i < n; i++)
      worst = Math.max(worst, Math.abs(E[i]! - e[i]! * Math.sin(E[i]!) - M[i]!));
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it('keeps the 2πk of the mean anomaly: many orbits from T still satisfy the equation', () => {
    for (const M of [40, -40, 1000.5, 2 * Math.PI * 7 + 0.3]) {
      const E = solveKepler(M, 0.8);
      // Residual scales with |M| by floating point alone: 1e-14 relative, common practice, no source.
      expect(Math.abs(E - 0.8 * Math.sin(E) - M)).toBeLessThanOrEqual(
        1e-14 * Math.max(1, Math.abs(M)),
      );
    }
  });

  it('batch and scalar paths agree exactly, with one e or one e per M', () => {
    const M = Float64Array.from({ length: 1000 }, (_, i) => -3 + i * 0.006);
    const e = Float64Array.from({ length: 1000 }, (_, i) => (i % 100) / 100.5);
    const one = solveKeplerBatch(M, 0.7);
    const many = solveKeplerBatch(M, e);
    for (let i = 0; i < M.length; i++) {
      expect(one[i]).toBe(solveKepler(M[i]!, 0.7));
      expect(many[i]).toBe(solveKepler(M[i]!, e[i]!));
    }
  });
});
