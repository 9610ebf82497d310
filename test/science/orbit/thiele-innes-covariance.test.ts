/**
 * A covariance over Thiele–Innes constants carried to Campbell elements. Checked against two
 * routes the conversion does not take: central differences of thieleInnesToCampbell (the exact,
 * nonlinear map) for the Jacobian, and a seeded Monte Carlo of that map for the propagated
 * covariance; and the round trip through the forward map. Orbits invented for the test.
 */
import { describe, expect, it } from 'vitest';
import { DEG } from '../../../server/science/constants.ts';
import {
  campbellToThieleInnes,
  thieleInnesJacobian,
  thieleInnesToCampbell,
  validateOrbit,
} from '../../../server/science/orbit/index.ts';
import { SeededRandom } from '../../../server/science/random.ts';

/** Invented visual binaries: a (″), i, Ω, ω (°). */
const ORBITS = [
  { a: 0.6, i: 48, node: 112, arg: 301 },
  { a: 1.9, i: 131, node: 17, arg: 64 },
  { a: 0.13, i: 86, node: 163, arg: 198 },
  { a: 0.42, i: 7, node: 75, arg: 240 },
];
const tiOf = (o: (typeof ORBITS)[number]) =>
  campbellToThieleInnes(o.a, o.i * DEG, o.node * DEG, o.arg * DEG);
const pointOf = (ti: ReturnType<typeof tiOf>) => ({ ti, campbell: thieleInnesToCampbell(ti) });
/** (a, i, Ω, ω) in the covariance's units, angles unwrapped to lie within 180° of `near`. */
function campbellAt(ti: ReturnType<typeof tiOf>, near?: number[]): number[] {
  const c = thieleInnesToCampbell(ti);
  const v = [c.a, c.iRad / DEG, c.nodeRad / DEG, c.argRad / DEG];
  if (near) for (const k of [2, 3]) v[k] = v[k]! - 360 * Math.round((v[k]! - near[k]!) / 360);
  return v;
}

