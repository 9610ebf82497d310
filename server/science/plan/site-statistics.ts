/**
 * What a campaign's own log says about a site, per calendar month: the share of allocated time
 * lost (with its reasons), the seeing and Strehl ratio reported, and the precision measurements
 * reached against seeing and airmass per instrument. Every figure carries the number of nights
 * (or measurements) it rests on.
 *
 * The loss fraction of a month is estimated by a Beta prior updated with the log, each night
 * counting as a fractional trial (a night that lost a third of its darkness adds 1/3 to the lost
 * count and 2/3 to the clear count):
 *
 *   prior  Beta(α₀, β₀) with α₀ = s·(1 − c), β₀ = s·c   (c: the user's clear-night fraction, s: its
 *          weight in nights; without a prior the flat Beta(1, 1), i.e. c = ½, s = 2)
 *   after  α = α₀ + Σ fᵢ, β = β₀ + Σ (1 − fᵢ)            (fᵢ: lost share of night i, in [0, 1])
 *   mean   α / (α + β), variance αβ / ((α + β)²(α + β + 1))
 *
 * the conjugate update of a Bernoulli rate (Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4,
 * from memory), with fractional counts as a stated simplification.
 */
import { InputError } from '../errors.ts';
import type { BlockKind } from './candidates.ts';
import { numberIn } from './checks.ts';
import { SEEING_AIRMASS_EXPONENT } from './precision.ts';

/** One logged night at the site. */
export interface LoggedNight {
  /** Local evening date, YYYY-MM-DD (its month is the night's month). */
  date: string;
  /** Allocated time: the night's darkness, hours, ≥ 0. */
  darkHours: number;
  /** Time lost, hours, ≥ 0 (a loss beyond the darkness counts as the whole night). */
  lostHours: number;
  /** Why time was lost, as the report words it ('' when none was lost). */
  lostReason: string;
  seeingArcsec: number | null;
  strehlRatio: number | null;
}

/** A user's prior for one calendar month. */
export interface ClearPrior {
  /** Expected share of clear (usable) night time, [0, 1]. */
  clearFraction: number;
  /** How many nights of log the prior is worth, (0, 1000]. */
  strengthNights: number;
}

/** A measurement the log holds, with the conditions it was made in. */
export interface AchievedMeasurement {
  instrument: string;
  kind: BlockKind;
  /** 1σ: mas for astrometry (per offset component), km/s for a radial velocity. */
  sigma: number;
  /** The night report's seeing, arcsec, or null. */
  seeingArcsec: number | null;
  /** Airmass of the target at the epoch, or null when unknown. */
  airmass: number | null;
}

export interface LossEstimate {
  /** Posterior mean share of allocated time lost, [0, 1]. */
  mean: number;
  /** Posterior 1σ of that share. */
  sigma: number;
  alpha: number;
  beta: number;
  /** Where the prior came from. */
  prior: 'user' | 'flat';
  /** Nights of log the estimate rests on (the prior aside). */
  nights: number;
}

export interface Spread {
  n: number;
  median: number;
  /** 25th and 75th percentiles. */
  q25: number;
  q75: number;
}

export interface MonthStatistics {
  /** Calendar month, 1–12. */
  month: number;
  nights: number;
  darkHours: number;
  lostHours: number;
  /** Σ lost / Σ dark of the log alone, or null with no logged darkness. */
  loggedLossFraction: number | null;
  loss: LossEstimate;
  /** 1 − the posterior loss: the weight a plan gives a night of this month. */
  clearProbability: number;
  reasons: { reason: string; nights: number; hours: number }[];
  seeingArcsec: Spread | null;
  strehlRatio: Spread | null;
}

export interface PrecisionBin {
  /** Lower and upper edge of the bin (seeing arcsec or airmass); upper null: open. */
  low: number;
  high: number | null;
  n: number;
  medianSigma: number | null;
}

export interface AchievedPrecision {
  instrument: string;
  kind: BlockKind;
  unit: 'mas' | 'km/s';
  n: number;
  medianSigma: number;
  bySeeing: PrecisionBin[];
  byAirmass: PrecisionBin[];
  /** Seeing and airmass together: a row per seeing bin (SEEING_BINS), its cells the airmass bins (AIRMASS_BINS). */
  bySeeingAndAirmass: { seeingLow: number; seeingHigh: number | null; byAirmass: PrecisionBin[] }[];
  /**
   * The zenith σ at the reference seeing that the planner's model (σ ∝ seeing · X^0.6) implies:
   * the median of σ · (reference / seeing) · X^−0.6 over measurements with both known; null with none.
   */
  zenith: { sigma: number; referenceSeeingArcsec: number; n: number } | null;
}

export interface SiteStatistics {
  months: MonthStatistics[];
  /** All months together (the prior: the mean of the months' priors, its strength their sum / 12). */
  year: Omit<MonthStatistics, 'month'>;
  precision: AchievedPrecision[];
  rule: string;
}

