/**
 * The season planner: for a date range, sites with their allocated nights and targets with their
 * goals, the epochs to observe, in three passes.
 *
 * 1. The periapsis window first: for each target whose coming passage (± k σ of its date, from the
 *    events engine) meets the range, highest priority first, every allocated site-night in the
 *    window where the target is observable gets an epoch (several per night where asked), the
 *    most informative first, before any cadence goal is considered.
 * 2. Cadence: each cadence window of each target (per-target cadence, densified near periapsis)
 *    gets the open site-night that most tightens the orbit, highest priority first.
 * 3. Extra epochs, when asked for, where the information is largest.
 *
 * Information is Fisher information at the precision the epoch would have at that site and airmass
 * (precision.ts); with the relativity goal, the forecast's information on the relativity factors
 * counts too (season-relativity.ts). Each site-night's epochs are then timed by the night scheduler
 * (season-timing.ts), and the report (season-report.ts) gives every choice, every unmet goal and
 * every unused night of a periapsis window with the limit that closed it on that night.
 *
 * Blocks already stored that stay (`SeasonSite.kept`, by night) are planned around: new blocks go in
 * the time they leave free, with the changeover gap, and a kept block that counts stands for its
 * night's epoch of that target and kind.
 */
import { InputError } from '../errors.ts';
import type { BlockKind } from './candidates.ts';
import { numberIn } from './checks.ts';
import { targetGrid } from './grid.ts';
import { jacobians } from './information.ts';
import { nightReasonWords, type NightReasonDetail } from './night-reasons.ts';
import { precisionAt, precisionModel, type PrecisionModel } from './precision.ts';
import {
  kindIndex,
  seasonNights,
  targetOptions,
  type Option,
  type SeasonNights,
} from './season-nights.ts';
import { backupPass, DEFAULT_BACKUP_LOSS_ABOVE } from './season-backups.ts';
import { seasonReport } from './season-report.ts';
import {
  addEpoch,
  addKept,
  covarianceOf,
  fitsNight,
  gainOf,
  score,
  targetState,
  type Accepted,
  type TargetState,
} from './season-state.ts';
import { timeNights } from './season-timing.ts';
import { addRelativityEpoch, relativityState } from './season-relativity.ts';
import {
  resolveTargets,
  seasonDates,
  type EpochGain,
  type NightNote,
  type PlannedEpoch,
  type SeasonOptions,
  type SeasonPlan,
  type SeasonSite,
  type SeasonTarget,
  type UnmetGoal,
} from './season-types.ts';

export type {
  EpochGain,
  NightNote,
  PeriapsisRepeat,
  PassagePlan,
  PlannedEpoch,
  SeasonOptions,
  SeasonPlan,
  SeasonSite,
  SeasonTarget,
  TargetPlan,
  UnmetGoal,
} from './season-types.ts';

/** One chosen epoch before timing. */
export interface Choice {
  ti: number;
  o: Option;
  gain: EpochGain;
  rank: number;
  why: PlannedEpoch['why'];
  reason: string;
}

/** Everything the passes share. */
export interface Planner {
  sites: readonly SeasonSite[];
  nights: SeasonNights;
  states: TargetState[];
  /** Per target: the closing limit of each (kind, site, night) without an option. */
  closed: (NightReasonDetail | null)[][];
  precision: PrecisionModel[];
  accepted: Map<number, Accepted[]>;
  chosen: Choice[];
  unmet: UnmetGoal[];
  cadenceMet: boolean[];
  /** Target indices, highest priority first (ties: input order). */
  order: number[];
  slotMinutes: number;
  slewMinutes: number;
  sameTargetMinutes: number;
  windowSigma: number;
  coverageWithinDays: number;
  extra: number;
}

export function planSeason(
  startDate: string,
  endDate: string,
  sites: readonly SeasonSite[],
  targets: readonly SeasonTarget[],
  options: SeasonOptions = {},
): SeasonPlan {
  const lossAbove = numberIn(
    'backupLossAbove',
    options.backupLossAbove ?? DEFAULT_BACKUP_LOSS_ABOVE,
    0.01,
    1,
  );
  const p = preparePlanner(startDate, endDate, sites, targets, options);
  periapsisPass(p);
  cadencePass(p);
  extraPass(p);
  const backups = backupPass(p, lossAbove);
  const timed = timeNights(p);
  return seasonReport(p, timed, backups);
}

