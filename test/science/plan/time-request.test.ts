/**
 * The semester time request (constructed case): per site and for the semester, its hours are
 * exactly the plan's blocks plus the stated weather allowance h (1 − c) / c, split by target and
 * kind; the Markdown says the same numbers; the paragraph of a target quotes its own σ.
 */
import { describe, expect, it } from 'vitest';
import { planSeason, type SeasonSite } from '../../../server/science/plan/index.ts';
import { timeRequest, timeRequestMarkdown } from '../../../server/science/plan/time-request.ts';
import { addDays } from '../../../server/science/sky/night.ts';
import { validateLimits, validateTarget } from '../../../server/science/sky/index.ts';
import { EAST_SITE, SITE } from './helpers.ts';

const EAST = EAST_SITE;
const dates = Array.from({ length: 30 }, (_, d) => addDays('2027-06-01', d));
// constructed case: each night's clear chance varies, 0.3 to 0.93
const clearOf = (k: number, s: number) => 0.3 + ((k * 7 + s * 3) % 10) * 0.07;
const weights = (s: number) => Object.fromEntries(dates.map((d, k) => [d, clearOf(k, s)]));
const sites: SeasonSite[] = [SITE, EAST].map((site, s) => ({
  site,
  limits: validateLimits({ highestAirmass: 2.2 }, site),
  nightWeights: weights(s),
}));
const star = (name: string, ra: number) =>
  validateTarget({
    name,
    raDeg: ra,
    decDeg: -33.2,
    orbit: {
      elements: {
        periodYears: 12.5,
        periapsis: '2027-06-15T00:00:00Z',
        eccentricity: 0.9,
        semiMajorAxisArcsec: 0.12,
        inclinationDeg: 47,
        ascendingNodeDeg: 318,
        argPeriapsisDeg: 152,
      },
      distancePc: 11_500,
      covariance: {
        parameters: ['periodYears', 'periapsisDays', 'semiMajorAxisArcsec'],
        matrix: [
          [1e-4, 0, 0],
          [0, 4, 0],
          [0, 0, 1e-8],
        ],
      },
    },
  });
const plan = planSeason('2027-06-01', '2027-06-30', sites, [
  { target: star('P1', 266), kinds: ['astrometry', 'spectroscopy'], cadenceDays: 5 },
  { target: star('P2', 250), kinds: ['astrometry'], cadenceDays: 10 },
]);
const clear = { [SITE.name]: weights(0), [EAST.name]: weights(1) };

describe('the semester time request', () => {
  const r = timeRequest(
    { name: '2027A', startDate: '2027-06-01', endDate: '2027-06-30' },
    plan,
    clear,
  );

  it('asks per site for the plan’s blocks plus the stated allowance, exactly', () => {
    expect(plan.epochs.length).toBeGreaterThan(0);
    for (const s of r.sites) {
      const mine = plan.epochs.filter((e) => e.site === s.site);
      const hours = mine.reduce((h, e) => h + e.block.minutes / 60, 0);
      const allowance = mine.reduce((h, e) => {
        const c = clear[s.site]![e.date]!;
        return h + ((e.block.minutes / 60) * (1 - c)) / c; // the allowance rule stated in the request (constructed case)
      }, 0);
      console.log(`${s.site}: ${hours.toFixed(2)} h of blocks + ${allowance.toFixed(2)} h weather`);
      expect(s.hours).toBeCloseTo(hours, 10);
      expect(s.allowanceHours).toBeCloseTo(allowance, 10);
      expect(s.requestHours).toBeCloseTo(hours + allowance, 10);
      expect(s.nights).toBe(new Set(mine.map((e) => e.date)).size);
      expect(s.byTarget.reduce((h, b) => h + b.hours, 0)).toBeCloseTo(hours, 10);
      expect(s.byTarget.reduce((h, b) => h + b.blocks, 0)).toBe(mine.length);
    }
    const blocks = plan.epochs.reduce((h, e) => h + e.block.minutes / 60, 0);
    expect(r.totals.hours).toBeCloseTo(blocks, 10);
    expect(r.totals.requestHours).toBeCloseTo(r.totals.hours + r.totals.allowanceHours, 10);
  });

  it('writes the same numbers in Markdown and a paragraph per target from its own σ', () => {
    const md = timeRequestMarkdown(r);
    expect(md).toContain(`Expected results: ${r.method}.`); // says how with/without are reckoned
    expect(r.method).toMatch(/Fisher/);
    expect(md).toContain(`Total: ${r.totals.requestHours.toFixed(1)} h`);
    for (const s of r.sites) expect(md).toContain(`## ${s.site}: ${s.requestHours.toFixed(1)} h`);
    const p1 = r.targets.find((t) => t.target === 'P1')!;
    expect(p1.reason).toContain(`${p1.hours.toFixed(1)} h`);
    expect(p1.reason).toContain(`± ${(p1.periapsisSigmaDays.with! * 24).toFixed(1)} h`);
    expect(p1.periapsisSigmaDays.with!).toBeLessThan(p1.periapsisSigmaDays.without!);
  });
});
