import { describe, expect, it } from 'vitest';
import {
  AU_M,
  C_M_PER_S,
  GM_EARTH_M3_PER_S2,
  GM_SUN_M3_PER_S2,
  LIGHT_YEAR_M,
  PARSEC_M,
  R_SUN_M,
} from '../../../server/science/constants.ts';
import {
  gravitationalRedshiftKmS,
  massSolar,
  physicalQuantities,
  precessionPerOrbitRad,
  predict,
  romerDelayDays,
  schwarzschildRadiusM,
  transverseDopplerKmS,
  validateOrbit,
} from '../../../server/science/orbit/index.ts';

describe('relativistic terms and constants', () => {
  it('gives the Sun a Schwarzschild radius of 2953.25 m', () => {
    // IAU 2015 Resolution B3 nominal GM☉ = 1.3271244e20 m³/s² → 2GM/c² = 2953.25 m (docs/REFERENCES.md)
    expect(schwarzschildRadiusM(GM_SUN_M3_PER_S2)).toBeCloseTo(2953.25, 2);
  });

  it('gives the Earth a Schwarzschild radius of 8.870 mm, a few millimetres', () => {
    // GM⊕ = 3.986004418e14 m³/s², IERS Conventions 2010 → 8.870 mm (docs/REFERENCES.md);
    // "a few millimetres": common practice, no source.
    const rs = schwarzschildRadiusM(GM_EARTH_M3_PER_S2);
    expect(rs * 1000).toBeCloseTo(8.87, 3);
    expect(rs).toBeGreaterThan(0.001);
    expect(rs).toBeLessThan(0.01);
  });

  it("gives Mercury's perihelion advance as 42.98″ per century", () => {
    // Will, Living Reviews in Relativity (2014) (from memory): 42.98″/century with a = 0.387098 au,
    // e = 0.205630, P = 87.9691 d (docs/REFERENCES.md).
    const perOrbit = precessionPerOrbitRad(GM_SUN_M3_PER_S2, 0.387098 * AU_M, 0.20563);
    const arcsecPerCentury = ((perOrbit * 180 * 3600) / Math.PI) * (36525 / 87.9691);
    expect(Math.abs(arcsecPerCentury - 42.98)).toBeLessThan(0.01);
  });

  it('gives a gravitational redshift of 636 m/s at the solar surface', () => {
    // GM☉/(R☉c) with IAU 2015 B3 nominal R☉ = 695 700 km: 636 m/s (docs/REFERENCES.md); measured 638 ± 6 m/s,
    // González Hernández et al., A&A (2020) (from memory).
    expect(gravitationalRedshiftKmS(GM_SUN_M3_PER_S2, R_SUN_M) * 1000).toBeCloseTo(636, 0);
  });

  it('matches the exact time-dilation factor to second order for the transverse Doppler shift', () => {
    // Special relativity: γ − 1 = v²/(2c²) + O(v⁴/c⁴); common practice, no source.
    const v = 3000; // km/s
    const beta = (v * 1000) / C_M_PER_S;
    const exact = (1 / Math.sqrt(1 - beta * beta) - 1) * (C_M_PER_S / 1000);
    expect(Math.abs(transverseDopplerKmS(v) - exact) / exact).toBeLessThan(1e-4);
  });

  it('takes light 499.005 s to cross 1 au', () => {
    // IAU 2009 system of astronomical constants: light time for unit distance τ_A = 499.00478384 s (from memory).
    expect(romerDelayDays(1) * 86400).toBeCloseTo(499.00478384, 6);
  });

  it("gives 1 solar mass for 1 au and one sidereal year by Kepler's third law", () => {
    // Common practice, no source: 1.0000 to 4 digits with the sidereal year (365.25636 d).
    expect(massSolar(1, 365.25636)).toBeCloseTo(1, 4);
  });

  it('puts a 20-year orbit around 20 million suns at 50,000 light years near 2000 au and 0.13″', () => {
    // Kepler's third law in solar units, a[au]³ = M P², with invented round values: 20 million suns and
    // 20 years give a = (2·10⁷·400)^(1/3) = 2000 au; at 50,000 light years (15,330 pc) that is 0.1305″.
    // Common practice, no source.
    const distancePc = (50_000 * LIGHT_YEAR_M) / PARSEC_M;
    const orbit = validateOrbit({
      elements: {
        periodYears: 20,
        periapsis: '2030-01-01',
        eccentricity: 0.7,
        semiMajorAxisArcsec: 0.1305,
        inclinationDeg: 40,
        ascendingNodeDeg: 100,
        argPeriapsisDeg: 150,
      },
      distancePc,
    });
    const q = physicalQuantities(orbit);
    expect(Math.abs(q.semiMajorAxisAu - 2000) / 2000).toBeLessThan(0.002);
    expect(Math.abs(q.massSolar - 2e7) / 2e7).toBeLessThan(0.006); // 3 × the axis's relative error
  });
});

describe('relativistic terms in a prediction', () => {
  const elements = {
    periodYears: 12,
    periapsis: '2031-03-01T00:00:00Z',
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.11,
    inclinationDeg: 120,
    ascendingNodeDeg: 200,
    argPeriapsisDeg: 70,
  };
  const off = validateOrbit({ elements, distancePc: 16_000, systemicVelocityKmS: -12 });
  const on = validateOrbit({
    elements,
    distancePc: 16_000,
    systemicVelocityKmS: -12,
    relativity: {
      gravitationalRedshift: true,
      transverseDoppler: true,
      romer: true,
      precession: true,
    },
  });
  const T = off.periapsisJd;

  it('reports each term at periapsis with its textbook size, and adds only the switched-on ones', () => {
    const q = physicalQuantities(off);
    const p = predict(off, T);
    // Size at periapsis: GM/(r c) with r = a(1−e), and v²/(2c) with the vis-viva speed (formulas of docs/DESIGN.md).
    expect(p.gravitationalRedshiftKmS!).toBeCloseTo(q.gravitationalRedshiftAtPeriapsisKmS, 6);
    expect(p.transverseDopplerKmS!).toBeCloseTo(q.transverseDopplerAtPeriapsisKmS, 6);
    expect(p.radialVelocityKmS!).toBeCloseTo(-12 + p.keplerianRvKmS!, 9);
    const r = predict(on, T + 5);
    expect(r.radialVelocityKmS!).toBeCloseTo(
      -12 + r.keplerianRvKmS! + r.gravitationalRedshiftKmS! + r.transverseDopplerKmS!,
      9,
    );
  });

  it('delays the observed periapsis by the light time z/c across the orbit', () => {
    const s = predict(off, T);
    const delayed = predict(on, T + s.romerDelayDays!);
    // At the delayed instant the star is seen at periapsis: ν = 0 to within the fixed-point tolerance.
    const nu = delayed.trueAnomalyDeg > 180 ? delayed.trueAnomalyDeg - 360 : delayed.trueAnomalyDeg;
    expect(Math.abs(nu)).toBeLessThan(1e-4);
  });

  it('advances ω by 6πGM/(c²a(1−e²)) per orbit when precession is on', () => {
    const q = physicalQuantities(off);
    // Precession alone, so that the light time does not shift the emission instant.
    const precessing = validateOrbit({
      elements,
      distancePc: 16_000,
      relativity: { precession: true },
    });
    const p = predict(precessing, T + off.periodDays);
    expect(p.precessionDeg! * 60).toBeCloseTo(q.precessionArcminPerOrbit, 3);
  });
});