/** The planner's checked settings: each option within its range, or an InputError naming it. */
function plannerSettings(options: SeasonOptions) {
  const slotMinutes = numberIn('slotMinutes', options.slotMinutes ?? 10, 1, 30);
  const slewMinutes = numberIn('slewMinutes', options.slewMinutes ?? 8, 0, 120);
  const sameTargetMinutes = numberIn('sameTargetMinutes', options.sameTargetMinutes ?? 3, 0, 120);
  const fill = options.fillFraction ?? 0.9;
  if (!(fill > 0 && fill <= 1)) throw new InputError('fillFraction', fill, 'must lie in (0, 1]');
  const extra = numberIn('extraEpochsPerTarget', options.extraEpochsPerTarget ?? 0, 0, 20);
  if (options.relativityGoal !== undefined && typeof options.relativityGoal !== 'boolean')
    throw new InputError('relativityGoal', options.relativityGoal, 'must be true or false');
  const windowSigma = numberIn('periapsisWindowSigma', options.periapsisWindowSigma ?? 2, 0.1, 10);
  const within = numberIn('coverageWithinDays', options.coverageWithinDays ?? 1, 0.01, 30);
  return { slotMinutes, slewMinutes, sameTargetMinutes, fill, extra, windowSigma, within };
}

/** Check the inputs, build the nights, the targets' states and options, and add kept blocks' information. */
function preparePlanner(
  startDate: string,
  endDate: string,
  sites: readonly SeasonSite[],
  targets: readonly SeasonTarget[],
  options: SeasonOptions,
): Planner {
  const dates = seasonDates(startDate, endDate);
  if (sites.length === 0 || sites.length > 10)
    throw new InputError('sites', sites.length, 'must list 1 to 10 sites');
  const resolved = resolveTargets(targets, options);
  const set = plannerSettings(options);
  const { slotMinutes, slewMinutes, sameTargetMinutes, windowSigma } = set;
  const precision = sites.map((s, si) =>
    precisionModel([options.precision, s.precision], `sites.${si}.precision`),
  );
  const names = new Set(resolved.map((t) => t.name));
  const nights = seasonNights(sites, dates, names, slotMinutes, set.fill, slewMinutes);
  const startJd = Math.min(...nights.darkStartJd),
    endJd = Math.max(...nights.darkEndJd);
  const states = resolved.map((t) => targetState(t, startJd, endJd, windowSigma));
  const ctx = { nights, sites, precision, slewMinutes, sameTargetMinutes };
  const closed = states.map((ts) => fillTargetState(ctx, ts, options.relativityGoal === true));
  const order = resolved
    .map((_, i) => i)
    .sort((a, b) => resolved[b]!.priority - resolved[a]!.priority || a - b);
  return {
    sites,
    nights,
    states,
    closed,
    precision,
    accepted: new Map(),
    chosen: [],
    unmet: [],
    cadenceMet: states.map(() => true),
    order,
    slotMinutes,
    slewMinutes,
    sameTargetMinutes,
    windowSigma,
    coverageWithinDays: set.within,
    extra: set.extra,
  };
}

/**
 * One target's options (with their Jacobians), its relativity state when asked for, and its kept
 * blocks' information; returns the closing limit of each (kind, site, night) without an option.
 */
function fillTargetState(
  ctx: Pick<Planner, 'nights' | 'sites' | 'precision' | 'slewMinutes' | 'sameTargetMinutes'>,
  ts: TargetState,
  relativityGoal: boolean,
): (NightReasonDetail | null)[] {
  const { nights, sites, precision } = ctx;
  const { nD } = nights;
  const inWindow = (s: number, d: number) =>
    ts.passages.some(
      (q) =>
        nights.darkEndJd[s * nD + d]! >= q.windowStartJd &&
        nights.darkStartJd[s * nD + d]! <= q.windowEndJd,
    );
  const built = targetOptions({ ...ctx, inWindow }, ts.t);
  ts.options = built.options;
  if (ts.model) {
    const jac = jacobians(
      ts.model,
      Float64Array.from(ts.options, (o) => o.jd),
    );
    ts.options.forEach((o, k) => {
      o.jac = jac[k]!;
    });
  }
  const orbit = ts.t.input.target.orbit;
  const kept = keptOf(nights, sites, precision, ts);
  if (relativityGoal && orbit)
    ts.rel = relativityState(
      orbit,
      ts.t.input.measurements ?? [],
      ts.options,
      kept.map(({ k, precision }) => ({
        jd: (k.startJd + k.endJd) / 2,
        kind: k.kind,
        precision,
      })),
    );
  addKept(ts, kept);
  return built.closed;
}

