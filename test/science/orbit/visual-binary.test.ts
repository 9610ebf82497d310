import { describe, expect, it } from 'vitest';
import { predict, toThieleInnesInput, validateOrbit } from '../../../server/science/orbit/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { MEEUS_57A } from '../../fixtures/orbits.ts';

describe('visual binary, Meeus Example 57.a', () => {
  const p = predict(validateOrbit(MEEUS_57A), parseEpoch('J1980.0'));

  it('gives the intermediate anomalies M = 37.788°, E = 49.896°, ν = 63.415°', () => {
    // Meeus Example 57.a intermediate values (from memory), printed to 0.001°.
    expect(p.meanAnomalyDeg).toBeCloseTo(37.788, 3);
    expect(p.eccentricAnomalyDeg).toBeCloseTo(49.896, 3);
    expect(p.trueAnomalyDeg).toBeCloseTo(63.415, 3);
  });

  it('gives θ = 318.42° and ρ = 0.4110″', () => {
    // Meeus Example 57.a (from memory): θ = 318.4° (318.42°), ρ = 0.411″ (0.4110″).
    expect(Math.abs(p.positionAngleDeg - 318.42)).toBeLessThan(0.01);
    expect(Math.abs(p.separationMas - 411.0)).toBeLessThan(0.1);
  });

  it('puts the offsets in the quadrant of θ: north-west (Δα* < 0, Δδ > 0)', () => {
    // θ = 318° is 42° west of north: the position-angle convention of docs/DESIGN.md (north through east).
    expect(p.dRaMas).toBeLessThan(0);
    expect(p.dDecMas).toBeGreaterThan(0);
    expect(Math.hypot(p.dRaMas, p.dDecMas)).toBeCloseTo(p.separationMas, 9);
  });
});

describe('elements given as Thiele–Innes constants', () => {
  it('give the same position as the Campbell elements of Meeus Example 57.a', () => {
    const campbell = validateOrbit(MEEUS_57A);
    const ti = validateOrbit({ elements: toThieleInnesInput(campbell) });
    const p = predict(ti, parseEpoch('J1980.0'));
    // Meeus Example 57.a (from memory): θ = 318.42°, ρ = 0.4110″.
    expect(Math.abs(p.positionAngleDeg - 318.42)).toBeLessThan(0.01);
    expect(Math.abs(p.separationMas - 411.0)).toBeLessThan(0.1);
  });

  it('refuse an orbit of zero size and name the field', () => {
    expect(() =>
      validateOrbit({
        elements: {
          kind: 'thiele-innes',
          periodYears: 10,
          periapsis: 'J2000',
          eccentricity: 0.1,
          aArcsec: 0,
          bArcsec: 0,
          fArcsec: 0,
          gArcsec: 0,
        },
      }),
    ).toThrow(
      /elements\.aArcsec: 0 with bArcsec, fArcsec, gArcsec must describe an orbit of non-zero size/,
    );
  });
});
