/**
 * The season's nights and each target's options on them: the grid of every allocated site-night,
 * the time left on it, and for each target and kind the placements a block could take there (one
 * per night, or one per part of the night inside a periapsis window when repeated epochs are
 * asked for), each with its airmass and the precision it would have. Where a site-night has no
 * placement, the limit that closed it (night-reasons.ts).
 */
import { InputError } from '../errors.ts';
import { nightSpan } from '../sky/night.ts';
import { BLOCK_KINDS, slotsFor, type BlockKind } from './candidates.ts';
import { blockQuality, nightGrid, targetGrid, type NightGrid, type TargetGrid } from './grid.ts';
import type { Precision } from './information.ts';
import { closingLimit, type NightReasonDetail } from './night-reasons.ts';
import type { KeptBlock } from './night-schedule.ts';
import { precisionAt, type PrecisionModel } from './precision.ts';
import type { RepeatRule, ResolvedTarget, SeasonSite } from './season-types.ts';

/** One place and time a target's block could go. */
export interface Option {
  s: number;
  d: number;
  kind: BlockKind;
  /** The ok edges (first, last) around the best start, the block's length in slots, and whether a timing window holds it there. */
  first: number;
  last: number;
  slots: number;
  timed: boolean;
  jd: number;
  airmass: number;
  precision: Precision & { seeingArcsec: number | null };
  jac: Float64Array | null;
  used: boolean;
}

export interface SeasonNights {
  dates: string[];
  nS: number;
  nD: number;
  grids: (NightGrid | null)[];
  /** Minutes each site-night may still fill. */
  room: Float64Array;
  kept: (readonly KeptBlock[])[];
  /** Span of each site-night's darkness (or its local midnight when it has none), JD. */
  darkStartJd: Float64Array;
  darkEndJd: Float64Array;
  weight: Float64Array;
}

export const kindIndex = (k: BlockKind) => (k === 'astrometry' ? 0 : 1);

/** Grids, room and kept blocks of every site-night (index s·nD + d). */
export function seasonNights(
  sites: readonly SeasonSite[],
  dates: string[],
  names: ReadonlySet<string>,
  slotMinutes: number,
  fill: number,
  slewMinutes: number,
): SeasonNights {
  const nS = sites.length,
    nD = dates.length;
  const kept = keptByNight(sites, dates, names);
  const grids: (NightGrid | null)[] = [];
  const room = new Float64Array(nS * nD);
  const darkStartJd = new Float64Array(nS * nD),
    darkEndJd = new Float64Array(nS * nD),
    weight = new Float64Array(nS * nD);
  sites.forEach((s, si) => {
    const allowed = s.nights ? new Set(s.nights) : null;
    dates.forEach((d, di) => {
      const key = si * nD + di;
      const g = allowed && !allowed.has(d) ? null : nightGrid(s.site, s.limits, d, slotMinutes);
      grids.push(g);
      const held = kept[key]!.reduce((m, k) => m + (k.endJd - k.startJd) * 1440 + slewMinutes, 0);
      room[key] = g ? Math.max(0, fill * g.darkHours * 60 - held) : 0;
      const mid = nightSpan(s.site, d).startJd + 0.5;
      darkStartJd[key] = g?.dark[0]?.startJd ?? mid;
      darkEndJd[key] = g?.dark[g.dark.length - 1]?.endJd ?? mid;
      const w = s.nightWeights?.[d] ?? 1;
      if (!(w > 0 && w <= 1))
        throw new InputError(`sites.${si}.nightWeights.${d}`, w, 'must lie in (0, 1]');
      weight[key] = w;
    });
  });
  return { dates, nS, nD, grids, room, kept, darkStartJd, darkEndJd, weight };
}

/** Each site-night's kept blocks, checked against the sites' nights and the targets. */
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
        if (!BLOCK_KINDS.includes(k.kind))
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

/** Edge ranges [a, b] the night is cut into for repeated epochs (the whole night for 'single'). */
function segments(
  g: NightGrid,
  repeat: RepeatRule,
  slots: number,
  gapSlots: number,
): [number, number][] {
  const n = g.edgeJd.length;
  if (repeat === 'single' || n === 0) return [[0, n - 1]];
  const len =
    repeat === 'fill'
      ? slots + gapSlots
      : Math.max(slots, Math.round((repeat.stepHours * 60) / g.slotMinutes));
  const out: [number, number][] = [];
  for (let a = 0; a < n - 1; a += len) out.push([a, Math.min(n - 1, a + len)]);
  return out;
}

