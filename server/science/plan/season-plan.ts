/**
 * The season planner: for a date range, sites with their allocated nights and targets with their
 * cadence goals, the epochs to observe. Each cadence window (the nights in which the next epoch must
 * fall so that no gap exceeds the cadence, densified near periapsis) gets the site-night that most
 * tightens the orbit (Fisher information, `information.ts`), among those where a block fits in
 * darkness and still has room. Extra epochs, when asked for, go where the information is largest.
 * Each site-night's epochs are then timed by the night scheduler. Every choice and every unmet goal
 * carries its reason.
 *
 * Blocks already stored that stay (`SeasonSite.kept`, by night) are planned around: new blocks go in
 * the time they leave free, with the changeover gap, and a kept block that counts stands for its
 * night's epoch of that target and kind (the cadence counts it; no repeat is added that night).
 */
import { InputError } from '../errors.ts';
import { findEvents } from '../orbit/index.ts';
import type { Limits } from '../sky/limits.ts';
import { addDays, nightSpan, parseNightDate } from '../sky/night.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { jdToIso } from '../time/index.ts';
import { LASER_GUIDE_STAR_CAUTION, PLAN_ADVISORY } from './cautions.ts';
import { MEASUREMENT_KINDS, slotsFor, type MeasurementKind } from './candidates.ts';
import { numberIn, positive } from './checks.ts';
import {
  blockQuality,
  dominantReason,
  nightGrid,
  reasonWords,
  targetGrid,
  type NightGrid,
  type ReasonCode,
  type TargetGrid,
} from './grid.ts';
import {
  addInformation,
  informationModel,
  jacobians,
  posteriorCovariance,
  uncertainties,
  varianceReduction,
  type InformationModel,
  type Precision,
  type Uncertainties,
} from './information.ts';
import { scheduleOnGrid, type KeptBlock, type ScheduledBlock } from './night-schedule.ts';

export interface SeasonSite {
  site: Site;
  limits: Limits;
  /** Allocated nights (local evening dates); null or absent: every night of the range. */
  nights?: readonly string[] | null;
  /** Astrometry at this site uses a laser guide star. */
  laserGuideStar?: boolean;
  /** Stored blocks that stay, by night (local evening date, one of `nights`): planned around, never moved. */
  kept?: Readonly<Record<string, readonly KeptBlock[]>>;
}

export interface SeasonTarget {
  target: Target;
  kinds: readonly MeasurementKind[];
  /** Longest wanted gap between epochs of each kind, days, [1, 3650]. */
  cadenceDays: number;
  /** Gap wanted within `densifyWithinDays` of a periapsis, days. */
  densifiedCadenceDays?: number;
  densifyWithinDays?: number;
  /** Last epoch already obtained per kind, JD (the first window counts from it). */
  lastEpochJd?: Partial<Record<MeasurementKind, number>>;
  /** Weight when epochs compete for a night, (0, 1000]; default 1. */
  priority?: number;
}

export interface SeasonOptions {
  /** Block length per kind, minutes; default astrometry 40, spectroscopy 60. */
  blockMinutes?: Partial<Record<MeasurementKind, number>>;
  /** Expected 1σ per kind; default 1 mas and 5 km/s. */
  precision?: Partial<Precision>;
  /** Slot length for the nights' grids, minutes, [1, 30]; default 10. */
  slotMinutes?: number;
  slewMinutes?: number;
  sameTargetMinutes?: number;
  /** Share of each night's darkness the plan may fill, (0, 1]; default 0.9. */
  fillFraction?: number;
  /** Epochs per target and kind beyond the cadence, placed by information, [0, 20]; default 0. */
  extraEpochsPerTarget?: number;
}

export interface PlannedEpoch {
  target: string;
  kind: MeasurementKind;
  site: string;
  date: string;
  block: ScheduledBlock;
  /** Fractional variance reduction of T plus that of the mass when this epoch was chosen. */
  gain: number;
  why: 'cadence' | 'information';
  reason: string;
}

export interface UnmetGoal {
  target: string;
  kind: MeasurementKind;
  /** First and last night of the cadence window (local evening dates). */
  start: string;
  end: string;
  reason: string;
}

