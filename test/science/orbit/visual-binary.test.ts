import { describe, expect, it } from 'vitest';
import { predict, validateOrbit } from '../../../server/science/orbit/index.ts';
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
    // θ = 318° is 42° west of north: the position-angle convention of DESIGN.md (north through east).
    expect(p.dRaMas).toBeLessThan(0);
    expect(p.dDecMas).toBeGreaterThan(0);
    expect(Math.hypot(p.dRaMas, p.dDecMas)).toBeCloseTo(p.separationMas, 9);
  });
});