export interface OptionContext {
  nights: SeasonNights;
  sites: readonly SeasonSite[];
  precision: PrecisionModel[];
  slewMinutes: number;
  sameTargetMinutes: number;
  /** Whether site-night (s, d) lies in one of the target's periapsis windows. */
  inWindow: (s: number, d: number) => boolean;
}

/** Every placement of one target, and for each site-night and kind without one, the closing limit. */
export function targetOptions(
  ctx: OptionContext,
  t: ResolvedTarget,
): { options: Option[]; closed: (NightReasonDetail | null)[] } {
  const { nights, sites } = ctx;
  const { nS, nD } = nights;
  const closed: (NightReasonDetail | null)[] = new Array(2 * nS * nD).fill(null);
  const options: Option[] = [];
  const gapDays = (k: KeptBlock) =>
    (k.target === t.name ? ctx.sameTargetMinutes : ctx.slewMinutes) / 1440;
  for (let si = 0; si < nS; si++) {
    for (let di = 0; di < nD; di++) {
      const key = si * nD + di;
      const g = nights.grids[key]!;
      const at = (kind: BlockKind) => (kindIndex(kind) * nS + si) * nD + di;
      if (!g || g.edgeJd.length === 0) {
        for (const kind of t.input.kinds)
          closed[at(kind)] = { reason: g ? 'no-darkness' : 'not-allocated' };
        continue;
      }
      const tg = targetGrid(g, t.input.target);
      const kept = nights.kept[key]!;
      const okRun = kept.length > 0 ? runAroundKept(g, tg, kept, gapDays) : tg.okRun;
      for (const kind of t.input.kinds) {
        if (kept.some((b) => b.counts && b.target === t.name && b.kind === kind)) {
          closed[at(kind)] = { reason: 'kept-epoch' };
          continue;
        }
        const minutes = t.blockMinutes[kind];
        const slots = slotsFor(minutes, g);
        const repeat = ctx.inWindow(si, di) ? t.repeat : 'single';
        const gap = Math.ceil(ctx.sameTargetMinutes / g.slotMinutes - 1e-9);
        let any = false;
        for (const [a, b] of segments(g, repeat, slots, gap)) {
          const o = bestIn(g, tg, okRun, a, b, slots);
          if (!o) continue;
          any = true;
          const p = precisionAt(
            ctx.precision[si]!,
            o.airmass,
            sites[si]!.limits.zenithSeeingArcsec,
          );
          options.push({
            s: si,
            d: di,
            kind,
            ...o,
            slots,
            timed: repeat !== 'single',
            precision: p,
            jac: null,
            used: false,
          });
        }
        if (any) continue;
        const why = closingLimit(g, tg, slots, minutes);
        closed[at(kind)] =
          why ??
          (okRun !== tg.okRun
            ? { reason: 'kept-full', takenBy: kept.map((k) => k.label) }
            : { reason: 'too-short', blockMinutes: minutes, longestHours: 0 });
      }
    }
  }
  return { options, closed };
}

/** The best start of a block of `slots` slots with edges in [a, b] (lowest mean airmass), with its ok range, or null. */
function bestIn(
  g: NightGrid,
  tg: TargetGrid,
  okRun: Int32Array,
  a: number,
  b: number,
  slots: number,
): { first: number; last: number; jd: number; airmass: number } | null {
  let best = -1,
    bq = 0;
  for (let i = a; i + slots <= b && i + slots < g.edgeJd.length; i++) {
    if (okRun[i]! >= slots + 1) {
      const q = blockQuality(tg, i, slots);
      if (q > bq) {
        bq = q;
        best = i;
      }
    }
  }
  if (best < 0) return null;
  let first = best;
  while (first > a && okRun[first - 1] === okRun[first]! + 1) first--;
  const last = Math.min(b, first + okRun[first]! - 1);
  return { first, last, jd: (g.edgeJd[best]! + g.edgeJd[best + slots]!) / 2, airmass: 1 / bq };
}
