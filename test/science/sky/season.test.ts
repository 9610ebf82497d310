/**
 * The season map: closed-form sample counts against counting sample by sample, the map against
 * the per-sample fast evaluator on whole nights (with a mask, the Moon and the Sun in play), the
 * season summary's run logic, and a target's best night at opposition.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  nightFrame,
  nightSpan,
  seasonMap,
  validateLimits,
  validateSite,
  validateTarget,
  fastSampler,
  frameTarget,
  darknessFast,
} from '../../../server/science/sky/index.ts';
import { countUp } from '../../../server/science/sky/season-count.ts';
import { summarise } from '../../../server/science/sky/season-summary.ts';
import { brokenLimit } from '../../../server/science/sky/windows.ts';
import { randomTarget, seeded } from './helpers.ts';

const site = validateSite({
  name: 'Loma Serena',
  latitudeDeg: -24.6,
  longitudeDeg: -70.4,
  elevationM: 2600,
  timeZone: 'America/Santiago',
  horizonMask: [
    { azimuthDeg: 30, altitudeDeg: 20 },
    { azimuthDeg: 80, altitudeDeg: 45 },
    { azimuthDeg: 120, altitudeDeg: 10 },
  ],
});

describe('closed-form count', () => {
  it('equals counting sample by sample (property test)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 20, noNaN: true }),
        fc.double({ min: 1e-4, max: 0.1, noNaN: true }),
        fc.integer({ min: 0, max: 400 }),
        fc.double({ min: -1.2, max: 1.2, noNaN: true }),
        (hs, dh, n, cosH0) => {
          let brute = 0;
          for (let k = 0; k < n; k++) if (Math.cos(hs + k * dh) >= cosH0) brute++;
          const closed = countUp(hs, dh, n, cosH0);
          // Samples within 1e-9 rad of the limit may fall either way in floating point.
          let borderline = 0;
          for (let k = 0; k < n; k++)
            if (Math.abs(Math.cos(hs + k * dh) - cosH0) < 1e-9) borderline++;
          return Math.abs(closed - brute) <= borderline;
        },
      ),
      { numRuns: 500, seed: 42 },
    );
  });
});

describe('season map against the per-sample fast evaluator', () => {
  it('the same observable samples on every tested night, mask, Moon and Sun included', () => {
    const rnd = seeded(5);
    const targets = Array.from({ length: 12 }, (_, i) => randomTarget(rnd, `t${i}`));
    const c = validateLimits(
      { highestAirmass: 2.5, leastMoonDistanceDeg: 40, leastSunDistanceDeg: 60 },
      site,
    );
    const map = seasonMap(site, 2027, targets, c, { stepMinutes: 5 });
    expect(map.perSampleTargetNights).toBeGreaterThan(0);
    let compared = 0,
      differing = 0,
      worst = 0;
    for (const night of [3, 47, 95, 140, 188, 240, 301, 350]) {
      const { date } = map.nights[night]!;
      const span = nightSpan(site, date);
      const frame = nightFrame(site, span);
      const dark = darknessFast(frame, c.sunLimitDeg);
      targets.forEach((t, i) => {
        const sample = fastSampler(frame, frameTarget(frame, t));
        let count = 0;
        for (const d of dark) {
          for (let jd = d.startJd; jd <= d.endJd + 1e-9; jd += 5 / 1440)
            if (brokenLimit(sample(jd), c) === null) count++;
        }
        const diff = Math.abs(count - Math.round((map.targets[i]!.hours[night]! * 60) / 5));
        compared++;
        if (diff > 0) differing++;
        worst = Math.max(worst, diff);
      });
    }
    console.log(
      `season counts vs per-sample: ${differing} of ${compared} target-nights differ, worst by ${worst} sample(s)`,
    );
    // Moon knots 2 h apart in the map and 1 h apart here move the Moon by ≤ 0.04°: a boundary sample may flip.
    expect(worst).toBeLessThanOrEqual(1);
    expect(differing).toBeLessThan(compared / 10);
  });
});

describe('season summary', () => {
  const dates = Array.from({ length: 365 }, (_, i) =>
    new Date(Date.UTC(2027, 0, 1 + i)).toISOString().slice(0, 10),
  );
  const counts = (ranges: [number, number][]) => {
    const a = new Int32Array(365);
    for (const [s, e] of ranges) for (let i = s; i <= e; i++) a[i] = 20;
    return a;
  };
  it('bridges short gaps (bright Moon) and keeps the longest run', () => {
    const s = summarise(
      counts([
        [10, 40],
        [45, 100],
        [200, 220],
      ]),
      12,
      7,
      dates,
      60,
      20,
      5,
    );
    expect([s.start, s.end, s.usableNights, s.wrapsYearEnd]).toEqual([
      dates[10],
      dates[100],
      87,
      false,
    ]);
  });
  it('wraps through the year end', () => {
    const s = summarise(
      counts([
        [0, 30],
        [300, 364],
      ]),
      12,
      7,
      dates,
      330,
      20,
      5,
    );
    expect([s.start, s.end, s.wrapsYearEnd, s.usableNights]).toEqual([
      dates[300],
      dates[30],
      true,
      96,
    ]);
  });
  it('all year, and never', () => {
    expect(summarise(counts([[0, 364]]), 12, 7, dates, 0, 20, 5).allYear).toBe(true);
    expect(summarise(new Int32Array(365), 12, 7, dates, -1, -1, 5)).toMatchObject({
      start: null,
      end: null,
      usableNights: 0,
      bestNight: null,
    });
  });
});

describe('best night', () => {
  it('falls near opposition: a target at α = 6h is best in late December', () => {
    const plain = validateSite({
      name: 'Loma Serena',
      latitudeDeg: -24.6,
      longitudeDeg: -70.4,
      elevationM: 2600,
      timeZone: 'America/Santiago',
    });
    const map = seasonMap(
      plain,
      2027,
      [validateTarget({ name: 'opposite the Sun', raDeg: 90, decDeg: -25 })],
      validateLimits({ leastMoonDistanceDeg: 0 }, plain),
    );
    const best = Date.parse(map.targets[0]!.season.bestNight!);
    // The Sun reaches α = 18h at the December solstice (common practice, no source): ±12 days allows for the tie-break on transit time.
    expect(Math.abs(best - Date.parse('2027-12-21')) / 86_400_000).toBeLessThan(12);
    expect(map.targets[0]!.season.start).not.toBeNull();
    expect(map.nights).toHaveLength(365);
  });
});
