/**
 * Backups for the epochs a season cannot do without. Two kinds of epoch are critical:
 *
 * - a periapsis-window epoch whose loss would cost the passage (it cannot be repeated for a
 *   period): without its night the passage's coverage falls by at least PERIAPSIS_CRITICAL_COVERAGE_DROP
 *   or the σ of the passage's date rises by at least PERIAPSIS_CRITICAL_SIGMA_RISE. In a window
 *   filled with many epochs none is critical (the others stand in for it), and a backup would buy
 *   nothing; in a narrow window the one or two epochs that cover the date are;
 * - an epoch the relativity forecast rests on: one that carries at least RELATIVITY_CRITICAL_SHARE
 *   of a relativity factor's information after the plan (forecast.ts, the target's measurements and
 *   the plan's epochs at their own σ), so that losing it raises that factor's σ by ≥ 5 %.
 *
 * Each target's plan says what was found (`TargetPlan.backups`): how many critical epochs lie on
 * likely-lost nights, how many got a backup and why the others did not, or, with none critical, how
 * much losing the most important epoch would cost, against the thresholds.
 *
 * A critical epoch whose site-night is likely lost (its `nightWeights` entry, the chance the night
 * is clear, at most 1 − `backupLossAbove`) gets one more epoch of the same target and kind that
 * would stand in for it: on another site-night (the other site, or the next nights) within reach —
 * `coverageWithinDays` + 1 day for a periapsis epoch, so the stand-in still covers the passage;
 * RELATIVITY_BACKUP_DAYS for a relativity epoch — the one most likely clear (ties: the nearer in
 * time, then the lower airmass), in time the plan leaves free, and only on a night more likely
 * clear than not (the two nights are drawn independently, so both are lost with the product of their
 * chances). A weather-blind plan (every weight 1) needs none.
 */
import { jdToIso } from '../time/index.ts';
import { forecastDetection } from './forecast.ts';
import { addInformation, posteriorCovariance } from './information.ts';
import { coverageProbability, quadratic, type Passage } from './passage.ts';
import { fits, inPassageWindow, take, type Choice, type Planner } from './season-plan.ts';
import type { TargetPlan } from './season-types.ts';

/** A critical epoch on a night lost with at least this chance gets a backup; default 0.2. */
export const DEFAULT_BACKUP_LOSS_ABOVE = 0.2;
/** A periapsis-window epoch is critical when losing it lowers the passage's coverage by this much (probability). */
export const PERIAPSIS_CRITICAL_COVERAGE_DROP = 0.05;
/** … or raises the σ of the passage's date by this fraction (the relativity rule's 5 %). */
export const PERIAPSIS_CRITICAL_SIGMA_RISE = 0.05;
/** Share of a relativity factor's information after the plan that makes an epoch critical (σ +5 % without it). */
export const RELATIVITY_CRITICAL_SHARE = 0.1;
/**
 * How far a relativity epoch's stand-in may lie, days: the terms change over the passage's time
 * scale P(1 − e)^{3/2}/2π, weeks for the stars followed here, so a few days samples nearly the same phase.
 */
export const RELATIVITY_BACKUP_DAYS = 3;
/** A backup night must be clear with at least this chance. */
const BACKUP_LEAST_CLEAR = 0.5;

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
const FACTOR_WORDS = { redshiftFactor: 'redshift', precessionFactor: 'precession' } as const;

interface Critical {
  c: Choice;
  /** Why the epoch is critical, in words. */
  why: string[];
  reachDays: number;
}

/** Whether a chosen epoch's night is lost with at least the given chance. */
const likelyLost = (p: Planner, c: Choice, lossAbove: number) =>
  1 - p.nights.weight[c.o.s * p.nights.nD + c.o.d]! >= lossAbove - 1e-12;

/**
 * The chosen epochs that carry ≥ RELATIVITY_CRITICAL_SHARE of a relativity factor's information,
 * with words, and the largest share any epoch carries (null: the orbit has no relativity terms).
 */
