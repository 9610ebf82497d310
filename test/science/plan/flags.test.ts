/**
 * Flags on constructed cases whose answers are known in closed form or by an independent route.
 */
import { describe, expect, it } from 'vitest';
import { computeFlags } from '../../../server/science/plan/index.ts';
import { drawOrbits, findEvents, validateOrbit } from '../../../server/science/orbit/index.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { CONSTRAINTS, SITE } from './helpers.ts';

const SITES = [{ site: SITE, limits: CONSTRAINTS }];

describe('periapsis flags', () => {
  it('dates a periapsis and its 1σ as a Monte Carlo over the covariance does', () => {
    const orbit = {
      elements: {
        periodYears: 6.2,
        periapsis: '2027-09-20T00:00:00Z',
        eccentricity: 0.72,
        semiMajorAxisArcsec: 0.21,
        inclinationDeg: 63,
        ascendingNodeDeg: 40,
        argPeriapsisDeg: 110,
      },
      distancePc: 120,
      covariance: {
        parameters: ['periodYears', 'periapsisDays', 'eccentricity'],
        matrix: [
          [0.0004, 0.05, 0],
          [0.05, 36, 0],
          [0, 0, 0.0001],
        ],
      },
    };
    const target = validateTarget({ name: 'Q1', raDeg: 200, decDeg: -40, orbit });
    const now = parseEpoch('2026-12-01T00:00:00Z');
    const flag = computeFlags([{ target, system: 'Q' }], SITES, {
      nowJd: now,
      leadDays: [30, 365],
    }).find((f) => f.kind === 'periapsis-ahead')!;
    // Independent route: seeded draws of the orbit from its covariance, the next periapsis of each.
    const times = drawOrbits(validateOrbit(orbit as never), { draws: 4000, seed: 11 }).map(
      (o) => findEvents(o, now, now + 800, { kinds: ['periapsis'] })[0]!.jd,
    );
    const mean = times.reduce((a, b) => a + b, 0) / times.length;
    const sd = Math.sqrt(times.reduce((a, b) => a + (b - mean) ** 2, 0) / (times.length - 1));
    const flagJd = parseEpoch(flag.date);
    console.log(
      `periapsis: flag ${flag.date} ± ${flag.periapsis!.sigmaDays!.toFixed(3)} d; Monte Carlo mean offset ${(mean - flagJd).toFixed(3)} d, σ ${sd.toFixed(3)} d`,
    );
    expect(Math.abs(mean - flagJd)).toBeLessThan((3 * sd) / Math.sqrt(times.length) + 0.05); // Monte Carlo mean, within its standard error
    expect(flag.periapsis!.sigmaDays! / sd).toBeGreaterThan(0.95); // Monte Carlo σ (4000 draws: ±1.1 % sampling error)
    expect(flag.periapsis!.sigmaDays! / sd).toBeLessThan(1.05);
    expect(flag.periapsis!.band).toBe('within 365 days'); // 293 days ahead: the 365-day band of this request
  });

  it('reports a periapsis at solar conjunction as unobservable, lost in the Sun', () => {
    // At the June solstice the Sun stands at RA 6h (90°), Dec +23.44° (Astronomical Almanac, from memory).
    const target = validateTarget({
      name: 'Glare b',
      raDeg: 90.5,
      decDeg: 23.2,
      orbit: {
        elements: {
          periodYears: 3,
          periapsis: '2027-06-21T12:00:00Z',
          eccentricity: 0.5,
          semiMajorAxisArcsec: 0.05,
          inclinationDeg: 30,
          ascendingNodeDeg: 10,
          argPeriapsisDeg: 20,
        },
      },
    });
    const flags = computeFlags([{ target, system: 'G' }], SITES, {
      nowJd: parseEpoch('2027-01-01T00:00:00Z'),
    });
    const lost = flags.find((f) => f.kind === 'periapsis-unobservable')!;
    expect(lost).toBeDefined();
    expect(lost.reason).toMatch(/Sun-avoidance/);
    expect(lost.periapsis!.sites[0]!.maxHours).toBe(0);
  });
});

describe('blend flags', () => {
  it('finds the blends of two counter-rotating circular face-on orbits where geometry puts them', () => {
    // Same P and a, i = 0° and 180°, both at the node at T: separation 2a·|sin(2π(t−T)/P)|, so they
    // meet at T + kP/2 and stay within ρ for |t − T − kP/2| < asin(ρ/2a)·P/(2π) (plane geometry).
    const P = 2,
      a = 0.1,
      rho = 20;
    const el = (i: number) => ({
      elements: {
        periodYears: P,
        periapsis: '2027-01-01T00:00:00Z',
        eccentricity: 0,
        semiMajorAxisArcsec: a,
        inclinationDeg: i,
        ascendingNodeDeg: 0,
        argPeriapsisDeg: 0,
      },
    });
    const A = validateTarget({ name: 'A', raDeg: 10, decDeg: -20, orbit: el(0) });
    const B = validateTarget({ name: 'B', raDeg: 10, decDeg: -20, orbit: el(180) });
    const now = parseEpoch('2026-10-01T00:00:00Z');
    const blends = computeFlags(
      [
        { target: A, system: 'S' },
        { target: B, system: 'S' },
      ],
      [],
      { nowJd: now, resolutionMas: rho, leadDays: [800] },
    ).filter((f) => f.kind === 'blend-risk');
    const T = parseEpoch('2027-01-01T00:00:00Z');
    const half = (Math.asin(rho / (2 * a * 1000)) * P * 365.25) / (2 * Math.PI);
    const expected = [0, 1, 2]
      .map((k) => T + (k * P * 365.25) / 2)
      .filter((c) => c - half > now && c + half < now + 800);
    expect(blends).toHaveLength(expected.length);
    let worst = 0;
    blends.forEach((f, k) => {
      const s = parseEpoch(f.blend!.start),
        e = parseEpoch(f.blend!.end);
      worst = Math.max(
        worst,
        Math.abs(s - (expected[k]! - half)),
        Math.abs(e - (expected[k]! + half)),
      );
      expect(f.blend!.closestMas).toBeLessThan(1);
    });
    console.log(
      `blend edges: worst error ${(worst * 24).toFixed(3)} h over ${blends.length} blends (half-width ${half.toFixed(2)} d)`,
    );
    expect(worst).toBeLessThan(0.02); // 0.01-day bisection of the search (half an hour)
  });
});

describe('stale flags', () => {
  it('flags a target not measured for longer than its cadence', () => {
    const target = validateTarget({ name: 'Old', raDeg: 10, decDeg: -20 });
    const now = parseEpoch('2027-01-01T00:00:00Z');
    const f = computeFlags(
      [{ target, system: 'S', cadenceDays: 30, lastMeasuredJd: now - 45 }],
      [],
      { nowJd: now },
    );
    expect(f).toHaveLength(1);
    expect(f[0]!.reason).toMatch(/is 45 days old, longer than its 30-day cadence/); // constructed: measured 45 d before now, no site to wait for
  });
});
