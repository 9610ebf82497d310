/**
 * A seeded Monte Carlo of a season as planned: in each draw every site-night of the plan is lost
 * with its chance (1 − its `nightWeights` entry; all epochs of a night go together), and the epochs
 * of each surviving night reach their expected σ times a factor exp(s·z), z ~ N(0, 1), one per
 * night (a night's seeing moves all its epochs together; s = `precisionScatter`). For each target
 * and draw, the linear (Fisher) 1σ that a refit would report after the season: of the coming
 * passage's date, of the mass (as a fraction), and of each relativity factor (from the target's
 * measurements and the surviving epochs, when the orbit has a distance); and the coverage of the
 * passage by the surviving epochs. The answer is the distribution over draws: percentiles, with the
 * rank interval that states each percentile's sampling error, and the share of draws in which at
 * least one epoch survives in the passage's window.
 *
 * Blocks kept on the plan's nights (SeasonSite.kept, those that count for a target) join the
 * draws: one already obtained is certain (never lost, its σ as expected), one still only planned
 * (pinned, made by hand) is lost with its night like the plan's own epochs. Its σ is the site's
 * precision model at its middle airmass, as the planner reckons it.
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { InputError } from '../errors.ts';
import { fisherRows } from '../orbit/fit/fisher.ts';
import type { MeasurementInput, RelativityFactorName } from '../orbit/fit/types.ts';
import { SeededRandom } from '../random.ts';
import { parseEpoch } from '../time/index.ts';
import { numberIn } from './checks.ts';
import type { BlockKind } from './candidates.ts';
import {
  DEFAULT_PRECISION,
  precisionAt,
  precisionModel,
  type PrecisionModel,
} from './precision.ts';
import { airmassAt } from './site-log.ts';
import { FORECAST_FACTORS, plannedMeasurement } from './forecast.ts';
import { addInformation, informationModel, jacobians, posteriorCovariance } from './information.ts';
import { coverageProbability, passagesIn, quadratic } from './passage.ts';
import type { SeasonPlan, SeasonSite, SeasonTarget } from './season-types.ts';

/** The term each relativity factor scales (the redshift factor scales transverse Doppler with it). */
const FACTOR_TERM = {
  redshiftFactor: 'gravitationalRedshift',
  precessionFactor: 'precession',
} as const satisfies Record<RelativityFactorName, string>;

/** Percentiles every distribution reports. */
export const DRAW_PERCENTILES = [5, 16, 50, 84, 95] as const;

export interface DrawOptions {
  /** Number of seasons drawn, [1, 20000]. */
  draws: number;
  /** Seed of the draws (an unsigned 32-bit integer). */
  seed: number;
  /** s of the per-night precision factor exp(s·z), [0, 2]; default 0.25. */
  precisionScatter?: number;
  /** Half-width of the passage window in σ, as the plan used it; default 2. */
  periapsisWindowSigma?: number;
  /** An epoch within this many days of the passage date covers it; default 1. */
  coverageWithinDays?: number;
  /** Keep each draw's values (for checks against refits); default false. */
  keepSamples?: boolean;
  /** The campaign's precision model (over each site's), for kept blocks' σ, as the plan used it. */
  precision?: Partial<PrecisionModel>;
}

/** A distribution over draws: percentiles (DRAW_PERCENTILES), mean, and how many draws gave a value. */
export interface Distribution {
  percentiles: { p: number; value: number; low: number; high: number }[];
  mean: number;
  n: number;
  samples?: number[];
}

export interface TargetDraws {
  target: string;
  /** The plan's epochs of the target and its kept blocks that count (obtained ones among them). */
  epochs: number;
  kept: { planned: number; obtained: number };
  /** The passage drawn for (the coming one in the plan's range), or null. */
  passage: { date: string; sigmaDaysNow: number | null } | null;
  periapsisSigmaDays: Distribution | null;
  massFraction: Distribution | null;
  factors: { name: RelativityFactorName; sigma: Distribution | null }[];
  /** Probability-weighted coverage of the passage by the surviving epochs. */
  coverage: { withinDays: number; distribution: Distribution } | null;
  /** Share of draws in which at least one epoch survives inside the passage's window. */
  windowCovered: number | null;
  /** Mean number of the target's epochs lost per season. */
  epochsLost: number;
}