/** The target's kept blocks that count, each with the precision it has at its middle airmass. */
function keptOf(
  nights: SeasonNights,
  sites: readonly SeasonSite[],
  precision: PrecisionModel[],
  ts: TargetState,
) {
  const out: { k: (typeof nights.kept)[number][number]; precision: Option['precision'] }[] = [];
  nights.kept.forEach((list, key) => {
    const mine = list.filter((k) => k.counts && k.target === ts.t.name);
    if (mine.length === 0) return;
    const s = Math.floor(key / nights.nD);
    const g = nights.grids[key]!;
    const tg = targetGrid(g, ts.t.input.target);
    for (const k of mine) {
      const mid = (k.startJd + k.endJd) / 2;
      let i = 0;
      while (i + 1 < g.edgeJd.length && g.edgeJd[i + 1]! <= mid) i++;
      const x = Number.isFinite(tg.airmass[i]!) ? tg.airmass[i]! : 2;
      out.push({
        k,
        precision: precisionAt(precision[s]!, x, sites[s]!.limits.zenithSeeingArcsec),
      });
    }
  });
  return out;
}

const gapSlotsOf = (p: Planner) => (a: number, b: number) =>
  Math.ceil((a === b ? p.sameTargetMinutes : p.slewMinutes) / p.slotMinutes - 1e-9);
const costOf = (p: Planner, ti: number, kind: BlockKind) =>
  p.states[ti]!.t.blockMinutes[kind] + p.slewMinutes;

export function fits(p: Planner, ti: number, o: Option): boolean {
  return !o.used && fitsNight(p.nights, p.accepted, o, ti, costOf(p, ti, o.kind), gapSlotsOf(p));
}

export function take(
  p: Planner,
  ti: number,
  o: Option,
  why: Choice['why'],
  reason: (g: EpochGain) => string,
): void {
  const ts = p.states[ti]!;
  const cov = covarianceOf(ts);
  const gain = gainOf(ts, cov, o);
  const rank = score(ts, cov, o, p.nights);
  o.used = true;
  const key = o.s * p.nights.nD + o.d;
  p.nights.room[key] = p.nights.room[key]! - costOf(p, ti, o.kind);
  if (!p.accepted.has(key)) p.accepted.set(key, []);
  p.accepted.get(key)!.push({
    first: o.first,
    last: o.last,
    slots: o.slots,
    ti,
    label: `${ts.t.name} ${o.kind} (priority ${ts.t.priority}, ${why})`,
  });
  if (o.jac) addEpoch(ts, o.jac, o.kind, o.precision);
  if (ts.rel) addRelativityEpoch(ts.rel, o);
  p.chosen.push({ ti, o, gain, rank, why, reason: reason(gain) });
}

/** The best option among those given that fits (by score, ties by lower airmass), or null. */
function bestOf(p: Planner, ti: number, list: readonly Option[]): Option | null {
  const ts = p.states[ti]!;
  const cov = covarianceOf(ts);
  let best: Option | null = null,
    bestScore = -1;
  for (const o of list) {
    if (!fits(p, ti, o)) continue;
    const sc = score(ts, cov, o, p.nights);
    if (
      sc > bestScore + 1e-12 ||
      (Math.abs(sc - bestScore) <= 1e-12 && best && o.airmass < best.airmass - 1e-12)
    ) {
      best = o;
      bestScore = sc;
    }
  }
  return best;
}

/** Whether the option's site-night meets the passage window [startJd, endJd]. */
export function inPassageWindow(
  n: SeasonNights,
  s: number,
  d: number,
  startJd: number,
  endJd: number,
): boolean {
  const key = s * n.nD + d;
  return n.darkEndJd[key]! >= startJd && n.darkStartJd[key]! <= endJd;
}

