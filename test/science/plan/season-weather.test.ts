/**
 * Weather-aware season plans and the season Monte Carlo (constructed cases): with one site losing
 * 60 % of its nights and the other 10 %, the plan weighted by the chance each night is clear puts
 * its choices and the periapsis epoch's backup at the reliable site, and its expected coverage of
 * the passage beats the weather-blind plan's in the Monte Carlo; the Monte Carlo's mean coverage
 * agrees with the exact expectation over the nights' outcomes.
 */
import { describe, expect, it } from 'vitest';
import type { OrbitInput } from '../../../server/science/orbit/index.ts';
import {
  coverageProbability,
  planSeason,
  type SeasonPlan,
  type SeasonSite,
  type SeasonTarget,
} from '../../../server/science/plan/index.ts';
import { seasonMonteCarlo } from '../../../server/science/plan/season-monte-carlo.ts';
import { addDays } from '../../../server/science/sky/night.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { EAST_SITE, PASSAGE_KNOWN_TO_0_3_DAYS, SITE, weatherLimits as C } from './helpers.ts';

const EAST = EAST_SITE;
const PERI = '2027-06-10T00:00:00Z';
const ORBIT: OrbitInput = {
  elements: {
    periodYears: 12.5,
    periapsis: PERI,
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 11_500,
  covariance: PASSAGE_KNOWN_TO_0_3_DAYS,
};
const STAR: SeasonTarget = {
  target: validateTarget({ name: 'P1', raDeg: 258.7, decDeg: -33.2, orbit: ORBIT }),
  kinds: ['astrometry'],
  cadenceDays: 4,
};
const range = (a: string, b: string) => {
  const out: string[] = [];
  for (let d = a; d <= b; d = addDays(d, 1)) out.push(d);
  return out;
};
// The first site has every night; the second is allocated around the passage but not on its night.
const NIGHTS_WEST = range('2027-06-01', '2027-06-20');
const NIGHTS_EAST = NIGHTS_WEST.filter((d) => d !== '2027-06-09');
const weights = (dates: string[], clear: number) =>
  Object.fromEntries(dates.map((d) => [d, clear]));
const LOSSY = 0.4; // constructed case: 60 % of nights lost
const RELIABLE = 0.9; // constructed case: 10 % lost
const blindSites: SeasonSite[] = [
  { site: SITE, limits: C(SITE), nights: NIGHTS_WEST },
  { site: EAST, limits: C(EAST), nights: NIGHTS_EAST },
];
const awareSites: SeasonSite[] = [
  { ...blindSites[0]!, nightWeights: weights(NIGHTS_WEST, LOSSY) },
  { ...blindSites[1]!, nightWeights: weights(NIGHTS_EAST, RELIABLE) },
];
const plan = (sites: SeasonSite[]) =>
  planSeason('2027-06-01', '2027-06-20', sites, [STAR], { fillFraction: 0.1 });

describe('a weather-aware season plan (constructed case: 60 % and 10 % of nights lost)', () => {
  const blind = plan(blindSites);
  const aware = plan(awareSites);
  const at = (p: SeasonPlan, site: string) => p.epochs.filter((e) => e.site === site).length;

  it('moves its choices to the reliable site and backs the periapsis epoch there', () => {
    console.log(
      `blind: ${at(blind, SITE.name)} epochs at the lossy site, ${at(blind, EAST.name)} at the reliable one; aware: ${at(aware, SITE.name)} and ${at(aware, EAST.name)}`,
    );
    expect(at(aware, EAST.name)).toBeGreaterThan(at(blind, EAST.name));
    expect(blind.epochs.some((e) => e.why === 'backup')).toBe(false); // every weight 1: nothing to back up
    expect(blind.targets[0]!.backups).toBeNull();
    const said = aware.targets[0]!.backups!;
    console.log(`aware plan's backups: ${said.words}`);
    expect(said.critical).toBeGreaterThan(0);
    expect(said.backedUp).toBeGreaterThan(0);
    expect(said.backedUp).toBeLessThanOrEqual(said.critical);
    const backups = aware.epochs.filter((e) => e.why === 'backup');
    expect(backups.length).toBeGreaterThan(0);
    for (const b of backups) {
      expect(b.site).toBe(EAST.name);
      expect(b.reason).toMatch(
        /backup for the periapsis epoch at Harrow Crest \S+ \(without its night the passage.s coverage falls by [\d.]+ points[^)]*\) \(lost with chance 60 %\)/,
      );
    }
  });

  it('covers the passage better in the Monte Carlo, and the draws match the exact expectation', () => {
    const mc = (p: SeasonPlan) =>
      seasonMonteCarlo(p, awareSites, [STAR], { draws: 4000, seed: 7 }).targets[0]!;
    const b = mc(blind),
      a = mc(aware);
    const se = (d: typeof a) => {
      const m = d.coverage!.distribution.mean;
      return Math.sqrt((m * (1 - m)) / 4000) + 1e-9;
    };
    console.log(
      `expected coverage within 1 d: weather-blind ${b.coverage!.distribution.mean.toFixed(3)}, weather-aware ${a.coverage!.distribution.mean.toFixed(3)}; window covered in ${(100 * b.windowCovered!).toFixed(1)} % and ${(100 * a.windowCovered!).toFixed(1)} % of seasons`,
    );
    expect(a.coverage!.distribution.mean).toBeGreaterThan(
      b.coverage!.distribution.mean + 3 * (se(a) + se(b)),
    );
    // Exact expectation (constructed case): enumerate the outcomes of the nights within 3 d of the passage.
    for (const [p, d] of [
      [blind, b],
      [aware, a],
    ] as const) {
      const near = p.epochs.filter(
        (e) => Math.abs(parseEpoch(e.block.start.utc) - parseEpoch(PERI)) < 3,
      );
      const mid = (e: (typeof near)[number]) =>
        (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2;
      const clear = (e: (typeof near)[number]) => (e.site === SITE.name ? LOSSY : RELIABLE);
      let exact = 0;
      for (let mask = 0; mask < 1 << near.length; mask++) {
        let pr = 1;
        const alive: number[] = [];
        near.forEach((e, k) => {
          const up = (mask >> k) & 1;
          pr *= up ? clear(e) : 1 - clear(e);
          if (up) alive.push(mid(e));
        });
        exact += pr * coverageProbability(parseEpoch(PERI), 0.3, alive, 1);
      }
      const m = d.coverage!.distribution.mean;
      console.log(`mean coverage ${m.toFixed(4)} against the exact ${exact.toFixed(4)}`);
      expect(Math.abs(m - exact)).toBeLessThan(4 * Math.sqrt((exact * (1 - exact)) / 4000) + 0.003);
    }
  });

  it('gives seeded, repeatable percentiles that narrow as fewer nights are lost', () => {
    const one = seasonMonteCarlo(aware, awareSites, [STAR], { draws: 300, seed: 3 });
    const two = seasonMonteCarlo(aware, awareSites, [STAR], { draws: 300, seed: 3 });
    expect(two).toEqual(one);
    const sure = seasonMonteCarlo(aware, blindSites, [STAR], {
      draws: 300,
      seed: 3,
      precisionScatter: 0,
    });
    const s = sure.targets[0]!.periapsisSigmaDays!.percentiles;
    // No loss and no scatter: every draw is the plan's own σ (constructed case)
    expect(s[4]!.value - s[0]!.value).toBeLessThan(1e-12);
    expect(sure.targets[0]!.epochsLost).toBe(0);
    const p = one.targets[0]!.periapsisSigmaDays!.percentiles;
    expect(p[4]!.value).toBeGreaterThan(s[2]!.value); // losing nights can only widen the 95th percentile
    for (const q of p) expect(q.low <= q.value && q.value <= q.high).toBe(true);
  });

  it('draws kept blocks: an obtained one is certain, a planned one is lost with its night', () => {
    // constructed case: one kept block of P1 at the lossy site on the passage's night (clear with
    // chance 0.4), 20 min either side of the passage date.
    const peri = parseEpoch(PERI);
    const keptOn = (obtained: boolean): SeasonSite[] => [
      {
        ...awareSites[0]!,
        kept: {
          '2027-06-09': [
            {
              label: 'block 1',
              target: 'P1',
              kind: 'astrometry',
              startJd: peri - 20 / 1440,
              endJd: peri + 20 / 1440,
              counts: true,
              obtained,
            },
          ],
        },
      },
      awareSites[1]!,
    ];
    const draws = 4000;
    for (const obtained of [true, false]) {
      const sites = keptOn(obtained);
      const p = plan(sites);
      const d = seasonMonteCarlo(p, sites, [STAR], { draws, seed: 11 }).targets[0]!;
      const own = p.epochs.filter((e) => e.target === 'P1');
      const lossOf = (site: string) => (site === SITE.name ? 1 - LOSSY : 1 - RELIABLE);
      // Expected epochs lost per season: each drawn epoch's loss chance (constructed case), the
      // kept block's too when it is only planned.
      const expected = own.reduce((a, e) => a + lossOf(e.site), 0) + (obtained ? 0 : 1 - LOSSY);
      const sd = Math.sqrt(own.length + 1) * 0.5; // at most ½ per epoch
      console.log(
        `kept block ${obtained ? 'obtained' : 'planned'}: ${d.epochs} epochs, ${d.epochsLost.toFixed(3)} lost on average (expected ${expected.toFixed(3)}); window covered in ${(100 * d.windowCovered!).toFixed(1)} % of seasons`,
      );
      expect(d.epochs).toBe(own.length + 1);
      expect(d.kept).toEqual({ obtained: obtained ? 1 : 0, planned: obtained ? 0 : 1 });
      expect(Math.abs(d.epochsLost - expected)).toBeLessThan((4 * sd) / Math.sqrt(draws));
      if (obtained) {
        // The obtained block lies inside the passage's window: every season covers it.
        expect(d.windowCovered).toBe(1);
        // and in every season the date (σ 0.3 d) lies within 1 d of it with chance
        // erf(1 / (0.3 √2)) = 0.9991 (constructed case): even the 5th percentile of coverage is there.
        expect(d.coverage!.distribution.percentiles[0]!.value).toBeGreaterThan(0.99);
      } else {
        expect(d.windowCovered!).toBeLessThan(1);
      }
    }
  });

  it('refuses bad draw settings, naming the field', () => {
    expect(() => seasonMonteCarlo(aware, awareSites, [STAR], { draws: 0, seed: 1 })).toThrow(
      /draws/,
    );
    expect(() => seasonMonteCarlo(aware, awareSites, [STAR], { draws: 10, seed: 1.5 })).toThrow(
      /seed/,
    );
    expect(() =>
      seasonMonteCarlo(aware, awareSites, [STAR], { draws: 10, seed: 1, precisionScatter: 3 }),
    ).toThrow(/precisionScatter/);
    expect(() =>
      planSeason('2027-06-01', '2027-06-03', awareSites, [STAR], { backupLossAbove: 0 }),
    ).toThrow(/backupLossAbove/);
  });
});
