/**
 * A campaign's candidates for one night (constructed cases): per-target block length, priority and
 * laser guide star use per kind, never a hidden rule; inside the periapsis window, repeated
 * epochs that the night scheduler places without overlap and with the changeover gap.
 */
import { describe, expect, it } from 'vitest';
import {
  nightCandidates,
  scheduleNight,
  type SeasonTarget,
} from '../../../server/science/plan/index.ts';
import { validateLimits, validateTarget } from '../../../server/science/sky/index.ts';
import { SITE, isoToJd } from './helpers.ts';

const LIMITS = validateLimits({ highestAirmass: 2.2, leastMoonDistanceDeg: 5 }, SITE);
const orbit = (periapsis: string) => ({
  elements: {
    periodYears: 12.5,
    periapsis,
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 11_500,
  covariance: {
    parameters: ['periodYears', 'periapsisDays'] as const,
    matrix: [
      [1e-8, 0],
      [0, 0.25],
    ],
  },
});
const targets: SeasonTarget[] = [
  {
    target: validateTarget({
      name: 'Near',
      raDeg: 258.7,
      decDeg: -33.2,
      orbit: orbit('2027-06-10T05:00:00Z'),
    }),
    kinds: ['astrometry', 'spectroscopy'],
    cadenceDays: 30,
    priority: 3,
    blockMinutes: { spectroscopy: 30 },
    laserGuideStar: { spectroscopy: true },
    periapsisRepeat: { step: 'PT2H' },
  },
  {
    target: validateTarget({
      name: 'Far',
      raDeg: 270,
      decDeg: -25,
      orbit: orbit('2035-01-01T00:00:00Z'),
    }),
    kinds: ['astrometry', 'spectroscopy'],
    cadenceDays: 30,
  },
];

describe('a campaign’s candidates for a night', () => {
  const cands = nightCandidates(SITE, LIMITS, true, '2027-06-09', targets, {
    laserGuideStar: { astrometry: true },
  });

  it('reads each target’s own settings, the campaign’s otherwise', () => {
    const far = cands.filter((c) => c.target === 'Far');
    expect(far.map((c) => c.id)).toEqual(['Far:astrometry', 'Far:spectroscopy']);
    expect(far.map((c) => c.durationMinutes)).toEqual([40, 60]); // the planner's default lengths
    expect(far.map((c) => c.laserGuideStar)).toEqual([true, false]); // the campaign's setting per kind
    expect(far.map((c) => c.priority)).toEqual([1, 1]);
    const near = cands.filter((c) => c.target === 'Near');
    expect(near.every((c) => c.priority === 6)).toBe(true); // its priority 3, doubled in its periapsis window
    expect(
      near
        .filter((c) => c.kind === 'spectroscopy')
        .every((c) => c.durationMinutes === 30 && c.laserGuideStar),
    ).toBe(true);
    // the target sets only spectroscopy: its astrometry takes the campaign's setting (true)
    expect(near.filter((c) => c.kind === 'astrometry').every((c) => c.laserGuideStar)).toBe(true); // the target's own setting leaves astrometry to the campaign's: true, but…
  });

  it('no laser guide star at a site without one, whatever the settings', () => {
    const none = nightCandidates(SITE, LIMITS, false, '2027-06-09', targets, {
      laserGuideStar: { astrometry: true },
    });
    expect(none.some((c) => c.laserGuideStar)).toBe(false);
  });

  it('repeats epochs on the periapsis night, which the scheduler fills without overlap', () => {
    const near = cands.filter((c) => c.target === 'Near' && c.kind === 'astrometry');
    expect(near.length).toBeGreaterThanOrEqual(3); // ~9 h of darkness, one part every 2 h (constructed)
    const s = scheduleNight(
      SITE,
      LIMITS,
      '2027-06-09',
      targets.map((t) => t.target),
      { candidates: cands },
    );
    const mine = s.blocks.filter((b) => b.target === 'Near');
    console.log(
      `periapsis night: ${mine.length} blocks of Near (${s.method}), ${s.leftOut.length} left out`,
    );
    expect(mine.length).toBeGreaterThan(2);
    const iv = s.blocks
      .map((b) => [isoToJd(b.start.utc), isoToJd(b.end.utc), b.target] as const)
      .sort((a, b) => a[0] - b[0]);
    for (let k = 1; k < iv.length; k++) {
      const gap = iv[k]![2] === iv[k - 1]![2] ? 3 : 8; // the scheduler's changeover defaults, minutes (night-schedule.ts)
      expect((iv[k]![0] - iv[k - 1]![1]) * 1440).toBeGreaterThanOrEqual(gap - 1e-6);
    }
    for (const c of near) {
      const b = s.blocks.find((x) => x.id === c.id);
      if (!b) continue;
      expect(isoToJd(b.start.utc)).toBeGreaterThanOrEqual(isoToJd(c.earliestStart!) - 1e-9); // inside its timing window
      expect(isoToJd(b.end.utc)).toBeLessThanOrEqual(isoToJd(c.latestEnd!) + 1e-9);
    }
  });
});
