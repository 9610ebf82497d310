import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AU_KM, JULIAN_YEAR_DAYS, SECONDS_PER_DAY } from '../../../server/science/constants.ts';
import {
  findEvents,
  physicalQuantities,
  predict,
  predictBatch,
  toThieleInnesInput,
  validateOrbit,
  type Orbit,
  type OrbitEvent,
} from '../../../server/science/orbit/index.ts';
import { massParameterM3S2 } from '../../../server/science/orbit/physical.ts';

const elementsArb = fc.record({
  periodYears: fc.double({ min: 0.5, max: 300, noNaN: true }),
  periapsisJ: fc.double({ min: 1950, max: 2050, noNaN: true }),
  eccentricity: fc.double({ min: 0, max: 0.98, noNaN: true }),
  semiMajorAxisArcsec: fc.double({ min: 0.01, max: 10, noNaN: true }),
  inclinationDeg: fc.double({ min: 0.5, max: 179.5, noNaN: true }),
  ascendingNodeDeg: fc.double({ min: 0, max: 359.99, noNaN: true }),
  argPeriapsisDeg: fc.double({ min: 0, max: 359.99, noNaN: true }),
  distancePc: fc.double({ min: 5, max: 9000, noNaN: true }),
});

type Drawn = typeof elementsArb extends fc.Arbitrary<infer T> ? T : never;

function orbitOf(d: Drawn, relativity = false): Orbit {
  const { periapsisJ, distancePc, ...rest } = d;
  return validateOrbit({
    elements: { ...rest, periapsis: `J${periapsisJ}` },
    distancePc,
    ...(relativity
      ? {
          relativity: {
            romer: true,
            gravitationalRedshift: true,
            transverseDoppler: true,
            precession: true,
          },
        }
      : {}),
  });
}

/** Position (km) and velocity (km/s) in 3-D from a prediction: sky offsets scaled by the distance. */
function stateVectors(o: Orbit, jd: number): { r: number[]; v: number[] } {
  const p = predict(o, jd);
  const kmPerMas = (o.distancePc! / 1000) * AU_KM; // 1 mas at d pc is d/1000 au
  const kmsPerMasYr = kmPerMas / (JULIAN_YEAR_DAYS * SECONDS_PER_DAY);
  return {
    r: [p.dRaMas * kmPerMas, p.dDecMas * kmPerMas, p.lineOfSightAu! * AU_KM],
    v: [p.vRaMasYr * kmsPerMasYr, p.vDecMasYr * kmsPerMasYr, p.keplerianRvKmS!],
  };
}

const norm = (x: number[]) => Math.hypot(...x);
const cross = (a: number[], b: number[]) => [
  a[1]! * b[2]! - a[2]! * b[1]!,
  a[2]! * b[0]! - a[0]! * b[2]!,
  a[0]! * b[1]! - a[1]! * b[0]!,
];