export interface SeasonDraws {
  draws: number;
  seed: number;
  precisionScatter: number;
  targets: TargetDraws[];
  assumptions: string;
}

/** Target input of the draws: the planner's target, with its measurements for the relativity factors. */
export interface DrawTarget extends SeasonTarget {
  measurements?: MeasurementInput[];
}

/**
 * The value at percentile p (linear between order statistics) and the values at the ranks
 * N·p/100 ∓ 2√(N p (1 − p)) (about 95 % of repeated runs put the percentile inside them).
 */
export function distribution(values: number[], keep = false): Distribution | null {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  const n = v.length;
  if (n === 0) return null;
  const at = (q: number) => {
    const x = Math.min(n - 1, Math.max(0, q * (n - 1)));
    const i = Math.floor(x);
    return v[i]! + (x - i) * ((v[Math.min(i + 1, n - 1)] ?? v[i]!) - v[i]!);
  };
  return {
    percentiles: DRAW_PERCENTILES.map((p) => {
      const q = p / 100;
      const spread = (2 * Math.sqrt(n * q * (1 - q))) / n;
      return { p, value: at(q), low: at(q - spread), high: at(q + spread) };
    }),
    mean: v.reduce((a, x) => a + x, 0) / n,
    n,
    ...(keep ? { samples: values } : {}),
  };
}

/** σ of the parameters `which` from information F (n×n), or NaN where F is singular. */
function sigmasFrom(F: Float64Array, n: number, which: readonly number[]): number[] {
  const d = Array.from({ length: n }, (_, i) => Math.sqrt(F[i * n + i]!));
  if (d.some((x) => !(x > 0))) return which.map(() => Number.NaN);
  const scaled = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    // Symmetrised: weighted sums of products can differ in the last bit between (i, j) and (j, i).
    for (let j = 0; j < n; j++)
      scaled.set(i, j, (F[i * n + j]! + F[j * n + i]!) / (2 * d[i]! * d[j]!));
  const chol = new CholeskyDecomposition(scaled);
  if (!chol.isPositiveDefinite()) return which.map(() => Number.NaN);
  const inv = chol.solve(Matrix.eye(n));
  return which.map((k) => {
    const v = inv.get(k, k);
    return v > 0 && v < 1e12 ? Math.sqrt(v) / d[k]! : Number.NaN;
  });
}

interface Night {
  loss: number;
}

/** One planned epoch as the draws see it. */
interface DrawEpoch {
  /** Index of its site-night, or -1: obtained already, never lost. */
  night: number;
  jd: number;
  /** Information at the nominal σ (n×n) for the orbit model, and rows for the relativity model. */
  info: Float64Array | null;
  factorRows: Float64Array[] | null;
}

function checkOptions(o: DrawOptions) {
  const draws = numberIn('draws', o.draws, 1, 20000);
  if (!Number.isInteger(draws)) throw new InputError('draws', o.draws, 'must be a whole number');
  const seed = numberIn('seed', o.seed, 0, 2 ** 32 - 1);
  if (!Number.isInteger(seed)) throw new InputError('seed', o.seed, 'must be a whole number');
  return {
    draws,
    seed,
    scatter: numberIn('precisionScatter', o.precisionScatter ?? 0.25, 0, 2),
    windowSigma: numberIn('periapsisWindowSigma', o.periapsisWindowSigma ?? 2, 0.1, 10),
    within: numberIn('coverageWithinDays', o.coverageWithinDays ?? 1, 0.01, 30),
  };
}

