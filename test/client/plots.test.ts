/**
 * The plots' geometry, which the SVG components draw from: orientation of the sky plane (north up,
 * east left, one scale on both axes), axis ticks, and error ellipses checked against an independent
 * eigen-decomposition (ml-matrix) and against the orbit engine's own offsets.
 */
import fc from 'fast-check';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, test } from 'vitest';
import {
  offsetsEllipse,
  separationToOffsets,
  svgRotationDeg,
} from '../../client/src/plots/ellipse.ts';
import { linear, niceStep, ticks } from '../../client/src/plots/scale.ts';
import { labelSpaced, skyPlaneGeometry } from '../../client/src/plots/sky-plane.tsx';
import { parseEpoch } from '../../server/science/time/index.ts';
import { predict, validateOrbit } from '../../server/science/orbit/index.ts';
import { MEEUS_57A } from '../fixtures/orbits.ts';

const rad = Math.PI / 180;

describe('sky-plane geometry', () => {
  const points = [
    { dRaMas: -40, dDecMas: -10 },
    { dRaMas: 45, dDecMas: 150 },
  ];
  const g = skyPlaneGeometry(points, 560, 515);

  test('east (positive Δα*) is to the left and north (positive Δδ) is up', () => {
    // The astronomical convention for images of the sky (common practice, no source).
    expect(g.x(10)).toBeLessThan(g.x(0));
    expect(g.x(-10)).toBeGreaterThan(g.x(0));
    expect(g.y(10)).toBeLessThan(g.y(0)); // SVG y grows downwards
  });

  test('one milliarcsecond is the same length on both axes, so the orbit keeps its shape', () => {
    const sx = Math.abs(g.x(100) - g.x(0)) / 100;
    const sy = Math.abs(g.y(100) - g.y(0)) / 100;
    expect(sx).toBeCloseTo(sy, 12);
    expect(1 / sx).toBeCloseTo(g.masPerPx, 12);
  });

  test('every point lies inside the plot area', () => {
    for (const p of points) {
      expect(g.x(p.dRaMas)).toBeGreaterThanOrEqual(58);
      expect(g.x(p.dRaMas)).toBeLessThanOrEqual(560 - 16);
      expect(g.y(p.dDecMas)).toBeGreaterThanOrEqual(22);
      expect(g.y(p.dDecMas)).toBeLessThanOrEqual(515 - 44);
    }
  });

  test('date labels closer than the minimum spacing are dropped, the first is kept', () => {
    const out = labelSpaced(
      [
        { px: 0, py: 0 },
        { px: 5, py: 0 },
        { px: 20, py: 0 },
      ],
      16,
    );
    expect(out.map((p) => p.label)).toEqual([true, false, true]);
  });
});

describe('axis ticks', () => {
  // Steps of 1, 2 or 5 times a power of ten (common practice, no source).
  test('round steps', () => {
    expect(niceStep(0, 1, 5)).toBe(0.2);
    expect(niceStep(-37, 152, 6)).toBe(50);
    expect(niceStep(0, 90, 6)).toBe(20);
    expect(ticks(-37, 152, 6)).toEqual([0, 50, 100, 150]);
    expect(ticks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
  });

  test('ticks fall inside the domain, in order, for a reversed domain too', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e6, max: 1e6, noNaN: true }),
        fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
        (lo, span) => {
          const t = ticks(lo + span, lo, 6);
          // Doubles resolve about 1e-16 of the larger magnitude; allow 1e-9 of it at the edges.
          const eps = 1e-9 * Math.max(span, Math.abs(lo));
          expect(t.length).toBeGreaterThan(0);
          expect(t.length).toBeLessThanOrEqual(13);
          for (let i = 0; i < t.length; i++) {
            expect(t[i]!).toBeGreaterThanOrEqual(lo - eps);
            expect(t[i]!).toBeLessThanOrEqual(lo + span + eps);
            if (i) expect(t[i]!).toBeGreaterThan(t[i - 1]!);
          }
        },
      ),
      { numRuns: 3000 },
    );
  });

  test('a linear scale inverts', () => {
    const s = linear([5, -5], [0, 100]);
    expect(s(5)).toBe(0);
    expect(s(-5)).toBe(100);
    expect(s.invert(25)).toBeCloseTo(2.5, 12);
  });
});

