import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import { SeededRandom } from '../../../server/science/random.ts';
import {
  achievedPrecision,
  clearNightWeights,
  lossPosterior,
  siteStatistics,
  spread,
  type LoggedNight,
} from '../../../server/science/plan/site-statistics.ts';

const night = (date: string, lostHours: number, darkHours = 10, reason = ''): LoggedNight => ({
  date,
  darkHours,
  lostHours,
  lostReason: reason,
  seeingArcsec: null,
  strehlRatio: null,
});

describe('the Beta-prior update', () => {
  it('matches its closed form', () => {
    // constructed case: prior c = 0.8 worth 10 nights → Beta(2, 8); shares 1, 0.5, 0, 0 → α = 3.5, β = 10.5
    const p = lossPosterior({ clearFraction: 0.8, strengthNights: 10 }, [1, 0.5, 0, 0]);
    expect(p.alpha).toBeCloseTo(3.5, 12);
    expect(p.beta).toBeCloseTo(10.5, 12);
    expect(p.mean).toBeCloseTo(3.5 / 14, 12);
    // Beta variance αβ/((α+β)²(α+β+1)) (Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4, from memory)
    expect(p.sigma).toBeCloseTo(Math.sqrt((3.5 * 10.5) / (14 * 14 * 15)), 12);
    expect(p.nights).toBe(4);
    expect(p.prior).toBe('user');
  });

  it('without a prior is the flat Beta(1, 1): Laplace’s rule of succession for whole nights', () => {
    // Laplace's rule (k + 1)/(n + 2) (common practice, no source): 3 lost of 10 → 4/12
    const p = lossPosterior(null, [1, 1, 1, 0, 0, 0, 0, 0, 0, 0]);
    expect(p.mean).toBeCloseTo(4 / 12, 12);
    expect(p.prior).toBe('flat');
  });

  it('with no log returns the prior itself, and the log wins as nights accumulate', () => {
    // constructed case
    expect(lossPosterior({ clearFraction: 0.7, strengthNights: 5 }, []).mean).toBeCloseTo(0.3, 12);
    const many = lossPosterior({ clearFraction: 0.9, strengthNights: 5 }, Array(500).fill(0.6));
    expect(many.mean).toBeCloseTo((0.5 + 300) / 505, 12);
  });

  it('refuses a share outside [0, 1] and a prior out of range, naming the field', () => {
    expect(() => lossPosterior(null, [1.2])).toThrow(InputError);
    expect(() => siteStatistics([], [{ clearFraction: 1.5, strengthNights: 3 }])).toThrow(
      /priors\.0\.clearFraction/,
    );
    expect(() => siteStatistics([], [{ clearFraction: 0.5, strengthNights: 0 }])).toThrow(
      /priors\.0\.strengthNights/,
    );
    expect(() => siteStatistics([night('2026-13-01', 0)], [])).toThrow(/nights\.0\.date/);
  });
});

