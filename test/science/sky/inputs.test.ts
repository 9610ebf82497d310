/**
 * Sites, targets and limits: validation names the field, the value and the rule; defaults come
 * from the standard atmosphere; orbiting stars sit at their primary plus the predicted offset.
 */
import { describe, expect, it } from 'vitest';
import { DEG } from '../../../server/science/constants.ts';
import { validateOrbit } from '../../../server/science/orbit/elements.ts';
import { predict } from '../../../server/science/orbit/predict.ts';
import {
  maskAltitudeDeg,
  offsetPosition,
  standardAtmosphere,
  targetPositionAt,
  validateLimits,
  validateSite,
  validateTarget,
} from '../../../server/science/sky/index.ts';
import { inputError } from './helpers.ts';
import { besselianEpochToJd } from '../../../server/science/time/index.ts';

const good = {
  name: 'Loma Serena',
  latitudeDeg: -24.6,
  longitudeDeg: -70.4,
  elevationM: 2600,
  timeZone: 'America/Santiago',
};

describe('validateSite', () => {
  it.each([
    [{ latitudeDeg: 91 }, 'site.latitudeDeg', 91, 'must lie in [-90, 90]°'],
    [
      { longitudeDeg: 'west' },
      'site.longitudeDeg',
      'west',
      'is not a longitude: use degrees east (-70.4, -70.4d) or d:m:s (-70:24:10, -70°24′10″, -70d24m10s)',
    ],
    [{ pressureHpa: -3 }, 'site.pressureHpa', -3, 'must lie in [0, 1100]'],
    [
      {
        horizonMask: [
          { azimuthDeg: 10, altitudeDeg: 5 },
          { azimuthDeg: 10, altitudeDeg: 7 },
        ],
      },
      'site.horizonMask',
      [
        { azimuthDeg: 10, altitudeDeg: 5 },
        { azimuthDeg: 10, altitudeDeg: 7 },
      ],
      'must not give azimuth 10° twice',
    ],
    [
      { horizonMask: [{ azimuthDeg: 400, altitudeDeg: 5 }] },
      'site.horizonMask.0.azimuthDeg',
      400,
      'must lie in [0, 360)',
    ],
  ])('%j → %s', (patch, field, value, rule) => {
    const e = inputError(() => validateSite({ ...good, ...patch }));
    expect([e.field, e.value, e.rule]).toEqual([field, value, rule]);
  });

  it('fills pressure and temperature from the standard atmosphere and keeps given ones', () => {
    const s = validateSite(good);
    expect(s.pressureHpa).toBeCloseTo(standardAtmosphere(2600).pressureHpa, 9);
    expect(s.pressureHpa).toBeGreaterThan(735); // U.S. Standard Atmosphere 1976: 746.9 hPa at 2500 m, 701.1 hPa at 3000 m (from memory)
    expect(s.pressureHpa).toBeLessThan(745);
    expect(validateSite({ ...good, pressureHpa: 760, temperatureC: 4 })).toMatchObject({
      pressureHpa: 760,
      temperatureC: 4,
    });
    expect(validateSite({ ...good, longitudeDeg: 289.6 }).longitudeDeg).toBeCloseTo(-70.4, 9);
  });

  it('interpolates the horizon mask in azimuth, wrapping through north', () => {
    const s = validateSite({
      ...good,
      horizonMask: [
        { azimuthDeg: 350, altitudeDeg: 10 },
        { azimuthDeg: 10, altitudeDeg: 30 },
        { azimuthDeg: 180, altitudeDeg: 0 },
      ],
    });
    expect(maskAltitudeDeg(s.horizonMask, 0)).toBeCloseTo(20, 9);
    expect(maskAltitudeDeg(s.horizonMask, 95)).toBeCloseTo(15, 9);
    expect(maskAltitudeDeg(s.horizonMask, 265)).toBeCloseTo(5, 9);
    expect(maskAltitudeDeg([], 42)).toBe(-90);
  });
});