export interface TargetPlan {
  target: string;
  epochs: Record<MeasurementKind, number>;
  periapses: string[];
  cadenceMet: boolean;
  /** 1σ before and after the plan (linear, Fisher); nominalPrior: the orbit had no covariance. */
  shrinkage: {
    periapsisDays: { before: number | null; after: number | null };
    massFraction: { before: number | null; after: number | null };
    nominalPrior: boolean;
  } | null;
  /** The best epochs not in the plan, by information given the plan. */
  nextBest: { date: string; site: string; kind: MeasurementKind; gain: number }[];
}

export interface SeasonPlan {
  startDate: string;
  endDate: string;
  sites: {
    name: string;
    nights: number;
    nightsUsed: number;
    darkHours: number;
    plannedHours: number;
  }[];
  epochs: PlannedEpoch[];
  unmet: UnmetGoal[];
  targets: TargetPlan[];
  cautions: string[];
}

/** One place and night a target's block could go. */
interface Option {
  s: number;
  d: number;
  kind: MeasurementKind;
  /** The ok edges (first, last) around the best start, and the block's length in slots. */
  first: number;
  last: number;
  slots: number;
  jd: number;
  quality: number;
  jac: Float64Array | null;
  used: boolean;
}

const NOT_ALLOCATED = 5,
  NO_DARKNESS = 6,
  TOO_SHORT = 7,
  KEPT_FULL = 8;
const MAX_NIGHTS = 400;