describe('loss statistics from a log', () => {
  it('recover a constructed log’s loss fractions exactly, month by month, with reasons', () => {
    // constructed case: March loses 3 of 10 whole nights plus half of one; July loses nothing
    const log: LoggedNight[] = [];
    for (let k = 0; k < 10; k++)
      log.push(
        night(
          `2027-03-${String(k + 1).padStart(2, '0')}`,
          k < 3 ? 10 : k === 3 ? 5 : 0,
          10,
          k < 3 ? 'fog' : 'wind',
        ),
      );
    for (let k = 0; k < 8; k++) log.push(night(`2027-07-${String(k + 1).padStart(2, '0')}`, 0, 8));
    const s = siteStatistics(log, []);
    const march = s.months[2]!;
    expect(march.nights).toBe(10);
    expect(march.loggedLossFraction).toBeCloseTo(0.35, 12);
    expect(march.lostHours).toBeCloseTo(35, 12);
    expect(march.reasons).toEqual([
      { reason: 'fog', nights: 3, hours: 30 },
      { reason: 'wind', nights: 1, hours: 5 },
    ]);
    expect(march.loss.mean).toBeCloseTo((1 + 3.5) / 12, 12);
    expect(s.months[6]!.loggedLossFraction).toBe(0);
    expect(s.months[0]!.nights).toBe(0);
    expect(s.months[0]!.loggedLossFraction).toBeNull();
    expect(s.year.nights).toBe(18);
  });

  it('recover seeded loss probabilities within the binomial error', () => {
    // constructed case: whole nights lost with probability 0.6 in May and 0.1 in June, 400 nights each
    const rnd = new SeededRandom(11);
    const log: LoggedNight[] = [];
    const truth = { 5: 0.6, 6: 0.1 } as const;
    for (const [m, p] of Object.entries(truth))
      for (let k = 0; k < 400; k++)
        log.push(
          night(
            `20${30 + (k % 13)}-0${m}-${String(1 + (k % 28)).padStart(2, '0')}`,
            rnd.uniform() < p ? 9 : 0,
            9,
          ),
        );
    const s = siteStatistics(log, []);
    for (const [m, p] of Object.entries(truth)) {
      const est = s.months[Number(m) - 1]!;
      const se = Math.sqrt((p * (1 - p)) / 400);
      console.log(
        `month ${m}: true ${p}, logged ${est.loggedLossFraction!.toFixed(3)} ± ${se.toFixed(3)}`,
      );
      expect(Math.abs(est.loggedLossFraction! - p)).toBeLessThan(3 * se);
      expect(Math.abs(est.loss.mean - p)).toBeLessThan(3 * se);
      expect(est.loss.sigma).toBeCloseTo(se, 2);
    }
  });

  it('count a loss beyond the darkness as the whole night', () => {
    // constructed case
    const s = siteStatistics([night('2027-01-05', 12, 9)], []);
    expect(s.months[0]!.loggedLossFraction).toBe(1);
  });

  it('give each night a clear weight from its month', () => {
    // constructed case: January prior 0.25 clear worth 4 nights, nothing logged
    const priors = [{ clearFraction: 0.25, strengthNights: 4 }];
    const w = clearNightWeights(siteStatistics([], priors), ['2027-01-10', '2027-02-10']);
    expect(w['2027-01-10']).toBeCloseTo(0.25, 12);
    expect(w['2027-02-10']).toBeCloseTo(0.5, 12);
  });
});

describe('spreads and achieved precision', () => {
  it('quartiles by interpolation between order statistics', () => {
    // numpy.percentile default ('linear') of [1, 2, 3, 4]: 1.75, 2.5, 3.25 (from memory)
    expect(spread([4, 1, 3, 2])).toEqual({ n: 4, median: 2.5, q25: 1.75, q75: 3.25 });
    expect(spread([])).toBeNull();
  });

  it('recover the zenith σ of measurements made to the planner’s model', () => {
    // constructed case: σ = 0.8 mas · (seeing/0.6) · X^0.6 exactly
    const rows = [
      [0.5, 1.0],
      [0.6, 1.3],
      [0.7, 1.6],
      [1.0, 2.1],
      [0.6, 1.1],
    ].map(([seeing, x]) => ({
      instrument: 'imager',
      kind: 'astrometry' as const,
      sigma: 0.8 * (seeing! / 0.6) * x! ** 0.6,
      seeingArcsec: seeing!,
      airmass: x!,
    }));
    const [p] = achievedPrecision(rows);
    expect(p!.n).toBe(5);
    expect(p!.zenith!.referenceSeeingArcsec).toBe(0.6);
    expect(p!.zenith!.sigma).toBeCloseTo(0.8, 10);
    expect(p!.bySeeing.map((b) => b.n)).toEqual([1, 3, 1, 0]);
    expect(p!.byAirmass.map((b) => b.n)).toEqual([2, 1, 1, 1]);
    // constructed case, seeing rows × airmass cells: (0.5, 1.0) | (0.6, 1.3), (0.7, 1.6), (0.6, 1.1) | (1.0, 2.1)
    expect(p!.bySeeingAndAirmass.map((r) => r.byAirmass.map((b) => b.n))).toEqual([
      [1, 0, 0, 0],
      [1, 1, 1, 0],
      [0, 0, 0, 1],
      [0, 0, 0, 0],
    ]);
    const cell = p!.bySeeingAndAirmass[1]!.byAirmass[1]!;
    expect(cell.medianSigma).toBeCloseTo(0.8 * (0.6 / 0.6) * 1.3 ** 0.6, 12);
  });
});