function relativityCritical(
  p: Planner,
  ti: number,
): { critical: Map<Choice, string>; maxShare: number | null } {
  const out = new Map<Choice, string>();
  const ts = p.states[ti]!;
  const orbit = ts.t.input.target.orbit;
  const none = { critical: out, maxShare: null };
  if (!orbit || orbit.distancePc === null) return none;
  if (!orbit.relativity.gravitationalRedshift && !orbit.relativity.precession) return none;
  const mine = p.chosen.filter((c) => c.ti === ti);
  if (mine.length === 0) return none;
  let maxShare = 0;
  const byKey = new Map(mine.map((c) => [`${jdToIso(c.o.jd)}/${c.o.kind}`, c]));
  const f = forecastDetection({
    orbit,
    measurements: ts.t.input.measurements ?? [],
    plan: mine.map((c) => ({
      jd: c.o.jd,
      kind: c.o.kind,
      sigma:
        c.o.kind === 'astrometry' ? c.o.precision.astrometryMas : c.o.precision.spectroscopyKmS,
    })),
    precision: mine[0]!.o.precision,
  });
  for (const factor of f.factors) {
    if (factor.sigmaAfter === null) continue;
    for (const e of factor.topEpochs) {
      maxShare = Math.max(maxShare, e.share);
      if (e.share < RELATIVITY_CRITICAL_SHARE) continue;
      const c = byKey.get(`${e.epoch}/${e.kind}`);
      if (!c) continue;
      const without = factor.sigmaAfter / Math.sqrt(Math.max(1e-12, 1 - e.share));
      const words =
        `the ${FACTOR_WORDS[factor.name]} factor's forecast rests on it (${pct(e.share)} of its ` +
        `information; lost, its σ rises from ${factor.sigmaAfter.toFixed(3)} to ${without.toFixed(3)})`;
      out.set(c, out.has(c) ? `${out.get(c)}; ${words}` : words);
    }
  }
  return { critical: out, maxShare };
}

/**
 * What losing a periapsis-window epoch's night costs its passage: a night is lost whole, so every
 * epoch of the target on that site-night goes with it (another kind on the same night is no
 * stand-in). The coverage it takes, and the rise of the σ of the passage's date.
 */
function periapsisLoss(
  p: Planner,
  c: Choice,
  q: Passage,
): { coverageDrop: number; sigmaRise: number | null } {
  const ts = p.states[c.ti]!;
  const mine = p.chosen.filter((x) => x.ti === c.ti);
  const sameNight = (x: Choice) => x.o.s === c.o.s && x.o.d === c.o.d;
  const w = p.coverageWithinDays;
  const jd = (list: Choice[]) => [...ts.keptJd, ...list.map((x) => x.o.jd)];
  const all = coverageProbability(q.jd, q.sigmaDays, jd(mine), w);
  const without = coverageProbability(q.jd, q.sigmaDays, jd(mine.filter((x) => !sameNight(x))), w);
  let sigmaRise: number | null = null;
  if (ts.model && ts.planned) {
    const n = ts.model.parameters.length;
    const less = Float64Array.from(ts.planned);
    const lost = new Float64Array(n * n);
    for (const x of mine)
      if (sameNight(x) && x.o.jac) addInformation(lost, x.o.jac, n, x.o.kind, x.o.precision);
    for (let i = 0; i < n * n; i++) less[i] = less[i]! - lost[i]!;
    const s1 = quadratic(posteriorCovariance(ts.model, ts.planned), n, q.gradient);
    const s0 = quadratic(posteriorCovariance(ts.model, less), n, q.gradient);
    if (s1 > 0 && s0 > 0) sigmaRise = Math.sqrt(s0 / s1) - 1;
  }
  return { coverageDrop: all - without, sigmaRise };
}

/** The passage whose window holds the epoch's site-night. */
const passageOf = (p: Planner, c: Choice) =>
  p.states[c.ti]!.passages.find((q) =>
    inPassageWindow(p.nights, c.o.s, c.o.d, q.windowStartJd, q.windowEndJd),
  ) ?? null;

const points = (x: number) => `${(100 * x).toFixed(1)} points`;
const rise = (x: number) => `${(100 * x).toFixed(1)} %`;

/** The largest cost of losing one epoch, per target (for the words of a target with none critical). */
interface Worst {
  coverageDrop: number;
  sigmaRise: number | null;
  periapsisEpochs: number;
  relativityShare: number | null;
}