export function planSeason(
  startDate: string,
  endDate: string,
  sites: readonly SeasonSite[],
  targets: readonly SeasonTarget[],
  options: SeasonOptions = {},
): SeasonPlan {
  parseNightDate(startDate, 'startDate');
  parseNightDate(endDate, 'endDate');
  if (endDate < startDate)
    throw new InputError('endDate', endDate, `must not be before startDate ${startDate}`);
  const dates: string[] = [];
  for (let d = startDate; d <= endDate; d = addDays(d, 1)) {
    dates.push(d);
    if (dates.length > MAX_NIGHTS)
      throw new InputError('endDate', endDate, `must be within ${MAX_NIGHTS} nights of startDate`);
  }
  if (sites.length === 0 || sites.length > 10)
    throw new InputError('sites', sites.length, 'must list 1 to 10 sites');
  if (targets.length === 0 || targets.length > 1000)
    throw new InputError('targets', targets.length, 'must list 1 to 1000 targets');
  const names = new Set<string>();
  targets.forEach((t, i) => {
    if (names.has(t.target.name))
      throw new InputError(`targets.${i}.name`, t.target.name, 'is used by an earlier target');
    names.add(t.target.name);
    positive(`targets.${i}.cadenceDays`, t.cadenceDays, 3650);
    if (t.densifiedCadenceDays !== undefined)
      positive(`targets.${i}.densifiedCadenceDays`, t.densifiedCadenceDays, 3650);
    if (t.densifyWithinDays !== undefined)
      numberIn(`targets.${i}.densifyWithinDays`, t.densifyWithinDays, 0, 3650);
    if (t.priority !== undefined) positive(`targets.${i}.priority`, t.priority, 1000);
    if (t.kinds.length === 0 || t.kinds.some((k) => !MEASUREMENT_KINDS.includes(k)))
      throw new InputError(
        `targets.${i}.kinds`,
        t.kinds,
        'must list "astrometry" and/or "spectroscopy"',
      );
  });
  const blockMinutes: Record<MeasurementKind, number> = {
    astrometry: positive('blockMinutes.astrometry', options.blockMinutes?.astrometry ?? 40, 720),
    spectroscopy: positive(
      'blockMinutes.spectroscopy',
      options.blockMinutes?.spectroscopy ?? 60,
      720,
    ),
  };
  const precision: Precision = {
    astrometryMas: positive('precision.astrometryMas', options.precision?.astrometryMas ?? 1, 1e6),
    spectroscopyKmS: positive(
      'precision.spectroscopyKmS',
      options.precision?.spectroscopyKmS ?? 5,
      1e6,
    ),
  };
  const slotMinutes = numberIn('slotMinutes', options.slotMinutes ?? 10, 1, 30);
  const slewMinutes = numberIn('slewMinutes', options.slewMinutes ?? 8, 0, 120);
  const fill = options.fillFraction ?? 0.9;
  if (!(fill > 0 && fill <= 1)) throw new InputError('fillFraction', fill, 'must lie in (0, 1]');
  const extra = numberIn('extraEpochsPerTarget', options.extraEpochsPerTarget ?? 0, 0, 20);
  const sameTargetMinutes = options.sameTargetMinutes ?? 3;
  const nS = sites.length,
    nD = dates.length;
  const keptOf = keptByNight(sites, dates, names);
  // The changeover gap a new block of target `name` keeps from a kept block (the night scheduler's rule).
  const keptGapDays = (name: string, k: KeptBlock) =>
    (k.target === name ? sameTargetMinutes : slewMinutes) / 1440;

  // Nights: grids and room left (minutes).
  const grids: (NightGrid | null)[] = [];
  const room = new Float64Array(nS * nD);
  sites.forEach((s, si) => {
    const allowed = s.nights ? new Set(s.nights) : null;
    dates.forEach((d, di) => {
      const g = allowed && !allowed.has(d) ? null : nightGrid(s.site, s.limits, d, slotMinutes);
      grids.push(g);
      const held = keptOf[si * nD + di]!.reduce(
        (m, k) => m + (k.endJd - k.startJd) * 1440 + slewMinutes,
        0,
      );
      room[si * nD + di] = g ? Math.max(0, fill * g.darkHours * 60 - held) : 0;
    });
  });
  const nightJd = dates.map((d) => nightSpan(sites[0]!.site, d).startJd + 0.5);

  // Per target: every feasible option, and why each site-night is not.
  const codes = targets.map(() => new Uint8Array(2 * nS * nD));
  const optionsOf: Option[][] = targets.map((t, ti) => {
    const out: Option[] = [];
    for (let si = 0; si < nS; si++) {
      for (let di = 0; di < nD; di++) {
        const g = grids[si * nD + di]!;
        if (!g || g.edgeJd.length === 0) {
          for (let k = 0; k < 2; k++)
            codes[ti]![(k * nS + si) * nD + di] = g ? NO_DARKNESS : NOT_ALLOCATED;
          continue;
        }
        const tg = targetGrid(g, t.target);
        const kept = keptOf[si * nD + di]!;
        const okRun =
          kept.length > 0
            ? runAroundKept(g, tg, kept, (k) => keptGapDays(t.target.name, k))
            : tg.okRun;
        for (const kind of t.kinds) {
          const k = kind === 'astrometry' ? 0 : 1;
          if (kept.some((b) => b.counts && b.target === t.target.name && b.kind === kind)) {
            codes[ti]![(k * nS + si) * nD + di] = KEPT_FULL; // a kept block is this night's epoch: no repeat
            continue;
          }
          const slots = slotsFor(blockMinutes[kind], g);
          let best = -1,
            bq = 0;
          for (let i = 0; i + slots < g.edgeJd.length; i++) {
            if (okRun[i]! >= slots + 1) {
              const q = blockQuality(tg, i, slots);
              if (q > bq) {
                bq = q;
                best = i;
              }
            }
          }
          if (best < 0) {
            if (okRun !== tg.okRun && tg.okRun.some((n) => n >= slots + 1)) {
              codes[ti]![(k * nS + si) * nD + di] = KEPT_FULL;
              continue;
            }
            const r = dominantReason(tg, sites[si]!.limits);
            codes[ti]![(k * nS + si) * nD + di] =
              r === null
                ? TOO_SHORT
                : 1 + ['altitude', 'horizon-mask', 'sun-distance', 'moon'].indexOf(r);
            continue;
          }
          let first = best;
          while (first > 0 && okRun[first - 1] === okRun[first]! + 1) first--;
          out.push({
            s: si,
            d: di,
            kind,
            first,
            last: first + okRun[first]! - 1,
            slots,
            jd: (g.edgeJd[best]! + g.edgeJd[best + slots]!) / 2,
            quality: bq,
            jac: null,
            used: false,
          });
        }
      }
    }
    return out;
  });

  // Information models and Jacobians (one batch per target).
  const models: (InformationModel | null)[] = targets.map((t) =>
    t.target.orbit ? informationModel(t.target.orbit) : null,
  );
  models.forEach((m, ti) => {
    if (!m) return;
    const opts = optionsOf[ti]!;
    const jac = jacobians(
      m,
      Float64Array.from(opts, (o) => o.jd),
    );
    opts.forEach((o, k) => {
      o.jac = jac[k]!;
    });
  });
  const planned = models.map((m) => (m ? new Float64Array(m.parameters.length ** 2) : null));
  // Kept blocks that count are epochs of the season: their information is in before anything is chosen.
  const keptEpochs = targets.map((t) =>
    keptOf.flatMap((list, key) =>
      list.filter((k) => k.counts && k.target === t.target.name).map((k) => ({ k, d: key % nD })),
    ),
  );
  const addKept = (info: (Float64Array | null)[]) =>
    keptEpochs.forEach((list, ti) => {
      const m = models[ti];
      if (!m || list.length === 0) return;
      const jac = jacobians(
        m,
        Float64Array.from(list, ({ k }) => (k.startJd + k.endJd) / 2),
      );
      list.forEach(({ k }, j) => {
        addInformation(info[ti]!, jac[j]!, m.parameters.length, k.kind, precision);
      });
    });
  addKept(planned);
  const gradients = models.map((m) => {
    if (!m) return null;
    const n = m.parameters.length;
    const t = m.parameters.indexOf('periapsisDays');
    const gT = new Float64Array(n);
    if (t >= 0) gT[t] = 1;
    return { gT: t >= 0 ? gT : null, gM: m.lnMassGradient };
  });
  const score = (ti: number, cov: Float64Array | null, o: Option): number => {
    const m = models[ti],
      g = gradients[ti];
    if (!m || !g || !cov || !o.jac) return 0;
    const n = m.parameters.length;
    let s = 0;
    for (const v of [g.gT, g.gM]) {
      if (!v) continue;
      let base = 0;
      for (let a = 0; a < n; a++)
        for (let b = 0; b < n; b++) base += v[a]! * cov[a * n + b]! * v[b]!;
      if (base > 0) s += varianceReduction(cov, n, o.jac, o.kind, precision, v) / base;
    }
    return s;
  };
  const covOf = (ti: number) =>
    models[ti] ? posteriorCovariance(models[ti]!, planned[ti]!) : null;

  const chosen: {
    ti: number;
    o: Option;
    gain: number;
    why: 'cadence' | 'information';
    reason: string;
  }[] = [];
  const unmet: UnmetGoal[] = [];
  const cost = (kind: MeasurementKind) => blockMinutes[kind] + slewMinutes;
  // Blocks accepted per site-night, checked by earliest-latest-start packing (never accepts what cannot fit).
  const accepted = new Map<number, { first: number; last: number; slots: number; ti: number }[]>();
  const gapSlots = (a: number, b: number) =>
    Math.ceil((a === b ? (options.sameTargetMinutes ?? 3) : slewMinutes) / slotMinutes - 1e-9);
  const fitsNight = (ti: number, o: Option): boolean => {
    if (room[o.s * nD + o.d]! < cost(o.kind)) return false;
    const list = [
      ...(accepted.get(o.s * nD + o.d) ?? []),
      { first: o.first, last: o.last, slots: o.slots, ti },
    ];
    list.sort((a, b) => a.last - a.slots - (b.last - b.slots) || a.first - b.first);
    let t = -Infinity,
      prev = -1;
    for (const b of list) {
      const start = Math.max(b.first, prev < 0 ? b.first : t + gapSlots(prev, b.ti));
      if (start + b.slots > b.last) return false;
      t = start + b.slots;
      prev = b.ti;
    }
    return true;
  };
  const take = (
    ti: number,
    o: Option,
    gain: number,
    why: 'cadence' | 'information',
    reason: string,
  ) => {
    o.used = true;
    room[o.s * nD + o.d] = room[o.s * nD + o.d]! - cost(o.kind);
    const key = o.s * nD + o.d;
    if (!accepted.has(key)) accepted.set(key, []);
    accepted.get(key)!.push({ first: o.first, last: o.last, slots: o.slots, ti });
    if (models[ti] && o.jac)
      addInformation(planned[ti]!, o.jac, models[ti]!.parameters.length, o.kind, precision);
    chosen.push({ ti, o, gain, why, reason });
  };
  const periapsesOf = targets.map((t) =>
    t.target.orbit
      ? findEvents(t.target.orbit, nightJd[0]! - 400, nightJd[nD - 1]! + 400, {
          kinds: ['periapsis'],
        }).map((e) => e.jd)
      : [],
  );
  const cadenceMet = targets.map(() => true);

  // Cadence, highest priority first (ties: input order).
  const order = targets
    .map((_, i) => i)
    .sort((a, b) => (targets[b]!.priority ?? 1) - (targets[a]!.priority ?? 1) || a - b);
  for (const ti of order) {
    const t = targets[ti]!;
    const near = (di: number) => {
      const w = t.densifyWithinDays ?? 0;
      return (
        t.densifiedCadenceDays !== undefined &&
        periapsesOf[ti]!.some((p) => Math.abs(p - nightJd[di]!) <= w)
      );
    };
    const cad = (di: number) =>
      Math.max(1, Math.round(near(di) ? t.densifiedCadenceDays! : t.cadenceDays));
    for (const kind of t.kinds) {
      const last = t.lastEpochJd?.[kind];
      let lastIdx = last === undefined ? -1 : Math.floor(last - nightJd[0]!);
      if (lastIdx + cad(0) < 0) lastIdx = -1; // overdue: the first window starts now
      for (;;) {
        let end = lastIdx + 1;
        while (end < nD && end - lastIdx <= cad(end)) end++;
        if (end >= nD && (lastIdx >= 0 || last !== undefined)) break; // the rest of the gap runs past the range
        const from = Math.max(0, lastIdx + 1),
          to = end - 1;
        if (from > to || from >= nD) break;
        const held = keptEpochs[ti]!.filter(({ k, d }) => k.kind === kind && d >= from && d <= to);
        if (held.length > 0) {
          lastIdx = Math.max(...held.map(({ d }) => d)); // a kept block already meets this window
          continue;
        }
        const cov = covOf(ti);
        // Look in the second half of the window first, so the epochs come about one cadence apart, not closer.
        let best: Option | null = null,
          bestScore = -1,
          count = 0;
        for (const half of [Math.max(from, Math.min(to, lastIdx + Math.ceil(cad(to) / 2))), from]) {
          for (const o of optionsOf[ti]!) {
            if (o.kind !== kind || o.used || o.d < half || o.d > to || !fitsNight(ti, o)) continue;
            count++;
            const sc = score(ti, cov, o);
            if (
              sc > bestScore + 1e-12 ||
              (Math.abs(sc - bestScore) <= 1e-12 && best && o.quality > best.quality + 1e-12)
            ) {
              best = o;
              bestScore = sc;
            }
          }
          if (best) break;
        }
        if (best) {
          const dens = near(best.d)
            ? ` (densified to ${t.densifiedCadenceDays} d near periapsis)`
            : '';
          take(
            ti,
            best,
            bestScore,
            'cadence',
            `keeps every gap within ${cad(best.d)} d${dens}: the most informative of ${count} open site-nights in the window ${dates[from]} to ${dates[to]} (gain ${bestScore.toFixed(3)}, airmass ${(1 / best.quality).toFixed(2)})`,
          );
          lastIdx = best.d;
        } else {
          cadenceMet[ti] = false;
          unmet.push({
            target: t.target.name,
            kind,
            start: dates[from]!,
            end: dates[to]!,
            reason: whyNone(ti, kind, from, to),
          });
          lastIdx = to;
        }
      }
    }
  }
  function whyNone(ti: number, kind: MeasurementKind, from: number, to: number): string {
    const t = targets[ti]!;
    const k = kind === 'astrometry' ? 0 : 1;
    const peri = periapsesOf[ti]!.find((p) => p >= nightJd[from]! - 0.5 && p <= nightJd[to]! + 0.5);
    const parts = sites.map((s, si) => {
      const counts = new Map<number, number>();
      for (let d = from; d <= to; d++) {
        const c = codes[ti]![(k * nS + si) * nD + d]!;
        counts.set(c, (counts.get(c) ?? 0) + 1);
      }
      const [code, n] = [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]!;
      const words =
        code === 0
          ? 'its windows are already full'
          : code === KEPT_FULL
            ? 'its windows are taken by blocks that stay on the night'
            : code === NOT_ALLOCATED
              ? 'has no allocated night'
              : code === NO_DARKNESS
                ? 'has no darkness'
                : code === TOO_SHORT
                  ? `has no window as long as the ${blockMinutes[kind]}-min block`
                  : `${t.target.name} ${reasonWords((['altitude', 'horizon-mask', 'sun-distance', 'moon'] as ReasonCode[])[code - 1]!, s.limits)}`;
      return `at ${s.site.name} ${words} (${n} of ${to - from + 1} nights)`;
    });
    return `${peri ? `periapsis on ${jdToIso(peri).slice(0, 10)} falls in this window, but ` : ''}no ${kind} epoch fits from ${dates[from]} to ${dates[to]}: ${parts.join('; ')}`;
  }

  // Extra epochs where they tighten the orbit most.
  for (let round = 0; round < extra; round++) {
    for (const ti of order) {
      const cov = covOf(ti);
      let best: Option | null = null,
        bestScore = 1e-9;
      for (const o of optionsOf[ti]!) {
        if (o.used || !fitsNight(ti, o)) continue;
        const sc = score(ti, cov, o);
        if (sc > bestScore) {
          best = o;
          bestScore = sc;
        }
      }
      if (best)
        take(
          ti,
          best,
          bestScore,
          'information',
          `beyond the cadence: the site-night of the range that most tightens the orbit (gain ${bestScore.toFixed(3)})`,
        );
    }
  }

  // Time each site-night's blocks with the night scheduler.
  const epochs: PlannedEpoch[] = [];
  const byNight = new Map<number, typeof chosen>();
  for (const c of chosen) {
    const key = c.o.s * nD + c.o.d;
    if (!byNight.has(key)) byNight.set(key, []);
    byNight.get(key)!.push(c);
  }
  const skyTargets = targets.map((t) => t.target);
  const finalInfo = models.map((m) => (m ? new Float64Array(m.parameters.length ** 2) : null));
  addKept(finalInfo);
  for (const [key, list] of [...byNight.entries()].sort((a, b) => a[0] - b[0])) {
    const si = Math.floor(key / nD),
      di = key % nD;
    const lgs = sites[si]!.laserGuideStar === true;
    const schedule = scheduleOnGrid(
      grids[key]!,
      skyTargets,
      {
        candidates: list.map((c, k) => ({
          id: `${k}`,
          target: targets[c.ti]!.target.name,
          kind: c.o.kind,
          durationMinutes: blockMinutes[c.o.kind],
          priority: (targets[c.ti]!.priority ?? 1) * (1 + c.gain),
          laserGuideStar: lgs && c.o.kind === 'astrometry',
        })),
        slewMinutes,
        sameTargetMinutes: options.sameTargetMinutes,
        kept: keptOf[key]!,
      },
      new Map(),
    );
    for (const b of schedule.blocks) {
      const c = list[Number(b.id)]!;
      const ti = c.ti;
      epochs.push({
        target: targets[ti]!.target.name,
        kind: c.o.kind,
        site: sites[si]!.site.name,
        date: dates[di]!,
        block: {
          ...b,
          id: `${targets[ti]!.target.name}/${c.o.kind}/${dates[di]}/${sites[si]!.site.name}`,
        },
        gain: c.gain,
        why: c.why,
        reason: c.reason,
      });
      const m = models[ti];
      if (m) {
        const jd = (Date.parse(b.start.utc) + Date.parse(b.end.utc)) / 2 / 86_400_000 + 2_440_587.5;
        addInformation(
          finalInfo[ti]!,
          jacobians(m, Float64Array.of(jd))[0]!,
          m.parameters.length,
          c.o.kind,
          precision,
        );
      }
    }
    for (const l of schedule.leftOut) {
      const c = list[Number(l.id)]!;
      cadenceMet[c.ti] = false;
      unmet.push({
        target: l.target,
        kind: l.kind,
        start: dates[di]!,
        end: dates[di]!,
        reason: `chosen for ${sites[si]!.site.name} but did not fit in the night's schedule: ${l.reason}`,
      });
    }
  }
  epochs.sort(
    (a, b) =>
      a.block.start.utc.localeCompare(b.block.start.utc) || a.target.localeCompare(b.target),
  );

  const targetPlans: TargetPlan[] = targets.map((t, ti) => {
    const m = models[ti];
    let shrinkage: TargetPlan['shrinkage'] = null;
    if (m) {
      const before: Uncertainties = uncertainties(m, null);
      const after = uncertainties(m, finalInfo[ti]!);
      shrinkage = {
        periapsisDays: { before: before.periapsisDays, after: after.periapsisDays },
        massFraction: { before: before.massFraction, after: after.massFraction },
        nominalPrior: m.nominalPrior,
      };
    }
    const cov = covOf(ti);
    const nextBest = optionsOf[ti]!.filter((o) => !o.used)
      .map((o) => ({ o, g: score(ti, cov, o) }))
      .sort((a, b) => b.g - a.g || a.o.d - b.o.d)
      .slice(0, 3)
      .map(({ o, g }) => ({
        date: dates[o.d]!,
        site: sites[o.s]!.site.name,
        kind: o.kind,
        gain: g,
      }));
    const mine = epochs.filter((e) => e.target === t.target.name);
    return {
      target: t.target.name,
      epochs: {
        astrometry: mine.filter((e) => e.kind === 'astrometry').length,
        spectroscopy: mine.filter((e) => e.kind === 'spectroscopy').length,
      },
      periapses: periapsesOf[ti]!.filter(
        (p) => p >= nightJd[0]! - 0.5 && p <= nightJd[nD - 1]! + 0.5,
      ).map(jdToIso),
      cadenceMet: cadenceMet[ti]!,
      shrinkage,
      nextBest,
    };
  });
  const cautions = [PLAN_ADVISORY];
  if (epochs.some((e) => e.block.laserGuideStar)) cautions.push(LASER_GUIDE_STAR_CAUTION);
  return {
    startDate,
    endDate,
    sites: sites.map((s, si) => {
      const gs = grids.slice(si * nD, si * nD + nD);
      const mine = epochs.filter((e) => e.site === s.site.name);
      return {
        name: s.site.name,
        nights: gs.filter((g) => g !== null).length,
        nightsUsed: new Set(mine.map((e) => e.date)).size,
        darkHours: gs.reduce((h, g) => h + (g?.darkHours ?? 0), 0),
        plannedHours: mine.reduce((h, e) => h + e.block.minutes / 60, 0),
      };
    }),
    epochs,
    unmet,
    targets: targetPlans,
    cautions,
  };
}