export const BETA_RULE =
  'loss share per month: Beta(s(1−c), s·c) prior from the clear-night fraction c worth s nights ' +
  '(flat Beta(1, 1) without one), each logged night adding its lost share to α and the rest to ' +
  'β; mean α/(α+β)';

/** Seeing bins, arcsec, and airmass bins of the precision tables. */
export const SEEING_BINS = [0, 0.6, 0.9, 1.2] as const;
export const AIRMASS_BINS = [1, 1.2, 1.5, 2] as const;

/** The lost share of one night, [0, 1] (0 for a night without darkness). */
export function lostShare(n: Pick<LoggedNight, 'darkHours' | 'lostHours'>): number {
  if (!(n.darkHours > 0)) return 0;
  return Math.min(1, Math.max(0, n.lostHours / n.darkHours));
}

/** Check a prior. @throws InputError naming the field. */
export function checkPrior(field: string, p: ClearPrior): ClearPrior {
  numberIn(`${field}.clearFraction`, p.clearFraction, 0, 1);
  const s = numberIn(`${field}.strengthNights`, p.strengthNights, 0, 1000);
  if (!(s > 0)) throw new InputError(`${field}.strengthNights`, s, 'must lie in (0, 1000]');
  return p;
}

/**
 * The posterior of a loss share from a prior and the nights' lost shares (the rule above).
 * @param shares lost share of each night, each in [0, 1]
 */
export function lossPosterior(prior: ClearPrior | null, shares: readonly number[]): LossEstimate {
  const c = prior ? prior.clearFraction : 0.5;
  const s = prior ? prior.strengthNights : 2;
  // A prior at exactly 0 or 1 would be improper on one side: keep a sliver so the mean is defined.
  const a0 = Math.max(1e-6, s * (1 - c)),
    b0 = Math.max(1e-6, s * c);
  let lost = 0;
  for (const f of shares) {
    if (!(f >= 0 && f <= 1)) throw new InputError('share', f, 'must lie in [0, 1]');
    lost += f;
  }
  const alpha = a0 + lost,
    beta = b0 + shares.length - lost;
  const t = alpha + beta;
  return {
    mean: alpha / t,
    sigma: Math.sqrt((alpha * beta) / (t * t * (t + 1))),
    alpha,
    beta,
    prior: prior ? 'user' : 'flat',
    nights: shares.length,
  };
}

/** Median and quartiles by linear interpolation between order statistics, or null for none. */
export function spread(values: readonly number[]): Spread | null {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (v.length === 0) return null;
  const q = (p: number) => {
    const x = p * (v.length - 1);
    const i = Math.floor(x);
    return v[i]! + (x - i) * ((v[Math.min(i + 1, v.length - 1)] ?? v[i]!) - v[i]!);
  };
  return { n: v.length, median: q(0.5), q25: q(0.25), q75: q(0.75) };
}

const monthOf = (date: string) => Number(date.slice(5, 7));

function statistics(
  list: readonly LoggedNight[],
  prior: ClearPrior | null,
): Omit<MonthStatistics, 'month'> {
  const darkHours = list.reduce((h, n) => h + n.darkHours, 0);
  const lostHours = list.reduce((h, n) => h + Math.min(n.lostHours, n.darkHours), 0);
  const loss = lossPosterior(prior, list.map(lostShare));
  const reasons = new Map<string, { nights: number; hours: number }>();
  for (const n of list) {
    if (!(n.lostHours > 0)) continue;
    const key = n.lostReason.trim() || 'no reason given';
    const r = reasons.get(key) ?? { nights: 0, hours: 0 };
    r.nights++;
    r.hours += Math.min(n.lostHours, n.darkHours);
    reasons.set(key, r);
  }
  return {
    nights: list.length,
    darkHours,
    lostHours,
    loggedLossFraction: darkHours > 0 ? lostHours / darkHours : null,
    loss,
    clearProbability: 1 - loss.mean,
    reasons: [...reasons.entries()]
      .map(([reason, r]) => ({ reason, ...r }))
      .sort((a, b) => b.hours - a.hours || a.reason.localeCompare(b.reason)),
    seeingArcsec: spread(list.flatMap((n) => (n.seeingArcsec === null ? [] : [n.seeingArcsec]))),
    strehlRatio: spread(list.flatMap((n) => (n.strehlRatio === null ? [] : [n.strehlRatio]))),
  };
}

function bins(
  edges: readonly number[],
  rows: readonly { x: number | null; sigma: number }[],
): PrecisionBin[] {
  return edges.map((low, i) => {
    const high = edges[i + 1] ?? null;
    const inside = rows.filter((r) => r.x !== null && r.x >= low && (high === null || r.x < high));
    return {
      low,
      high,
      n: inside.length,
      medianSigma: spread(inside.map((r) => r.sigma))?.median ?? null,
    };
  });
}