describe('error ellipses', () => {
  test('equal errors with correlation 0.5: axes √1.5 and √0.5, major axis towards north-east (PA 45°)', () => {
    // Eigenvalues of [[1, 0.5], [0.5, 1]] are 1 ± 0.5 with eigenvector (1, 1)/√2 for the larger
    // (2×2 symmetric eigenproblem, from memory); (east, north) = (1, 1) is position angle 45°.
    const e = offsetsEllipse(1, 1, 0.5);
    expect(e.majorMas).toBeCloseTo(Math.sqrt(1.5), 12);
    expect(e.minorMas).toBeCloseTo(Math.sqrt(0.5), 12);
    expect(e.paDeg).toBeCloseTo(45, 10);
  });

  test('uncorrelated errors: the larger sigma sets the axis (Δδ larger: PA 0°; Δα* larger: PA 90°)', () => {
    for (const [sa, sd, pa] of [
      [0.2, 0.6, 0],
      [0.6, 0.2, 90],
    ] as const) {
      const e = offsetsEllipse(sa, sd, 0);
      expect(e.majorMas).toBeCloseTo(0.6, 12);
      expect(e.minorMas).toBeCloseTo(0.2, 12);
      expect(e.paDeg).toBe(pa);
    }
  });

  test('agrees with ml-matrix’s eigen-decomposition for random covariances', () => {
    let worst = 0;
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        fc.double({ min: -0.99, max: 0.99, noNaN: true }),
        (sa, sd, r) => {
          const e = offsetsEllipse(sa, sd, r);
          const cov = new Matrix([
            [sa * sa, r * sa * sd],
            [r * sa * sd, sd * sd],
          ]);
          const eig = new EigenvalueDecomposition(cov);
          const values = eig.realEigenvalues;
          const k = values[0]! >= values[1]! ? 0 : 1;
          const [east, north] = [eig.eigenvectorMatrix.get(0, k), eig.eigenvectorMatrix.get(1, k)];
          const pa = (((Math.atan2(east, north) / rad) % 180) + 180) % 180;
          expect(e.majorMas).toBeCloseTo(Math.sqrt(Math.max(...values)), 6);
          expect(e.minorMas).toBeCloseTo(Math.sqrt(Math.max(0, Math.min(...values))), 6);
          // Compare axes modulo 180°, and only where the ellipse is not (nearly) a circle.
          if (e.majorMas - e.minorMas > 1e-6 * e.majorMas) {
            const d = Math.abs(((((e.paDeg - pa + 90) % 180) + 180) % 180) - 90);
            worst = Math.max(worst, d);
            expect(d).toBeLessThan(1e-4);
          }
        },
      ),
      // The first case is a counterexample fast-check found: an uncorrelated 4:1 ellipse that the
      // old eigenvector formula put 6.3° off east.
      { numRuns: 500, examples: [[0.6881002591903475, 0.1665517811458118, 4.373495222435902e-15]] },
    );
    console.log(
      `error-ellipse position angle vs ml-matrix: worst ${worst.toExponential(2)}° over 500 covariances`,
    );
  });

  test('the SVG rotation turns the drawn major axis to the stated position angle on the north-up, east-left plot', () => {
    const g = skyPlaneGeometry(
      [
        { dRaMas: -100, dDecMas: -100 },
        { dRaMas: 100, dDecMas: 100 },
      ],
      500,
      500,
    );
    for (const pa of [0, 30, 45, 90, 135, 170]) {
      const t = svgRotationDeg(pa) * rad;
      // SVG rotate(θ) takes screen (1, 0) to (cos θ, sin θ) with y downwards.
      const [sx, sy] = [Math.cos(t), Math.sin(t)];
      const east = g.x.invert(g.x(0) + sx) - 0;
      const north = g.y.invert(g.y(0) + sy) - 0;
      const back = (((Math.atan2(east, north) / rad) % 360) + 360) % 360;
      expect(Math.abs(((((back - pa + 90) % 180) + 180) % 180) - 90)).toBeLessThan(1e-9);
    }
  });

  test('a separation and position angle give the same offsets as the orbit engine (Meeus, Example 57.a, from memory)', () => {
    // θ = 318.42°, ρ = 0.4110″ at epoch 1980.0 for the orbit of Meeus Example 57.a (docs/REFERENCES.md).
    const s = separationToOffsets(411.0, 318.42, 1, 0.1);
    const p = predict(validateOrbit(MEEUS_57A), parseEpoch('J1980.0', 'epoch'));
    // Tolerance: ρ is given to 0.1 mas and θ to 0.01° (0.07 mas across at 411 mas).
    expect(Math.abs(s.dRaMas - p.dRaMas)).toBeLessThan(0.3);
    expect(Math.abs(s.dDecMas - p.dDecMas)).toBeLessThan(0.3);
    // The radial error (1 mas) is larger than the tangential one (0.1° × 411 mas = 0.72 mas): the major axis is radial.
    expect(s.ellipse.majorMas).toBe(1);
    expect(s.ellipse.minorMas).toBeCloseTo(411 * 0.1 * rad, 12);
    expect(s.ellipse.paDeg).toBeCloseTo(318.42 - 180, 10);
  });
});