/**
 * Draw the season `draws` times.
 * @param plan the season plan (its epochs are what is drawn)
 * @param sites the sites as planned; each night's loss chance is 1 − its `nightWeights` entry (default 0)
 * @param targets the plan's targets (same names), with measurements for the relativity factors
 * @throws InputError naming the field
 */
export function seasonMonteCarlo(
  plan: SeasonPlan,
  sites: readonly SeasonSite[],
  targets: readonly DrawTarget[],
  options: DrawOptions,
): SeasonDraws {
  const o = checkOptions(options);
  const { nights, nightOf } = siteNights(sites);
  const span = {
    startJd: parseEpoch(`${plan.startDate}T12:00:00Z`),
    endJd: parseEpoch(`${plan.endDate}T12:00:00Z`) + 1,
  };
  const prepared = targets.map((t) => {
    const mine = [
      ...plan.epochs
        .filter((e) => e.target === t.target.name)
        .map((e) => ({
          night: nightOf(e.site, e.date),
          jd: (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2,
          kind: e.kind,
          sigma: e.precision.sigma,
          kept: false,
        })),
      ...keptEpochsOf(sites, t, options.precision, nightOf),
    ];
    return preparedTarget(t, mine, span, o.windowSigma);
  });
  const out = drawSeasons(prepared, nights, o);
  const keep = options.keepSamples === true;
  return {
    draws: o.draws,
    seed: o.seed,
    precisionScatter: o.scatter,
    targets: prepared.map((pt, ti) => targetDraws(pt, out[ti]!, o, keep)),
    assumptions:
      `each planned site-night lost with its chance (1 − its site's clear chance for that night), its ` +
      `epochs' σ times exp(${o.scatter}·z) per night; linear (Fisher) σ after the season, as a refit ` +
      `would report; kept blocks join the draws (obtained ones certain, planned ones lost with their ` +
      `night)`,
  };
}

type Checked = ReturnType<typeof checkOptions>;

/** One epoch of a target before the draws: its night (−1 when obtained), middle, kind and σ. */
type MineEpoch = ReturnType<typeof keptEpochsOf>[number];

/** A target ready for the draws: its epochs with their information, its orbit model and passage. */
interface PreparedTarget {
  t: DrawTarget;
  epochs: DrawEpoch[];
  kept: TargetDraws['kept'];
  model: ReturnType<typeof informationModel> | null;
  passage: ReturnType<typeof passagesIn>[number] | null;
  factors: { n: number; now: Float64Array; which: number[] } | null;
}

/** What the draws gather for one target. */
interface Gathered {
  sigmaT: number[];
  mass: number[];
  factors: number[][];
  coverage: number[];
  inWindow: number;
  lost: number;
}

/** The site-nights the epochs fall on, each with its chance of being lost, indexed as first met. */
function siteNights(sites: readonly SeasonSite[]) {
  const siteOf = new Map(sites.map((s) => [s.site.name, s]));
  const nights: Night[] = [];
  const nightIndex = new Map<string, number>();
  const nightOf = (site: string, date: string) => {
    const key = `${site}\u0000${date}`;
    let k = nightIndex.get(key);
    if (k === undefined) {
      const s = siteOf.get(site);
      if (!s) throw new InputError('sites', site, 'must include every site of the plan');
      k = nights.length;
      nights.push({ loss: 1 - (s.nightWeights?.[date] ?? 1) });
      nightIndex.set(key, k);
    }
    return k;
  };
  return { nights, nightOf };
}

/** Each epoch's information at its nominal σ, the passage in the season, and the factors' rows. */
function preparedTarget(
  t: DrawTarget,
  mine: MineEpoch[],
  span: { startJd: number; endJd: number },
  windowSigma: number,
): PreparedTarget {
  const kept = {
    planned: mine.filter((e) => e.kept && e.night >= 0).length,
    obtained: mine.filter((e) => e.night < 0).length,
  };
  const epochs: DrawEpoch[] = mine.map((e) => ({
    night: e.night,
    jd: e.jd,
    info: null,
    factorRows: null,
  }));
  const orbit = t.target.orbit;
  if (!orbit) return { t, epochs, kept, model: null, passage: null, factors: null };
  const model = informationModel(orbit);
  const n = model.parameters.length;
  const passage =
    passagesIn(model, posteriorCovariance(model, null), span.startJd, span.endJd, windowSigma)[0] ??
    null;
  const jac = jacobians(
    model,
    Float64Array.from(epochs, (e) => e.jd),
  );
  epochs.forEach((e, k) => {
    const info = new Float64Array(n * n);
    const sigma = mine[k]!.sigma;
    addInformation(info, jac[k]!, n, mine[k]!.kind, {
      astrometryMas: sigma,
      spectroscopyKmS: sigma,
    });
    e.info = info;
  });
  return { t, epochs, kept, model, passage, factors: factorsOf(t, mine, epochs) };
}

/** The relativity factors' information now and each epoch's rows, or null with none to draw. */
function factorsOf(t: DrawTarget, mine: MineEpoch[], epochs: DrawEpoch[]) {
  const orbit = t.target.orbit!;
  // A factor scales a term the orbit has on; an orbit without relativity terms has none to draw.
  const termsOn = orbit.relativity.gravitationalRedshift || orbit.relativity.precession;
  if (orbit.distancePc === null || !t.measurements || !termsOn) return null;
  const planned = mine.map((e, k) =>
    plannedMeasurement({ jd: epochs[k]!.jd, kind: e.kind, sigma: e.sigma }, DEFAULT_PRECISION),
  );
  const fisher = fisherRows(orbit, [...t.measurements, ...planned], [...FORECAST_FACTORS]);
  const nf = fisher.parameters.length;
  const now = new Float64Array(nf * nf);
  for (let k = 0; k < t.measurements.length; k++) addRows(now, fisher.rows[k]!, nf, 1);
  epochs.forEach((e, k) => {
    e.factorRows = fisher.rows[t.measurements!.length + k]!;
  });
  return { n: nf, now, which: FORECAST_FACTORS.map((f) => fisher.parameters.indexOf(f)) };
}

/** The draws: per season, which nights are lost and each night's precision factor, then each target. */
function drawSeasons(prepared: PreparedTarget[], nights: Night[], o: Checked): Gathered[] {
  const rnd = new SeededRandom(o.seed);
  const lost = new Uint8Array(nights.length);
  const factor = new Float64Array(nights.length);
  const out = prepared.map(() => ({
    sigmaT: [] as number[],
    mass: [] as number[],
    factors: FORECAST_FACTORS.map(() => [] as number[]),
    coverage: [] as number[],
    inWindow: 0,
    lost: 0,
  }));
  for (let draw = 0; draw < o.draws; draw++) {
    for (let k = 0; k < nights.length; k++) {
      lost[k] = rnd.uniform() < nights[k]!.loss ? 1 : 0;
      factor[k] = Math.exp(o.scatter * rnd.normal());
    }
    prepared.forEach((pt, ti) => {
      drawTarget(pt, out[ti]!, lost, factor, o.within);
    });
  }
  return out;
}

/** One target in one drawn season: its surviving epochs, weighted by their night's factor. */
function drawTarget(
  pt: PreparedTarget,
  acc: Gathered,
  lost: Uint8Array,
  factor: Float64Array,
  within: number,
): void {
  const alive = pt.epochs.filter((e) => e.night < 0 || !lost[e.night]);
  acc.lost += pt.epochs.length - alive.length;
  const weightOf = (e: DrawEpoch) => (e.night < 0 ? 1 : 1 / factor[e.night]! ** 2);
  if (pt.model) {
    const n = pt.model.parameters.length;
    const added = new Float64Array(n * n);
    for (const e of alive) {
      const w = weightOf(e);
      for (let i = 0; i < n * n; i++) added[i] = added[i]! + w * e.info![i]!;
    }
    const cov = posteriorCovariance(pt.model, added);
    if (pt.passage) acc.sigmaT.push(Math.sqrt(quadratic(cov, n, pt.passage.gradient)));
    if (pt.model.lnMassGradient)
      acc.mass.push(Math.sqrt(quadratic(cov, n, pt.model.lnMassGradient)));
  }
  if (pt.factors) {
    const { n, now, which } = pt.factors;
    const F = Float64Array.from(now);
    for (const e of alive) addRows(F, e.factorRows!, n, weightOf(e));
    sigmasFrom(F, n, which).forEach((s, q) => {
      acc.factors[q]!.push(s);
    });
  }
  if (pt.passage) {
    const q = pt.passage;
    const jds = alive.map((e) => e.jd);
    acc.coverage.push(coverageProbability(q.jd, q.sigmaDays, jds, within));
    if (jds.some((j) => j >= q.windowStartJd && j <= q.windowEndJd)) acc.inWindow++;
  }
}

/** One target's distributions over the draws. */
function targetDraws(pt: PreparedTarget, acc: Gathered, o: Checked, keep: boolean): TargetDraws {
  return {
    target: pt.t.target.name,
    epochs: pt.epochs.length,
    kept: pt.kept,
    passage: pt.passage ? { date: pt.passage.date, sigmaDaysNow: pt.passage.sigmaDays } : null,
    periapsisSigmaDays: pt.passage ? distribution(acc.sigmaT, keep) : null,
    massFraction: pt.model?.lnMassGradient ? distribution(acc.mass, keep) : null,
    factors: FORECAST_FACTORS.map((name, q) => ({
      name,
      sigma:
        pt.factors && pt.t.target.orbit?.relativity[FACTOR_TERM[name]]
          ? distribution(acc.factors[q]!, keep)
          : null,
    })),
    coverage: pt.passage
      ? { withinDays: o.within, distribution: distribution(acc.coverage, keep)! }
      : null,
    windowCovered: pt.passage ? acc.inWindow / o.draws : null,
    epochsLost: acc.lost / o.draws,
  };
}

/**
 * The kept blocks of a target that count, by site-night: obtained ones at night −1 (certain), the
 * rest on their night; σ from the site's precision model at the block's middle airmass (2 where the
 * target is below the horizon there, as the planner takes it).
 */
export function keptEpochsOf(
  sites: readonly SeasonSite[],
  t: DrawTarget,
  campaign: Partial<PrecisionModel> | undefined,
  nightOf: (site: string, date: string) => number,
): { night: number; jd: number; kind: BlockKind; sigma: number; kept: boolean }[] {
  return sites.flatMap((s, si) => {
    const list = Object.entries(s.kept ?? {}).flatMap(([date, blocks]) =>
      blocks.filter((k) => k.counts && k.target === t.target.name).map((k) => ({ date, k })),
    );
    if (list.length === 0) return [];
    const model = precisionModel([campaign, s.precision], `sites.${si}.precision`);
    return list.map(({ date, k }) => {
      const jd = (k.startJd + k.endJd) / 2;
      const p = precisionAt(
        model,
        airmassAt(s.site, t.target, jd) ?? 2,
        s.limits?.zenithSeeingArcsec ?? null,
      );
      return {
        night: k.obtained ? -1 : nightOf(s.site.name, date),
        jd,
        kind: k.kind,
        sigma: k.kind === 'astrometry' ? p.astrometryMas : p.spectroscopyKmS,
        kept: true,
      };
    });
  });
}

function addRows(F: Float64Array, rows: readonly Float64Array[], n: number, w: number): void {
  for (const r of rows)
    for (let i = 0; i < n; i++) {
      const ri = r[i]! * w;
      if (ri === 0) continue;
      for (let j = 0; j < n; j++) F[i * n + j] = F[i * n + j]! + ri * r[j]!;
    }
}