/** Achieved precision per instrument and kind, with the zenith value the planner's model implies. */
export function achievedPrecision(
  measurements: readonly AchievedMeasurement[],
): AchievedPrecision[] {
  const groups = new Map<string, AchievedMeasurement[]>();
  measurements.forEach((m, i) => {
    if (!(m.sigma > 0)) throw new InputError(`measurements.${i}.sigma`, m.sigma, 'must be > 0');
    const key = `${m.kind}\u0000${m.instrument}`;
    groups.set(key, [...(groups.get(key) ?? []), m]);
  });
  return [...groups.values()]
    .map((list) => {
      const { instrument, kind } = list[0]!;
      const full = list.filter(
        (m) => m.seeingArcsec !== null && m.seeingArcsec > 0 && m.airmass !== null,
      );
      const ref = spread(full.map((m) => m.seeingArcsec!))?.median ?? null;
      const zenith =
        ref === null
          ? null
          : {
              sigma: spread(
                full.map(
                  (m) =>
                    (m.sigma * (ref / m.seeingArcsec!)) /
                    Math.max(1, m.airmass!) ** SEEING_AIRMASS_EXPONENT,
                ),
              )!.median,
              referenceSeeingArcsec: ref,
              n: full.length,
            };
      return {
        instrument,
        kind,
        unit: kind === 'astrometry' ? ('mas' as const) : ('km/s' as const),
        n: list.length,
        medianSigma: spread(list.map((m) => m.sigma))!.median,
        bySeeing: bins(
          SEEING_BINS,
          list.map((m) => ({ x: m.seeingArcsec, sigma: m.sigma })),
        ),
        byAirmass: bins(
          AIRMASS_BINS,
          list.map((m) => ({ x: m.airmass, sigma: m.sigma })),
        ),
        bySeeingAndAirmass: SEEING_BINS.map((seeingLow, i) => {
          const seeingHigh = SEEING_BINS[i + 1] ?? null;
          const row = list.filter(
            (m) =>
              m.seeingArcsec !== null &&
              m.seeingArcsec >= seeingLow &&
              (seeingHigh === null || m.seeingArcsec < seeingHigh),
          );
          return {
            seeingLow,
            seeingHigh,
            byAirmass: bins(
              AIRMASS_BINS,
              row.map((m) => ({ x: m.airmass, sigma: m.sigma })),
            ),
          };
        }),
        zenith,
      };
    })
    .sort((a, b) => a.kind.localeCompare(b.kind) || a.instrument.localeCompare(b.instrument));
}

/**
 * A site's statistics from its log.
 * @param priors by calendar month 1–12 (index 0 is January); null or missing: flat prior
 */
export function siteStatistics(
  nights: readonly LoggedNight[],
  priors: readonly (ClearPrior | null)[],
  measurements: readonly AchievedMeasurement[] = [],
): SiteStatistics {
  nights.forEach((n, i) => {
    const m = monthOf(n.date);
    if (!/^\d{4}-\d{2}-\d{2}$/.test(n.date) || !(m >= 1 && m <= 12))
      throw new InputError(`nights.${i}.date`, n.date, 'must be a date YYYY-MM-DD');
    numberIn(`nights.${i}.darkHours`, n.darkHours, 0, 24);
    numberIn(`nights.${i}.lostHours`, n.lostHours, 0, 24);
  });
  const given = priors.map((p, i) => (p ? checkPrior(`priors.${i}`, p) : null));
  const months = Array.from({ length: 12 }, (_, i) => ({
    month: i + 1,
    ...statistics(
      nights.filter((n) => monthOf(n.date) === i + 1),
      given[i] ?? null,
    ),
  }));
  const known = given.filter((p): p is ClearPrior => p !== null);
  const yearPrior = known.length
    ? {
        clearFraction: known.reduce((a, p) => a + p.clearFraction, 0) / known.length,
        strengthNights: Math.min(1000, known.reduce((a, p) => a + p.strengthNights, 0) / 12),
      }
    : null;
  return {
    months,
    year: statistics(nights, yearPrior),
    precision: achievedPrecision(measurements),
    rule: BETA_RULE,
  };
}

/**
 * The chance each night is clear, for a plan's `nightWeights`: 1 − the posterior loss of its month,
 * kept in [0.01, 1] so no allocated night drops out of a plan altogether.
 */
export function clearNightWeights(
  stats: Pick<SiteStatistics, 'months'>,
  dates: readonly string[],
): Record<string, number> {
  const out: Record<string, number> = {};
  for (const d of dates)
    out[d] = Math.min(1, Math.max(0.01, stats.months[monthOf(d) - 1]!.clearProbability));
  return out;
}