describe('validateTarget and validateLimits', () => {
  it('names the field', () => {
    expect(inputError(() => validateTarget({ name: 'x', raDeg: 360, decDeg: 0 })).field).toBe(
      'target.raDeg',
    );
    expect(inputError(() => validateTarget({ name: '', raDeg: 1, decDeg: 0 })).field).toBe(
      'target.name',
    );
    expect(
      inputError(() => validateTarget({ name: 'x', raDeg: 1, decDeg: 0, epoch: 'soon' })).field,
    ).toBe('target.epoch');
    expect(
      inputError(() =>
        validateTarget({
          name: 'x',
          raDeg: 1,
          decDeg: 0,
          orbit: { elements: { periodYears: -1 } },
        }),
      ).field,
    ).toMatch(/^target\.orbit/);
    const site = validateSite(good);
    expect(inputError(() => validateLimits({ darkness: 'dusky' }, site)).field).toBe(
      'limits.darkness',
    );
    expect(inputError(() => validateLimits({ highestAirmass: 1 }, site)).rule).toBe(
      'must lie in (1, 40]',
    );
    expect(inputError(() => validateLimits({ airmassFormula: 'guess' }, site)).field).toBe(
      'limits.airmassFormula',
    );
  });

  it('takes the strictest altitude limit', () => {
    const site = validateSite({ ...good, lowestAltitudeDeg: 25 });
    expect(validateLimits({ lowestAltitudeDeg: 10 }, site).altitudeLimitDeg).toBe(25);
    const c = validateLimits({}, validateSite(good));
    expect(c.highestAirmass).toBe(2); // default airmass limit (common practice, no source)
    expect(c.altitudeLimitDeg).toBeGreaterThan(29.9); // airmass 2 ≈ 30° (Kasten & Young 1989 at z = 60°: 1.9943)
    expect(c.altitudeLimitDeg).toBeLessThan(30.2);
  });
});

describe('absolute positions', () => {
  it('an offset of 3600″ east at δ = 60° moves α by 2° (small-angle limit: Δα = Δα*/cos δ)', () => {
    const p = offsetPosition(100, 60, 1000, 0); // 1″ east
    expect((p.raDeg - 100) * 3600).toBeCloseTo(2, 6); // common practice, no source
    expect(offsetPosition(10, -20, 0, 0)).toEqual({
      raDeg: expect.closeTo(10, 12),
      decDeg: expect.closeTo(-20, 12),
    });
  });

  it('a star on an orbit sits at the predicted separation and position angle from its primary', () => {
    // The visual binary of Meeus, Example 57.a (from memory): at 1980.0, θ = 318.4°, ρ = 0.411″.
    const orbit = {
      elements: {
        periodYears: 41.623,
        periapsis: 'B1934.008',
        eccentricity: 0.2763,
        semiMajorAxisArcsec: 0.907,
        inclinationDeg: 59.025,
        ascendingNodeDeg: 23.717,
        argPeriapsisDeg: 219.907,
      },
    };
    const primary = { raDeg: 212.3, decDeg: 41.7 };
    const t = validateTarget({ name: 'B', ...primary, orbit });
    const jd = besselianEpochToJd(1980.0);
    const star = targetPositionAt(t, jd);
    // Separation and position angle from the two absolute positions, by spherical trigonometry.
    const [a1, d1, a2, d2] = [
      primary.raDeg * DEG,
      primary.decDeg * DEG,
      star.raDeg * DEG,
      star.decDeg * DEG,
    ];
    const hav =
      Math.sin((d2 - d1) / 2) ** 2 + Math.cos(d1) * Math.cos(d2) * Math.sin((a2 - a1) / 2) ** 2; // haversine: exact at small angles
    const rho = ((2 * Math.asin(Math.sqrt(hav))) / DEG) * 3600;
    let pa =
      Math.atan2(
        Math.sin(a2 - a1),
        Math.cos(d1) * Math.tan(d2) - Math.sin(d1) * Math.cos(a2 - a1),
      ) / DEG;
    if (pa < 0) pa += 360;
    expect(rho).toBeCloseTo(0.411, 3); // Meeus Example 57.a (from memory)
    expect(pa).toBeCloseTo(318.4, 1); // Meeus Example 57.a (from memory)
    expect(rho * 1000).toBeCloseTo(predict(validateOrbit(orbit), jd).separationMas, 3);
  });
});
