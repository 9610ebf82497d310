/**
 * Flags that read the campaign's plans (constructed cases): stale predictions answered by a planned
 * epoch, not raised while no site can see the target (dated when it opens), ranked below the
 * periapsis flag; the periapsis flag's coverage of its ± window and the reason for each 0-h night.
 */
import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { computeFlags } from '../../../server/science/plan/index.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { CONSTRAINTS, SITE } from './helpers.ts';

const NOW = parseEpoch('2027-03-01T12:00:00Z');
const orbit = (periapsis: string) => ({
  elements: {
    periodYears: 16,
    periapsis,
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 130,
    ascendingNodeDeg: 230,
    argPeriapsisDeg: 65,
  },
  distancePc: 8000,
  covariance: {
    parameters: ['periodYears', 'periapsisDays'] as const,
    matrix: [
      [1e-8, 0],
      [0, 1],
    ],
  },
});

describe('flags that read the plans', () => {
  // astronomy-engine's Sun on the day: a star 5° from it is inside the 45° avoidance angle for weeks.
  const sun = Astronomy.Equator(
    Astronomy.Body.Sun,
    Astronomy.MakeTime(new Date('2027-03-01T12:00:00Z')),
    new Astronomy.Observer(0, 0, 0),
    false,
    true,
  );
  const hidden = validateTarget({ name: 'Hid', raDeg: sun.ra * 15 + 5, decDeg: sun.dec });
  const seen = validateTarget({
    name: 'Seen',
    raDeg: 266,
    decDeg: -29.5,
    orbit: orbit('2027-06-10T00:00:00Z'),
  });
  const nights = ['2027-06-08', '2027-06-09', '2027-06-11'];
  const flags = computeFlags(
    [
      { target: hidden, system: 'H', cadenceDays: 30, lastMeasuredJd: NOW - 100 },
      {
        target: seen,
        system: 'S',
        cadenceDays: 30,
        lastMeasuredJd: NOW - 100,
        plannedEpochsJd: [parseEpoch('2027-06-09T06:00:00Z')],
      },
    ],
    [{ site: SITE, limits: CONSTRAINTS, nights }],
    { nowJd: NOW, leadDays: [30, 182] },
  );

  it('dates the stale flag of a target behind the Sun when it becomes observable, and ranks it last', () => {
    const st = flags.find((f) => f.kind === 'stale-prediction' && f.target === 'Hid')!;
    console.log(st.reason);
    expect(st.daysAhead).toBeGreaterThan(14); // constructed: 5° from the Sun, which moves ~1°/day; 45° avoidance
    expect(st.reason).toMatch(/no campaign site can observe it until the night of 2027-/);
    expect(flags[flags.length - 1]!.kind).toBe('stale-prediction');
    expect(flags.findIndex((f) => f.kind === 'periapsis-ahead')).toBeLessThan(
      flags.findIndex((f) => f.kind === 'stale-prediction'),
    );
  });

  it('raises no stale flag for a target whose next planned epoch comes within its cadence', () => {
    const planSoon = computeFlags(
      [
        {
          target: seen,
          system: 'S',
          cadenceDays: 30,
          lastMeasuredJd: NOW - 100,
          plannedEpochsJd: [NOW + 10],
        },
      ],
      [{ site: SITE, limits: CONSTRAINTS }],
      { nowJd: NOW, leadDays: [30] },
    );
    expect(planSoon.some((f) => f.kind === 'stale-prediction')).toBe(false); // constructed: planned 10 d ahead, cadence 30 d
  });

  it('says which nights of the window are covered, and whether the most likely one is', () => {
    const p = flags.find((f) => f.kind === 'periapsis-ahead')!;
    console.log(p.periapsis!.coverage.text);
    expect(p.periapsis!.coverage.planned).toEqual([{ site: SITE.name, date: '2027-06-08' }]); // 06:00 UTC on 06-09 is the night of 06-08 at UTC−4 (constructed)
    expect(p.periapsis!.coverage.mostLikelyCovered).toBe(true); // the planned epoch lies 0.75 d before the date
    for (const s of p.periapsis!.sites)
      for (const n of s.nights) expect(n.hours > 0 || (n.words ?? '').length > 5).toBe(true); // every 0-h night names its limit
  });
});