/** The critical epochs on likely-lost nights, periapsis epochs first, in the order they were chosen; and each target's worst single loss. */
function criticalEpochs(
  p: Planner,
  lossAbove: number,
): { list: Critical[]; worst: Map<number, Worst> } {
  const out: Critical[] = [];
  const { dates } = p.nights;
  const list = new Map<Choice, Critical>();
  const worst = new Map<number, Worst>();
  const worstOf = (ti: number) => {
    let w = worst.get(ti);
    if (!w) {
      w = { coverageDrop: 0, sigmaRise: null, periapsisEpochs: 0, relativityShare: null };
      worst.set(ti, w);
    }
    return w;
  };
  for (const c of p.chosen) {
    if (c.why !== 'periapsis') continue;
    const q = passageOf(p, c);
    if (!q) continue;
    const loss = periapsisLoss(p, c, q);
    const w = worstOf(c.ti);
    w.periapsisEpochs++;
    w.coverageDrop = Math.max(w.coverageDrop, loss.coverageDrop);
    if (loss.sigmaRise !== null) w.sigmaRise = Math.max(w.sigmaRise ?? 0, loss.sigmaRise);
    const costs = [
      ...(loss.coverageDrop >= PERIAPSIS_CRITICAL_COVERAGE_DROP - 1e-12
        ? [`the passage's coverage falls by ${points(loss.coverageDrop)}`]
        : []),
      ...(loss.sigmaRise !== null && loss.sigmaRise >= PERIAPSIS_CRITICAL_SIGMA_RISE - 1e-12
        ? [`σ of its date rises by ${rise(loss.sigmaRise)}`]
        : []),
    ];
    if (costs.length === 0 || !likelyLost(p, c, lossAbove)) continue;
    const site = p.sites[c.o.s]!.site.name;
    const entry = {
      c,
      why: [
        `the periapsis epoch at ${site} ${dates[c.o.d]} (without its night ${costs.join(' and ')})`,
      ],
      reachDays: p.coverageWithinDays + 1,
    };
    list.set(c, entry);
    out.push(entry);
  }
  const targets = new Set(p.chosen.filter((c) => likelyLost(p, c, lossAbove)).map((c) => c.ti));
  for (const ti of targets) {
    const rel = relativityCritical(p, ti);
    if (rel.maxShare !== null) worstOf(ti).relativityShare = rel.maxShare;
    for (const [c, words] of rel.critical) {
      if (!likelyLost(p, c, lossAbove)) continue;
      const known = list.get(c);
      if (known) {
        known.why.push(words);
        continue;
      }
      const site = p.sites[c.o.s]!.site.name;
      const entry = {
        c,
        why: [`the ${c.o.kind} epoch at ${site} ${dates[c.o.d]}: ${words}`],
        reachDays: RELATIVITY_BACKUP_DAYS,
      };
      list.set(c, entry);
      out.push(entry);
    }
  }
  return { list: out, worst };
}

/** A critical epoch with its backup (site and night) or, without one, why. */
type Found = Critical & { backup: string | null; none: string };

/** Why no night within reach can hold a critical epoch's backup. */
function whyNoBackup(p: Planner, c: Choice, reachDays: number): string {
  const { nD, weight, dates } = p.nights;
  const near = p.states[c.ti]!.options.filter(
    (o) =>
      o.kind === c.o.kind &&
      !(o.s === c.o.s && o.d === c.o.d) &&
      Math.abs(o.jd - c.o.jd) <= reachDays,
  );
  const name = p.states[c.ti]!.t.name;
  if (near.length === 0)
    return `no other allocated night within ${reachDays} d where ${name} is observable`;
  const nights = (list: typeof near) =>
    list.map((o) => `${p.sites[o.s]!.site.name} ${dates[o.d]!.slice(5)}`).join(', ');
  const used = near.filter((o) => o.used);
  if (used.length === near.length)
    return `the allocated nights within ${reachDays} d (${nights(used)}) already hold a ${c.o.kind} epoch of ${name}`;
  const free = near.filter((o) => !o.used);
  if (free.every((o) => weight[o.s * nD + o.d]! < BACKUP_LEAST_CLEAR - 1e-12))
    return (
      `the free nights within ${reachDays} d (${nights(free)}) are clear with chance below ` +
      `${pct(BACKUP_LEAST_CLEAR)}`
    );
  return `no room left on the free nights within ${reachDays} d (${nights(free)})`;
}