describe('orbit properties (fast-check)', () => {
  it('Campbell ↔ Thiele–Innes round trip predicts the same sky positions', () => {
    fc.assert(
      fc.property(elementsArb, fc.double({ min: 0, max: 1, noNaN: true }), (d, phase) => {
        const o = orbitOf(d);
        const ti = validateOrbit({ elements: toThieleInnesInput(o) });
        const jd = o.periapsisJd + phase * o.periodDays;
        const a = predict(o, jd),
          b = predict(ti, jd);
        // Astrometry is blind to Ω ↔ Ω+180° with ω ↔ ω+180°: positions agree, not necessarily the elements.
        // Near i = 0° or 180° the conversion loses digits as 1/(1 ± cos i); 1e-7 of a covers i within 0.5° of the poles.
        const tol = 1e-7 * o.aMas;
        expect(Math.abs(a.dRaMas - b.dRaMas)).toBeLessThan(tol);
        expect(Math.abs(a.dDecMas - b.dDecMas)).toBeLessThan(tol);
      }),
      { numRuns: 300, seed: 1 },
    );
  });

  it('puts the star at a(1−e) from the primary at periapsis', () => {
    fc.assert(
      fc.property(elementsArb, (d) => {
        const o = orbitOf(d);
        const q = physicalQuantities(o);
        const p = predict(o, o.periapsisJd + 3 * o.periodDays);
        expect(
          Math.abs(p.separation3dAu! - q.semiMajorAxisAu * (1 - o.e)) / q.semiMajorAxisAu,
        ).toBeLessThan(1e-9);
      }),
      { numRuns: 200, seed: 2 },
    );
  });

  it('conserves energy and angular momentum between epochs (Keplerian motion)', () => {
    fc.assert(
      fc.property(
        elementsArb,
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (d, f1, f2) => {
          const o = orbitOf(d);
          const gmKm3 =
            massParameterM3S2(physicalQuantities(o).semiMajorAxisAu, o.periodDays) / 1e9;
          const s1 = stateVectors(o, o.periapsisJd + f1 * o.periodDays);
          const s2 = stateVectors(o, o.periapsisJd + (1 + f2) * o.periodDays);
          const energy = (s: { r: number[]; v: number[] }) =>
            norm(s.v) ** 2 / 2 - gmKm3 / norm(s.r);
          const h1 = cross(s1.r, s1.v),
            h2 = cross(s2.r, s2.v);
          const aKm = physicalQuantities(o).semiMajorAxisAu * AU_KM;
          // Vis-viva: specific energy −GM/(2a) (common practice, no source). Relative 1e-8.
          expect(Math.abs(energy(s1) - -gmKm3 / (2 * aKm)) / (gmKm3 / (2 * aKm))).toBeLessThan(
            1e-8,
          );
          expect(Math.abs(energy(s1) - energy(s2)) / (gmKm3 / (2 * aKm))).toBeLessThan(1e-8);
          for (let k = 0; k < 3; k++)
            expect(Math.abs(h1[k]! - h2[k]!)).toBeLessThan(1e-8 * norm(h1));
          // |h| = √(GM·a·(1−e²)).
          expect(
            Math.abs(norm(h1) - Math.sqrt(gmKm3 * aKm * (1 - o.e ** 2))) / norm(h1),
          ).toBeLessThan(1e-8);
        },
      ),
      { numRuns: 200, seed: 3 },
    );
  });

  it('finds events whose states satisfy their definitions, with and without relativity', () => {
    fc.assert(
      fc.property(elementsArb, fc.boolean(), (d, rel) => {
        const o = orbitOf(
          {
            ...d,
            eccentricity: Math.max(d.eccentricity, 0.05),
            inclinationDeg: Math.min(Math.max(d.inclinationDeg, 10), 170),
          },
          rel,
        );
        // First-order relativity is meant for stars well below c (a star near a galactic-nucleus black hole
        // reaches ~0.03c): leave out drawn orbits with absurd masses, whose ω would turn by radians per orbit.
        fc.pre(!rel || physicalQuantities(o).periapsisSpeedFractionC < 0.03);
        const start = o.periapsisJd + 0.3 * o.periodDays;
        const events = findEvents(o, start, start + 2 * o.periodDays);
        const byKind = (k: string) => events.filter((e) => e.kind === k);
        // Two periods hold two of each geometric event (the interval starts between them).
        for (const k of [
          'periapsis',
          'apoapsis',
          'ascending-node',
          'descending-node',
          'rv-maximum',
          'rv-minimum',
        ]) {
          expect(byKind(k).length, k).toBe(2);
        }
        for (let i = 1; i < events.length; i++)
          expect(events[i]!.jd).toBeGreaterThanOrEqual(events[i - 1]!.jd);
        const dt = o.periodDays * 1e-5;
        const rv = (jd: number) => predict(o, jd).radialVelocityKmS!;
        const rho = (jd: number) => predict(o, jd).separationMas;
        const check = (e: OrbitEvent) => {
          const s = e.state;
          switch (e.kind) {
            case 'periapsis':
              expect(Math.min(s.trueAnomalyDeg, 360 - s.trueAnomalyDeg)).toBeLessThan(1e-6);
              break;
            case 'apoapsis':
              expect(Math.abs(s.trueAnomalyDeg - 180)).toBeLessThan(1e-6);
              break;
            case 'ascending-node':
            case 'descending-node':
              expect(Math.abs(s.lineOfSightAu!)).toBeLessThan(
                1e-9 * physicalQuantities(o).semiMajorAxisAu,
              );
              expect(Math.sign(s.keplerianRvKmS!)).toBe(e.kind === 'ascending-node' ? 1 : -1);
              break;
            case 'rv-maximum':
              expect(rv(e.jd)).toBeGreaterThanOrEqual(
                Math.max(rv(e.jd - dt), rv(e.jd + dt)) - 1e-9,
              );
              break;
            case 'rv-minimum':
              expect(rv(e.jd)).toBeLessThanOrEqual(Math.min(rv(e.jd - dt), rv(e.jd + dt)) + 1e-9);
              break;
            case 'closest-separation':
              expect(rho(e.jd)).toBeLessThanOrEqual(
                Math.min(rho(e.jd - dt), rho(e.jd + dt)) + 1e-9,
              );
              break;
            case 'widest-separation':
              expect(rho(e.jd)).toBeGreaterThanOrEqual(
                Math.max(rho(e.jd - dt), rho(e.jd + dt)) - 1e-9,
              );
              break;
          }
        };
        events.forEach(check);
      }),
      { numRuns: 60, seed: 4, maxSkipsPerRun: 1000 },
    );
  });

  it('puts the Keplerian radial-velocity extrema at the nodes (v_r = K[cos(ν+ω) + e cos ω])', () => {
    // docs/DESIGN.md's sign convention: the ascending node is where the star recedes fastest.
    fc.assert(
      fc.property(elementsArb, (d) => {
        const o = orbitOf({
          ...d,
          eccentricity: Math.max(d.eccentricity, 0.05),
          inclinationDeg: Math.min(Math.max(d.inclinationDeg, 10), 170),
        });
        const ev = findEvents(
          o,
          o.periapsisJd + 0.1 * o.periodDays,
          o.periapsisJd + 1.1 * o.periodDays,
          { kinds: ['ascending-node', 'rv-maximum'] },
        );
        const node = ev.find((e) => e.kind === 'ascending-node')!;
        const max = ev.find((e) => e.kind === 'rv-maximum')!;
        // Golden-section precision on a flat maximum: ~1e-7 of the period.
        expect(Math.abs(node.jd - max.jd) / o.periodDays).toBeLessThan(1e-6);
      }),
      { numRuns: 60, seed: 5 },
    );
  });

  it('batch predictions equal scalar ones', () => {
    const o = validateOrbit({
      elements: {
        periodYears: 9,
        periapsis: '2029-01-01',
        eccentricity: 0.7,
        semiMajorAxisArcsec: 0.2,
        inclinationDeg: 45,
        ascendingNodeDeg: 10,
        argPeriapsisDeg: 300,
      },
      distancePc: 16_000,
      relativity: { romer: true, precession: true },
    });
    const jd = Float64Array.from({ length: 50 }, (_, i) => o.periapsisJd + i * 37.3);
    const batch = predictBatch(o, jd);
    jd.forEach((t, i) => {
      expect(predict(o, t).radialVelocityKmS).toBe(batch.radialVelocityKmS[i]);
    });
  });
});