/** Each site-night's kept blocks (index site × nights + night), checked against the sites' nights and the targets. */
function keptByNight(
  sites: readonly SeasonSite[],
  dates: readonly string[],
  names: ReadonlySet<string>,
): (readonly KeptBlock[])[] {
  const out: (readonly KeptBlock[])[] = [];
  sites.forEach((s, si) => {
    const byDate = s.kept ?? {};
    for (const [date, list] of Object.entries(byDate)) {
      if (!dates.includes(date) || (s.nights && !s.nights.includes(date)))
        throw new InputError(
          `sites.${si}.kept.${date}`,
          date,
          "must be one of the site's nights in the range",
        );
      list.forEach((k, j) => {
        const f = `sites.${si}.kept.${date}.${j}`;
        if (k.target !== null && !names.has(k.target))
          throw new InputError(
            `${f}.target`,
            k.target,
            'must name one of the targets, or be null for a target outside the plan',
          );
        if (!MEASUREMENT_KINDS.includes(k.kind))
          throw new InputError(`${f}.kind`, k.kind, 'must be "astrometry" or "spectroscopy"');
        if (!(Number.isFinite(k.startJd) && Number.isFinite(k.endJd) && k.endJd > k.startJd))
          throw new InputError(
            `${f}.endJd`,
            k.endJd,
            `must be a finite JD after startJd ${k.startJd}`,
          );
      });
    }
    for (const d of dates) out.push(byDate[d] ?? []);
  });
  return out;
}

/** The target's ok runs (edges from each one) with the time of kept blocks, widened by the changeover gap, cut out. */
function runAroundKept(
  g: NightGrid,
  tg: TargetGrid,
  kept: readonly KeptBlock[],
  gapDays: (k: KeptBlock) => number,
): Int32Array {
  const jd = g.edgeJd,
    n = jd.length;
  const run = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    if (!tg.ok[i]) continue;
    const on =
      tg.okRun[i]! > 1 &&
      !kept.some(
        (k) => jd[i]! < k.endJd + gapDays(k) - 1e-9 && jd[i + 1]! > k.startJd - gapDays(k) + 1e-9,
      );
    run[i] = 1 + (on ? run[i + 1]! : 0);
  }
  return run;
}