/** A target's backups in words: the critical epochs and their backups, or why none was needed. */
function backupWords(
  p: Planner,
  critical: readonly Found[],
  w: Worst | undefined,
): NonNullable<TargetPlan['backups']> {
  const { dates } = p.nights;
  const backedUp = critical.filter((c) => c.backup !== null).length;
  if (critical.length > 0) {
    // Group the epochs without a backup by why, and each group's epochs by site-night.
    const byWhy = new Map<string, Map<string, string[]>>();
    for (const c of critical.filter((x) => x.backup === null)) {
      const nights = byWhy.get(c.none) ?? new Map<string, string[]>();
      const key = `${p.sites[c.c.o.s]!.site.name} ${dates[c.c.o.d]}`;
      nights.set(key, [...(nights.get(key) ?? []), c.c.o.kind]);
      byWhy.set(c.none, nights);
    }
    const missing = [...byWhy.entries()].map(
      ([why, nights]) =>
        `no backup for ${[...nights.entries()].map(([n, kinds]) => `${n} (${kinds.sort().join(', ')})`).join(', ')}: ${why}`,
    );
    const words = [
      `${critical.length} critical epoch${critical.length === 1 ? '' : 's'} on nights likely lost, ` +
        `${backedUp} backed up`,
      ...missing,
    ].join('; ');
    return { critical: critical.length, backedUp, words };
  }
  const parts: string[] = [];
  if (w && w.periapsisEpochs > 0)
    parts.push(
      `losing the night of any one of the ${w.periapsisEpochs} periapsis-window epochs lowers the passage's ` +
        `coverage by at most ${points(w.coverageDrop)}` +
        (w.sigmaRise === null ? '' : ` and raises σ of its date by at most ${rise(w.sigmaRise)}`) +
        ` (critical from ${points(PERIAPSIS_CRITICAL_COVERAGE_DROP)} or ${rise(PERIAPSIS_CRITICAL_SIGMA_RISE)})`,
    );
  if (w && w.relativityShare !== null)
    parts.push(
      `no epoch carries more than ${rise(w.relativityShare)} of a relativity factor's information ` +
        `(critical from ${pct(RELATIVITY_CRITICAL_SHARE)})`,
    );
  return {
    critical: 0,
    backedUp: 0,
    words: parts.length
      ? `no epoch is critical: ${parts.join('; ')}`
      : 'no epoch is critical: no periapsis window in the range and no relativity terms in its orbit',
  };
}

/**
 * Give each critical epoch on a likely-lost night a backup where one fits, and say per target what
 * was found (null for every target when no night of the plan is likely lost: nothing to weigh).
 */
export function backupPass(p: Planner, lossAbove: number): (TargetPlan['backups'] | null)[] {
  const { nD, weight, dates } = p.nights;
  const { list, worst } = criticalEpochs(p, lossAbove);
  const found: Found[] = [];
  for (const entry of list) {
    const { c, why, reachDays } = entry;
    const loss = 1 - weight[c.o.s * nD + c.o.d]!;
    let best = null as (typeof p.states)[number]['options'][number] | null;
    let bestKey: [number, number, number] = [-1, 0, 0];
    for (const o of p.states[c.ti]!.options) {
      if (o.kind !== c.o.kind || (o.s === c.o.s && o.d === c.o.d)) continue;
      const dt = Math.abs(o.jd - c.o.jd);
      if (dt > reachDays || !fits(p, c.ti, o)) continue;
      const w = weight[o.s * nD + o.d]!;
      if (w < BACKUP_LEAST_CLEAR - 1e-12) continue;
      const key: [number, number, number] = [w, -dt, -o.airmass];
      if (
        key[0] > bestKey[0] + 1e-12 ||
        (Math.abs(key[0] - bestKey[0]) <= 1e-12 &&
          (key[1] > bestKey[1] + 1e-9 || (key[1] === bestKey[1] && key[2] > bestKey[2])))
      ) {
        best = o;
        bestKey = key;
      }
    }
    if (!best) {
      found.push({ ...entry, backup: null, none: whyNoBackup(p, c, reachDays) });
      continue;
    }
    const other = p.sites[best.s]!.site.name;
    const b = best;
    const both = loss * (1 - weight[b.s * nD + b.d]!);
    found.push({ ...entry, backup: `${other} ${dates[b.d]}`, none: '' });
    take(
      p,
      c.ti,
      b,
      'backup',
      (g) =>
        `backup for ${why.join('; ')} (lost with chance ${pct(loss)}): ${other} ${dates[b.d]} is clear ` +
        `with chance ${pct(weight[b.s * nD + b.d]!)}, so both are lost with chance ${pct(both)}; ` +
        `${g.text}`,
    );
  }
  const exposed = new Set(p.chosen.filter((c) => likelyLost(p, c, lossAbove)).map((c) => c.ti));
  if (exposed.size === 0) return p.states.map(() => null);
  return p.states.map((_, ti) =>
    exposed.has(ti)
      ? backupWords(
          p,
          found.filter((f) => f.c.ti === ti),
          worst.get(ti),
        )
      : {
          critical: 0,
          backedUp: 0,
          words: `none of its epochs lies on a night lost with chance ≥ ${pct(lossAbove)}`,
        },
  );
}