describe('Thiele–Innes covariance to Campbell elements', () => {
  it('the Jacobian matches central differences of the exact map (relative 1e-6)', () => {
    for (const o of ORBITS) {
      const ti = tiOf(o);
      const J = thieleInnesJacobian(pointOf(ti));
      const keys = ['A', 'B', 'F', 'G'] as const;
      const at = campbellAt(ti);
      keys.forEach((k, col) => {
        const h = 1e-6 * o.a;
        const up = campbellAt({ ...ti, [k]: ti[k] + h }, at);
        const down = campbellAt({ ...ti, [k]: ti[k] - h }, at);
        for (let row = 0; row < 4; row++) {
          const numeric = (up[row]! - down[row]!) / (2 * h);
          const scale = Math.max(...J[row]!.map(Math.abs));
          expect(Math.abs(J[row]![col]! - numeric)).toBeLessThan(1e-6 * scale);
        }
      });
    }
  });

  it('the propagated covariance agrees with a seeded Monte Carlo of the exact map', () => {
    const o = ORBITS[0]!;
    const ti = tiOf(o);
    // σ of 2 mas on each constant with some correlation (invented, a typical visual-binary size).
    const sigma = [0.002, 0.002, 0.0025, 0.0015];
    const rho = [
      [1, 0.3, -0.2, 0],
      [0.3, 1, 0.1, 0.25],
      [-0.2, 0.1, 1, -0.4],
      [0, 0.25, -0.4, 1],
    ];
    const C = rho.map((r, i) => r.map((x, j) => x * sigma[i]! * sigma[j]!));
    const orbit = validateOrbit({
      elements: {
        kind: 'thiele-innes',
        periodYears: 27.3,
        periapsis: '2031-04-01T00:00:00Z',
        eccentricity: 0.47,
        aArcsec: ti.A,
        bArcsec: ti.B,
        fArcsec: ti.F,
        gArcsec: ti.G,
      },
      covariance: { parameters: ['aArcsec', 'bArcsec', 'fArcsec', 'gArcsec'], matrix: C },
    });
    expect(orbit.covariance!.parameters).toEqual([
      'semiMajorAxisArcsec',
      'inclinationDeg',
      'ascendingNodeDeg',
      'argPeriapsisDeg',
    ]);
    // Draws of (A, B, F, G) through a Cholesky factor of C, each converted exactly.
    const L = C.map(() => [0, 0, 0, 0]);
    for (let i = 0; i < 4; i++)
      for (let j = 0; j <= i; j++) {
        let s = C[i]![j]!;
        for (let k = 0; k < j; k++) s -= L[i]![k]! * L[j]![k]!;
        L[i]![j] = i === j ? Math.sqrt(s) : s / L[j]![j]!;
      }
    const rng = new SeededRandom(20270601);
    const centre = campbellAt(ti);
    const draws: number[][] = [];
    for (let n = 0; n < 40_000; n++) {
      const z = [rng.normal(), rng.normal(), rng.normal(), rng.normal()];
      const d = L.map((row) => row.reduce((s, x, k) => s + x * z[k]!, 0));
      draws.push(
        campbellAt({ A: ti.A + d[0]!, B: ti.B + d[1]!, F: ti.F + d[2]!, G: ti.G + d[3]! }, centre),
      );
    }
    const mean = [0, 1, 2, 3].map((k) => draws.reduce((s, v) => s + v[k]!, 0) / draws.length);
    const sample = [0, 1, 2, 3].map((i) =>
      [0, 1, 2, 3].map(
        (j) =>
          draws.reduce((s, v) => s + (v[i]! - mean[i]!) * (v[j]! - mean[j]!), 0) /
          (draws.length - 1),
      ),
    );
    const P = orbit.covariance!.matrix;
    for (let i = 0; i < 4; i++) {
      // σ within 2 % (sampling error of a σ from 40 000 draws is 0.35 %; the rest is nonlinearity).
      expect(Math.abs(Math.sqrt(P[i]![i]!) / Math.sqrt(sample[i]![i]!) - 1)).toBeLessThan(0.02);
      for (let j = 0; j < i; j++) {
        const r = P[i]![j]! / Math.sqrt(P[i]![i]! * P[j]![j]!);
        const s = sample[i]![j]! / Math.sqrt(sample[i]![i]! * sample[j]![j]!);
        expect(Math.abs(r - s)).toBeLessThan(0.02);
      }
    }
  });

  it('a Campbell covariance carried to A, B, F, G and back is the one it started from', () => {
    const o = ORBITS[1]!;
    const ti = tiOf(o);
    const campbell = [
      [1e-6, 0, 0, 0],
      [0, 0.25, 0.1, -0.05],
      [0, 0.1, 0.64, 0.2],
      [0, -0.05, 0.2, 1.21],
    ];
    // Forward Jacobian by central differences of campbellToThieleInnes (the exact map).
    const base = [o.a, o.i, o.node, o.arg];
    const fwd = [0, 1, 2, 3].map(() => [0, 0, 0, 0]);
    for (let k = 0; k < 4; k++) {
      const h = k === 0 ? 1e-7 : 1e-6;
      const at = (s: number) => {
        const v = [...base];
        v[k] = v[k]! + s * h;
        const t = campbellToThieleInnes(v[0]!, v[1]! * DEG, v[2]! * DEG, v[3]! * DEG);
        return [t.A, t.B, t.F, t.G];
      };
      const [u, d] = [at(1), at(-1)];
      for (let r = 0; r < 4; r++) fwd[r]![k] = (u[r]! - d[r]!) / (2 * h);
    }
    const tiCov = fwd.map((ri) =>
      fwd.map((rj) =>
        ri.reduce((s, x, a) => s + x * rj.reduce((t, y, b) => t + campbell[a]![b]! * y, 0), 0),
      ),
    );
    const orbit = validateOrbit({
      elements: {
        kind: 'thiele-innes',
        periodYears: 3.84,
        periapsis: '2028-01-10T00:00:00Z',
        eccentricity: 0.36,
        aArcsec: ti.A,
        bArcsec: ti.B,
        fArcsec: ti.F,
        gArcsec: ti.G,
      },
      covariance: { parameters: ['aArcsec', 'bArcsec', 'fArcsec', 'gArcsec'], matrix: tiCov },
    });
    const back = orbit.covariance!.matrix;
    for (let i = 0; i < 4; i++)
      for (let j = 0; j < 4; j++)
        expect(Math.abs(back[i]![j]! - campbell[i]![j]!)).toBeLessThan(
          1e-5 * Math.sqrt(campbell[i]![i]! * campbell[j]![j]!),
        );
  });

  it('keeps the other parameters and their correlations with the constants', () => {
    const ti = tiOf(ORBITS[2]!);
    const orbit = validateOrbit({
      elements: {
        kind: 'thiele-innes',
        periodYears: 9.6,
        periapsis: '2029-05-01T00:00:00Z',
        eccentricity: 0.62,
        aArcsec: ti.A,
        bArcsec: ti.B,
        fArcsec: ti.F,
        gArcsec: ti.G,
      },
      covariance: {
        parameters: ['periodYears', 'aArcsec', 'eccentricity'],
        matrix: [
          [0.0016, 0.00002, 0],
          [0.00002, 0.000001, 0],
          [0, 0, 0.0001],
        ],
      },
    });
    const c = orbit.covariance!;
    expect(c.parameters).toEqual([
      'periodYears',
      'eccentricity',
      'semiMajorAxisArcsec',
      'inclinationDeg',
      'ascendingNodeDeg',
      'argPeriapsisDeg',
    ]);
    const J = thieleInnesJacobian(pointOf(ti));
    // P keeps its variance; cov(P, a) = ∂a/∂A · cov(P, A); e is untouched.
    expect(c.matrix[0]![0]).toBe(0.0016);
    expect(c.matrix[1]![1]).toBe(0.0001);
    expect(c.matrix[0]![2]).toBeCloseTo(J[0]![0]! * 0.00002, 15);
    expect(c.matrix[2]![2]).toBeCloseTo(J[0]![0]! ** 2 * 0.000001, 15);
  });

  it('refuses what it cannot carry, naming the field and the rule', () => {
    const ti = tiOf(ORBITS[0]!);
    const elements = {
      kind: 'thiele-innes' as const,
      periodYears: 27.3,
      periapsis: '2031-04-01T00:00:00Z',
      eccentricity: 0.47,
      aArcsec: ti.A,
      bArcsec: ti.B,
      fArcsec: ti.F,
      gArcsec: ti.G,
    };
    expect(() =>
      validateOrbit({
        elements,
        covariance: {
          parameters: ['aArcsec', 'inclinationDeg'],
          matrix: [
            [1e-6, 0],
            [0, 1],
          ],
        },
      }),
    ).toThrow(/orbit\.covariance\.parameters.*both Thiele–Innes constants and inclinationDeg/s);
    expect(() =>
      validateOrbit({
        elements: {
          periodYears: 27.3,
          periapsis: '2031-04-01T00:00:00Z',
          eccentricity: 0.47,
          semiMajorAxisArcsec: 0.6,
          inclinationDeg: 48,
          ascendingNodeDeg: 112,
          argPeriapsisDeg: 301,
        },
        covariance: { parameters: ['aArcsec'], matrix: [[1e-6]] },
      }),
    ).toThrow(/only with Thiele–Innes elements/);
    const faceOn = campbellToThieleInnes(0.5, 0, 30 * DEG, 60 * DEG);
    expect(() =>
      validateOrbit({
        elements: {
          ...elements,
          aArcsec: faceOn.A,
          bArcsec: faceOn.B,
          fArcsec: faceOn.F,
          gArcsec: faceOn.G,
        },
        covariance: { parameters: ['aArcsec'], matrix: [[1e-6]] },
      }),
    ).toThrow(/face-on/);
  });
});