/** Pass 1: every observable allocated site-night of each periapsis window, highest priority first. */
function periapsisPass(p: Planner): void {
  const byPassage = p.order.flatMap((ti) => p.states[ti]!.passages.map((q) => ({ ti, q })));
  byPassage.sort(
    (a, b) => p.states[b.ti]!.t.priority - p.states[a.ti]!.t.priority || a.q.jd - b.q.jd,
  );
  for (const { ti, q } of byPassage) {
    const ts = p.states[ti]!;
    const sigma =
      q.sigmaDays === null
        ? 'no covariance: ± ½ day'
        : `± ${p.windowSigma} σ = ± ${(p.windowSigma * q.sigmaDays).toFixed(1)} d`;
    for (const kind of ts.t.input.kinds) {
      const list = ts.options.filter(
        (o) =>
          o.kind === kind && inPassageWindow(p.nights, o.s, o.d, q.windowStartJd, q.windowEndJd),
      );
      // Take the most informative open placement, update the information, and repeat until none fits.
      for (let o = bestOf(p, ti, list); o; o = bestOf(p, ti, list)) {
        const chosen = o;
        const prec =
          kind === 'astrometry'
            ? `${chosen.precision.astrometryMas.toFixed(2)} mas`
            : `${chosen.precision.spectroscopyKmS.toFixed(1)} km/s`;
        take(
          p,
          ti,
          chosen,
          'periapsis',
          (g) =>
            `periapsis window of ${q.date.slice(0, 10)} (${sigma}): ${g.text}; expected σ ${prec} at ` +
            `airmass ${chosen.airmass.toFixed(2)}`,
        );
      }
    }
  }
}

/** The cadence a target asks for on night d (densified near a periapsis). */
function cadenceOn(p: Planner, ti: number, d: number): number {
  const t = p.states[ti]!.t.input;
  const jd = p.nights.darkStartJd[d]!;
  const near =
    t.densifiedCadenceDays !== undefined &&
    p.states[ti]!.periapsesJd.some((q) => Math.abs(q - jd) <= (t.densifyWithinDays ?? 0));
  return Math.max(1, Math.round(near ? t.densifiedCadenceDays! : t.cadenceDays));
}

/** Nights (index) that already hold an epoch of the target and kind: kept blocks that count, and chosen epochs. */
function heldNights(p: Planner, ti: number, kind: BlockKind): Set<number> {
  const name = p.states[ti]!.t.name;
  const held = new Set<number>();
  p.nights.kept.forEach((list, key) => {
    if (list.some((k) => k.counts && k.target === name && k.kind === kind))
      held.add(key % p.nights.nD);
  });
  for (const c of p.chosen) if (c.ti === ti && c.o.kind === kind) held.add(c.o.d);
  return held;
}

/** Pass 2: one epoch in each cadence window, highest priority first (ties: input order). */
function cadencePass(p: Planner): void {
  const { nD, dates } = p.nights;
  for (const ti of p.order) {
    const ts = p.states[ti]!;
    for (const kind of ts.t.input.kinds) {
      const last = ts.t.input.lastEpochJd?.[kind];
      let lastIdx = last === undefined ? -1 : Math.floor(last - p.nights.darkStartJd[0]! + 0.5);
      if (lastIdx + cadenceOn(p, ti, 0) < 0) lastIdx = -1; // overdue: the first window starts now
      const held = heldNights(p, ti, kind);
      for (;;) {
        // The window: the nights after the last epoch until the gap would exceed the cadence.
        let end = lastIdx + 1;
        while (end < nD && end - lastIdx <= cadenceOn(p, ti, end)) end++;
        if (end >= nD && (lastIdx >= 0 || last !== undefined)) break; // the rest of the gap runs past the range
        const from = Math.max(0, lastIdx + 1),
          to = end - 1;
        if (from > to || from >= nD) break;
        const inside = [...held].filter((d) => d >= from && d <= to);
        if (inside.length > 0) {
          lastIdx = Math.max(...inside); // an epoch already meets this window
          continue;
        }
        // Look in the second half of the window first, so the epochs come about one cadence apart, not closer.
        const half = Math.max(from, Math.min(to, lastIdx + Math.ceil(cadenceOn(p, ti, to) / 2)));
        const pick = (lo: number) =>
          bestOf(
            p,
            ti,
            ts.options.filter((o) => o.kind === kind && o.d >= lo && o.d <= to),
          );
        const best = pick(half) ?? pick(from);
        if (best) {
          const count = ts.options.filter(
            (o) => o.kind === kind && o.d >= from && o.d <= to && fits(p, ti, o),
          ).length;
          const cad = cadenceOn(p, ti, best.d);
          const dens =
            cad !== Math.round(ts.t.input.cadenceDays) ? ' (densified near periapsis)' : '';
          take(
            p,
            ti,
            best,
            'cadence',
            (g) =>
              `keeps every gap within ${cad} d${dens}: the most informative of ${count} open site-nights from ` +
              `${dates[from]} to ${dates[to]} (${g.text}; airmass ${best.airmass.toFixed(2)})`,
          );
          held.add(best.d);
          lastIdx = best.d;
        } else {
          p.cadenceMet[ti] = false;
          p.unmet.push(unmetGoal(p, ti, kind, from, to));
          lastIdx = to;
        }
      }
    }
  }
}

