/**
 * The season plan at periapsis (constructed cases): the periapsis star on its best site-nights even
 * when a slow star of higher priority wants the same nights; the σ of the coming passage's date
 * (not of the element T) before and after, against the events engine; the coverage probability
 * against a Monte Carlo of the passage date; repeated epochs on the periapsis night.
 */
import { describe, expect, it } from 'vitest';
import {
  addInformation,
  informationModel,
  jacobians,
  planSeason,
  posteriorCovariance,
  type SeasonSite,
  type SeasonTarget,
} from '../../../server/science/plan/index.ts';
import {
  drawOrbits,
  eventsWithUncertainty,
  findEvents,
  validateOrbit,
  type OrbitInput,
} from '../../../server/science/orbit/index.ts';
import { validateLimits, validateSite, validateTarget } from '../../../server/science/sky/index.ts';
import { parseEpoch } from '../../../server/science/time/index.ts';
import { SITE, isoToJd } from './helpers.ts';

// Invented: a southern site where the star passes the zenith, and a northern one where it culminates near airmass 1.6.
const NORTH = validateSite({
  name: 'Kesh Plateau',
  latitudeDeg: 19.5,
  longitudeDeg: -155.5,
  elevationM: 4000,
  timeZone: 'Pacific/Honolulu',
  lowestAltitudeDeg: 25,
  leastSunDistanceDeg: 45,
});
const C = (s: typeof SITE) => validateLimits({ highestAirmass: 2.2, leastMoonDistanceDeg: 5 }, s);
const PERI = '2027-06-10T00:00:00Z';
const fastOrbit = (
  periapsis: string,
  periodYears: number,
  sigmaT: number,
  sigmaP: number,
): OrbitInput => ({
  elements: {
    periodYears,
    periapsis,
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 11_500,
  covariance: {
    parameters: ['periodYears', 'periapsisDays', 'eccentricity', 'semiMajorAxisArcsec'],
    matrix: [
      [sigmaP ** 2, 0, 0, 0],
      [0, sigmaT ** 2, 0, 0],
      [0, 0, 1e-6, 0],
      [0, 0, 0, 1e-8],
    ],
  },
});
const star = (
  name: string,
  orbit: OrbitInput,
  extra: Partial<SeasonTarget> = {},
): SeasonTarget => ({
  target: validateTarget({ name, raDeg: 258.7, decDeg: -33.2, orbit }),
  kinds: ['astrometry'],
  cadenceDays: 30,
  ...extra,
});
const sites = (nights?: string[]): SeasonSite[] => [
  { site: SITE, limits: C(SITE), ...(nights ? { nights } : {}) },
  { site: NORTH, limits: C(NORTH), ...(nights ? { nights } : {}) },
];

describe('the periapsis window first (constructed campaign)', () => {
  const fast = star('P1', fastOrbit(PERI, 16, 1.5, 0.001));
  const slow = star('Tamsin', fastOrbit('2050-01-01T00:00:00Z', 52, 30, 0.5), {
    priority: 5,
    cadenceDays: 3,
  });
  // Room for one 40-min block a night (10 % of ~8 h of darkness), so the two stars compete for every night.
  const plan = planSeason('2027-06-01', '2027-06-20', sites(), [slow, fast], { fillFraction: 0.1 });
  const p1 = plan.targets.find((t) => t.target === 'P1')!;

  it('puts the periapsis star on every observable night of its window, at the better site', () => {
    const win = [p1.passage!.windowStart.slice(0, 10), p1.passage!.windowEnd.slice(0, 10)];
    const mine = plan.epochs.filter((e) => e.target === 'P1');
    const south = mine.filter((e) => e.site === SITE.name);
    console.log(
      `P1 window ${win.join(' to ')}: ${mine.length} epochs (${south.length} at ${SITE.name}), ${p1.passage!.unused.length} unused site-nights`,
    );
    expect(south.length).toBeGreaterThanOrEqual(5); // ± 2σ = ± 3 d: at least 5 of its 6–7 nights at the zenith site
    const bySite = (s: string) => mine.filter((e) => e.site === s).map((e) => e.precision.airmass);
    expect(Math.max(...bySite(SITE.name))).toBeLessThan(Math.min(...bySite(NORTH.name))); // culmination airmass 1.00 against ~1.6 (90° − |19.5° + 29.5°| = 41°)
    // The slow star, five times the priority, does not take the periapsis night at the better site.
    const periNight = plan.epochs.filter(
      (e) => e.site === SITE.name && Math.abs(isoToJd(e.block.start.utc) - parseEpoch(PERI)) < 0.5,
    );
    expect(periNight.map((e) => e.target)).toEqual(['P1']);
    for (const n of p1.passage!.unused) expect(n.words.length).toBeGreaterThan(5);
  });

  it('names the higher-priority epoch when its cadence night is taken', () => {
    const slowTaken = plan.unmet
      .filter((u) => u.target === 'Tamsin')
      .flatMap((u) => u.nights)
      .filter((n) => n.reason === 'taken');
    expect(slowTaken.length).toBeGreaterThan(0); // constructed: one block a night, P1's window first
    for (const n of slowTaken) expect(n.words).toMatch(/P1 astrometry \(priority 1, periapsis\)/);
  });

  it('shows the precision of every epoch, worse at higher airmass as X^0.6', () => {
    for (const e of plan.epochs) {
      expect(e.precision.unit).toBe('mas');
      // Roddier, Progress in Optics 19 (1981), FWHM ∝ X^0.6 (from memory), σ ∝ FWHM, 1 mas at the zenith (the default)
      expect(e.precision.sigma).toBeCloseTo(Math.max(1, e.precision.airmass) ** 0.6, 9); // airmass below 1 (Kasten & Young's 0.9997 at the zenith) read as 1
    }
  });
});

describe('σ of the coming passage, not of the element T', () => {
  // The element T sits one orbit earlier than the passage planned for; the period's σ widens the coming one.
  const orbit = fastOrbit('2011-06-10T00:00:00Z', 16, 0.5, 0.002);
  const t = star('P2', orbit);
  const plan = planSeason('2027-05-25', '2027-06-25', [sites()[0]!], [t], {});
  const tp = plan.targets[0]!;
  const coming = eventsWithUncertainty(
    validateOrbit(orbit),
    parseEpoch('2027-01-01'),
    parseEpoch('2028-01-01'),
    { kinds: ['periapsis'] },
  )[0]!;

  it('reports before = the events engine σ of the coming passage (1e-6 relative)', () => {
    console.log(
      `element T σ 0.5 d; coming passage ${coming.epoch} σ ${coming.sigmaDays!.toFixed(4)} d; plan before ${tp.shrinkage!.periapsisDays.before!.toFixed(4)} → after ${tp.shrinkage!.periapsisDays.after!.toFixed(4)} d`,
    );
    expect(tp.shrinkage!.passage!.slice(0, 10)).toBe(coming.epoch.slice(0, 10));
    expect(Math.abs(tp.shrinkage!.periapsisDays.before! / coming.sigmaDays! - 1)).toBeLessThan(
      1e-6,
    ); // events engine (ephemeris.ts eventsWithUncertainty)
  });

  it('reports after = the events engine σ on the orbit with the plan’s information added (1e-6 relative)', () => {
    const o = validateOrbit(orbit);
    const m = informationModel(o);
    const n = m.parameters.length;
    const info = new Float64Array(n * n);
    const jds = plan.epochs.map((e) => (isoToJd(e.block.start.utc) + isoToJd(e.block.end.utc)) / 2);
    jacobians(m, Float64Array.from(jds)).forEach((j, k) => {
      addInformation(info, j, n, 'astrometry', {
        astrometryMas: plan.epochs[k]!.precision.sigma,
        spectroscopyKmS: 1,
      });
    });
    const cov = posteriorCovariance(m, info);
    const updated = validateOrbit({
      ...orbit,
      covariance: {
        parameters: m.parameters,
        matrix: m.parameters.map((_, a) => m.parameters.map((_, b) => cov[a * n + b]!)),
      },
    });
    const after = eventsWithUncertainty(
      updated,
      parseEpoch('2027-01-01'),
      parseEpoch('2028-01-01'),
      { kinds: ['periapsis'] },
    )[0]!;
    // events engine on the updated covariance; 1e-5, not 1e-6: its difference steps are 1e-4 of the updated σ, the plan's of the prior σ
    expect(Math.abs(tp.shrinkage!.periapsisDays.after! / after.sigmaDays! - 1)).toBeLessThan(1e-5);
    expect(tp.shrinkage!.periapsisDays.after!).toBeLessThan(tp.shrinkage!.periapsisDays.before!);
  });

  it('gives a coverage probability within 2 points of a Monte Carlo of the passage date', () => {
    const o = validateOrbit(orbit);
    const jds = plan.epochs.map((e) => (isoToJd(e.block.start.utc) + isoToJd(e.block.end.utc)) / 2);
    const w = tp.passage!.coverage.withinDays;
    // Independent route: seeded draws of the orbit from its covariance, the passage of each draw found by the events engine.
    const draws = drawOrbits(o, { draws: 3000, seed: 11 });
    let hit = 0;
    for (const d of draws) {
      const e = findEvents(d, coming.jd - 60, coming.jd + 60, { kinds: ['periapsis'] })[0]!;
      if (jds.some((j) => Math.abs(j - e.jd) <= w)) hit++;
    }
    const mc = hit / draws.length;
    console.log(
      `coverage ± ${w} d: plan ${tp.passage!.coverage.after.toFixed(4)}, Monte Carlo ${mc.toFixed(4)} (3000 draws)`,
    );
    expect(Math.abs(tp.passage!.coverage.after - mc)).toBeLessThan(0.02); // Monte Carlo of the date (3000 draws: sampling σ ≤ 0.9 points)
    expect(tp.passage!.coverage.before).toBe(0); // no kept blocks
  });
});

describe('repeated epochs on the periapsis night', () => {
  const orbit = fastOrbit(PERI, 16, 0.3, 0.0005);
  const one = planSeason('2027-06-08', '2027-06-11', [sites()[0]!], [star('P3', orbit)], {});
  const many = planSeason(
    '2027-06-08',
    '2027-06-11',
    [sites()[0]!],
    [star('P3', orbit, { periapsisRepeat: { step: 'PT1H30M' } })],
    {},
  );

  it('never overlap, keep the changeover gap, and add information over a single epoch', () => {
    const nightOf = (e: { date: string }) => e.date;
    const byNight = new Map<string, typeof many.epochs>();
    for (const e of many.epochs) byNight.set(nightOf(e), [...(byNight.get(nightOf(e)) ?? []), e]);
    const busiest = Math.max(...[...byNight.values()].map((l) => l.length));
    console.log(
      `single: ${one.epochs.length} epochs; every 1.5 h: ${many.epochs.length} (busiest night ${busiest}); σ after ${one.targets[0]!.shrinkage!.periapsisDays.after!.toFixed(4)} → ${many.targets[0]!.shrinkage!.periapsisDays.after!.toFixed(4)} d`,
    );
    expect(busiest).toBeGreaterThanOrEqual(3); // constructed: ~8 h of darkness with the star up, one epoch per 1.5 h
    for (const list of byNight.values()) {
      const s = list
        .map((e) => [isoToJd(e.block.start.utc), isoToJd(e.block.end.utc)] as const)
        .sort((a, b) => a[0] - b[0]);
      for (let k = 1; k < s.length; k++)
        expect(s[k]![0] - s[k - 1]![1]).toBeGreaterThanOrEqual(3 / 1440 - 1e-9); // the same-target changeover gap, 3 min (night-schedule.ts default)
    }
    expect(many.targets[0]!.shrinkage!.periapsisDays.after!).toBeLessThan(
      one.targets[0]!.shrinkage!.periapsisDays.after!,
    ); // Fisher information is additive (common practice, no source)
  });

  it('take their spacing as an ISO 8601 step, and name the earlier hours form', () => {
    const plan = (periapsisRepeat: unknown) => () =>
      planSeason('2027-06-08', '2027-06-11', [sites()[0]!], [star('P3', orbit)], {
        periapsisRepeat: periapsisRepeat as 'single',
      });
    expect(plan({ everyHours: 2 })).toThrow(
      /periapsisRepeat\.everyHours.*is now \{ step \}, an ISO 8601 duration/,
    );
    expect(plan({ step: '2h' })).toThrow(/periapsisRepeat\.step.*ISO 8601 duration/);
    expect(plan({ step: 'PT10M' })).toThrow(/periapsisRepeat\.step.*at least PT30M/);
    expect(plan({ step: 'PT13H' })).toThrow(/periapsisRepeat\.step.*at most PT12H/);
  });
});