/** Why a site-night has no epoch of the target and kind: its closing limit, or the epochs that took its time. */
export function nightNote(
  p: Planner,
  ti: number,
  kind: BlockKind,
  s: number,
  d: number,
): NightNote {
  const { nS, nD, dates } = p.nights;
  const key = s * nD + d;
  const taken = (p.accepted.get(key) ?? []).map((a) => a.label);
  const minutes = p.states[ti]!.t.blockMinutes[kind];
  const detail: NightReasonDetail =
    p.closed[ti]![(kindIndex(kind) * nS + s) * nD + d] ??
    (taken.length > 0
      ? { reason: 'taken', takenBy: taken }
      : { reason: 'no-room', roomMinutes: p.nights.room[key]!, blockMinutes: minutes });
  const c = p.nights.grids[key]?.limits ?? p.sites[s]!.limits;
  return {
    site: p.sites[s]!.site.name,
    date: dates[d]!,
    kind,
    reason: detail.reason,
    words: nightReasonWords(detail, c),
  };
}

/** An unmet cadence goal, with every site-night of its window and the limit that closed it. */
function unmetGoal(p: Planner, ti: number, kind: BlockKind, from: number, to: number): UnmetGoal {
  const { dates } = p.nights;
  const ts = p.states[ti]!;
  const notes: NightNote[] = [];
  for (let s = 0; s < p.nights.nS; s++)
    for (let d = from; d <= to; d++) notes.push(nightNote(p, ti, kind, s, d));
  const peri = ts.periapsesJd.find(
    (q) => q >= p.nights.darkStartJd[from]! - 0.5 && q <= p.nights.darkEndJd[to]! + 0.5,
  );
  return {
    target: ts.t.name,
    kind,
    start: dates[from]!,
    end: dates[to]!,
    reason:
      `${peri ? 'a periapsis falls in this window, but ' : ''}no ${kind} epoch fits from ` +
      `${dates[from]} to ${dates[to]}: ${summariseNotes(notes)}`,
    nights: notes,
  };
}

/** Notes grouped by site and by runs of nights with the same words: "at A 06-01 to 06-04 …; 06-05 …". */
export function summariseNotes(notes: readonly NightNote[]): string {
  const bySite = new Map<string, NightNote[]>();
  for (const n of notes) bySite.set(n.site, [...(bySite.get(n.site) ?? []), n]);
  return [...bySite.entries()]
    .map(([site, list]) => {
      const runs: { a: string; b: string; words: string }[] = [];
      for (const n of list) {
        const last = runs[runs.length - 1];
        if (last && last.words === n.words) last.b = n.date;
        else runs.push({ a: n.date, b: n.date, words: n.words });
      }
      return `at ${site} ${runs.map((r) => `${r.a.slice(5)}${r.b !== r.a ? ` to ${r.b.slice(5)}` : ''} ${r.words}`).join('; ')}`;
    })
    .join('; ');
}

/** Pass 3: extra epochs where they tighten the orbit most. */
function extraPass(p: Planner): void {
  for (let round = 0; round < p.extra; round++) {
    for (const ti of p.order) {
      const ts = p.states[ti]!;
      const best = bestOf(p, ti, ts.options);
      if (best && score(ts, covarianceOf(ts), best, p.nights) > 1e-9)
        take(
          p,
          ti,
          best,
          'information',
          (g) =>
            `beyond the cadence: the site-night of the range that most tightens the orbit (${g.text})`,
        );
    }
  }
}
