/**
 * The night scheduler: from candidate blocks for one site and night, a non-overlapping sequence
 * inside the observable windows that maximises Σ priority × (mean 1/airmass over the block), with a
 * changeover gap between blocks, pinned blocks kept where the user put them, blocks already stored
 * that must stay (`kept`) planned around, and a reason for every block left out. The same input
 * always gives the same schedule.
 */
import { InputError } from '../errors.ts';
import type { Limits } from '../sky/limits.ts';
import { instant, type Instant } from '../sky/night.ts';
import { cautions as skyCautions } from '../sky/night-report.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { jdToIso, parseEpoch } from '../time/index.ts';
import { LASER_GUIDE_STAR_CAUTION, PLAN_ADVISORY } from './cautions.ts';
import {
  checkCandidates,
  fitsAt,
  slotsFor,
  timingEdges,
  valueAt,
  type Candidate,
  type BlockKind,
} from './candidates.ts';
import { nightGrid, REASON_CODES, targetGrid, type NightGrid, type TargetGrid } from './grid.ts';
import { closingLimit, edgeReason, nightReasonWords } from './night-reasons.ts';
import { numberIn } from './checks.ts';
import {
  EXACT_MAX_ITEMS,
  solveExact,
  solveGreedy,
  totalValue,
  type Placement,
  type SolverItem,
} from './solver.ts';

export const SCHEDULE_METHODS = ['auto', 'exact', 'heuristic'] as const;
export type ScheduleMethod = (typeof SCHEDULE_METHODS)[number];
/** 'auto' solves exactly up to this many schedulable candidates. */
export const AUTO_EXACT_ITEMS = 8;

export interface ScheduleOptions {
  /** Slot length, minutes, [1, 30]; default 5. Blocks start and end on slot edges. */
  slotMinutes?: number;
  /**
   * Gap between blocks of different targets (slew and acquisition), minutes, [0, 120]; default 8
   * (common practice, no source).
   */
  slewMinutes?: number;
  /** Gap between consecutive blocks of the same target (instrument change), minutes, [0, 120]; default 3. */
  sameTargetMinutes?: number;
  method?: ScheduleMethod;
}

export interface ScheduleRequest extends ScheduleOptions {
  candidates: unknown;
  /** Blocks to keep at a start time: [{ id, start }] (start: ISO 8601 UTC, snapped to the nearest slot edge). */
  pins?: unknown;
  /** Candidate ids to leave out. */
  remove?: unknown;
  /** Blocks already on the night that stay as they are: no block may overlap one (with the changeover gap). */
  kept?: readonly KeptBlock[];
}

/** A stored block the schedule must plan around. */
export interface KeptBlock {
  /** How the reasons name it, e.g. "block 12". */
  label: string;
  /** Name of one of the targets, or null for a target outside the request (the slew gap then applies). */
  target: string | null;
  kind: BlockKind;
  startJd: number;
  endJd: number;
  /**
   * It stands for the night's epoch of its target and kind (planned or obtained, not lost or
   * withdrawn): a candidate of the same target and kind is left out.
   */
  counts: boolean;
  /** It was already obtained (in whole or in part): a season's draws take it as certain, not subject to the weather. */
  obtained?: boolean;
}

export interface ScheduledBlock {
  id: string;
  target: string;
  kind: BlockKind;
  start: Instant;
  end: Instant;
  minutes: number;
  priority: number;
  /** priority × mean 1/airmass over the block. */
  value: number;
  airmassStart: number;
  airmassMiddle: number;
  airmassEnd: number;
  altitudeMiddleDeg: number;
  pinned: boolean;
  laserGuideStar: boolean;
  cautions: string[];
}

export interface LeftOutBlock {
  id: string;
  target: string;
  kind: BlockKind;
  reason: string;
}

export interface NightSchedule {
  site: string;
  timeZone: string;
  date: string;
  slotMinutes: number;
  slewMinutes: number;
  sameTargetMinutes: number;
  method: 'exact' | 'heuristic';
  darkness: { start: Instant; end: Instant; hours: number }[];
  darkHours: number;
  /** Hours inside blocks. */
  scheduledHours: number;
  totalValue: number;
  blocks: ScheduledBlock[];
  leftOut: LeftOutBlock[];
  cautions: string[];
}

interface Pin {
  candidate: Candidate;
  start: number;
}

/** Schedule one night at a site. @throws InputError naming the first bad field. */
export function scheduleNight(
  site: Site,
  limits: Limits,
  date: string,
  targets: readonly Target[],
  request: ScheduleRequest,
): NightSchedule {
  const slotMinutes =
    request.slotMinutes === undefined ? 5 : numberIn('slotMinutes', request.slotMinutes, 1, 30);
  const grid = nightGrid(site, limits, date, slotMinutes);
  return scheduleOnGrid(grid, targets, request, new Map());
}

/** Schedule on a prepared grid, reusing target grids cached by target index. */
export function scheduleOnGrid(
  grid: NightGrid,
  targets: readonly Target[],
  request: ScheduleRequest,
  cache: Map<number, TargetGrid>,
): NightSchedule {
  const { slewMinutes, sameTargetMinutes, method } = scheduleOptions(request);
  const candidates = gridCandidates(grid, targets, request.candidates, cache);
  const byId = new Map(candidates.map((c) => [c.id, c]));
  const removed = readRemoved(request.remove, byId);
  const gapDays = (a: number, b: number) => (a === b ? sameTargetMinutes : slewMinutes) / 1440;
  const { kept, repeats, clearOfKept } = keptBlocks(
    request,
    targets,
    candidates,
    slewMinutes,
    gapDays,
  );
  const pins = readPins(request.pins, byId, removed, grid, repeats, (c, s) =>
    clearOfKept(c, grid.edgeJd[s]!, grid.edgeJd[s + c.slots]!),
  );
  const jd = grid.edgeJd;
  const clearOfPins = (c: Candidate, s: number) =>
    pins.every((p) => {
      const e = s + c.slots,
        pe = p.start + p.candidate.slots;
      if (p.candidate === c) return false;
      if (jd[e]! + gapDays(c.targetIndex, p.candidate.targetIndex) <= jd[p.start]! + 1e-9)
        return true;
      return jd[pe]! + gapDays(p.candidate.targetIndex, c.targetIndex) <= jd[s]! + 1e-9;
    });

  const free = candidates.filter(
    (c) => !removed.has(c.id) && !repeats.has(c) && !pins.some((p) => p.candidate === c),
  );
  const { items, everFits } = solverItems(
    free,
    jd.length,
    (c, i) => clearOfPins(c, i) && clearOfKept(c, jd[i]!, jd[i + c.slots]!) === null,
  );
  const schedulable = items.filter((it) => it.starts.length > 0).length;
  const used = methodFor(method, schedulable);
  const problem = { edgeJd: jd, items, gapDays };
  const chosen: Placement[] = used === 'exact' ? solveExact(problem) : solveGreedy(problem);

  const placed = [
    ...pins.map((p) => ({ c: p.candidate, start: p.start, pinned: true })),
    ...chosen.map((pl) => ({ c: free[pl.item]!, start: pl.start, pinned: false })),
  ].sort((a, b) => a.start - b.start || a.c.index - b.c.index);
  const leftOut = candidates
    .filter((c) => !placed.some((p) => p.c === c))
    .map((c) => ({
      id: c.id,
      target: c.targetName,
      kind: c.kind,
      reason:
        repeats.get(c) ??
        whyLeftOut(c, grid, removed, everFits.get(c) ?? false, pins, placed, kept.length > 0),
    }));
  return scheduleResult(grid, placed, leftOut, { slewMinutes, sameTargetMinutes, method: used });
}

/** The kept blocks with their targets' indices, the candidates they repeat, and the test of a clash. */
function keptBlocks(
  request: ScheduleRequest,
  targets: readonly Target[],
  candidates: Candidate[],
  slewMinutes: number,
  gapDays: (a: number, b: number) => number,
) {
  const kept = (request.kept ?? []).map((k) => ({
    ...k,
    targetIndex: k.target === null ? -1 : targets.findIndex((t) => t.name === k.target),
  }));
  const repeats = keptRepeats(candidates, kept);
  // Clear of a kept block: the changeover gap on both sides (a target outside the request always needs a slew).
  const clearOfKept = (c: Candidate, startJd: number, endJd: number) =>
    kept.find((k) => {
      const gap = k.targetIndex < 0 ? slewMinutes / 1440 : gapDays(c.targetIndex, k.targetIndex);
      return !(endJd + gap <= k.startJd + 1e-9 || k.endJd + gap <= startJd + 1e-9);
    }) ?? null;
  return { kept, repeats, clearOfKept };
}

/** The schedule as reported: the placed blocks in time order, the night's darkness, totals and cautions. */
function scheduleResult(
  grid: NightGrid,
  placed: readonly { c: Candidate; start: number; pinned: boolean }[],
  leftOut: NightSchedule['leftOut'],
  used: Pick<NightSchedule, 'slewMinutes' | 'sameTargetMinutes' | 'method'>,
): NightSchedule {
  const zone = grid.site.timeZone;
  const blocks = placed.map(({ c, start, pinned }) =>
    scheduledBlock(c, start, pinned, grid.edgeJd, zone),
  );
  const notes = [PLAN_ADVISORY, ...skyCautions(grid.limits).slice(1)];
  if (blocks.some((b) => b.laserGuideStar)) notes.push(LASER_GUIDE_STAR_CAUTION);
  return {
    site: grid.site.name,
    timeZone: zone,
    date: grid.date,
    slotMinutes: grid.slotMinutes,
    slewMinutes: used.slewMinutes,
    sameTargetMinutes: used.sameTargetMinutes,
    method: used.method,
    darkness: grid.dark.map((d) => ({
      start: instant(d.startJd, zone),
      end: instant(d.endJd, zone),
      hours: (d.endJd - d.startJd) * 24,
    })),
    darkHours: grid.darkHours,
    scheduledHours: blocks.reduce((h, b) => h + b.minutes / 60, 0),
    totalValue: totalValue(blocks.map((b) => ({ item: 0, start: 0, end: 0, value: b.value }))),
    blocks,
    leftOut,
    cautions: notes,
  };
}

/** The request's candidates, checked, with their slots, timing edges and the target's grid (cached). */
function gridCandidates(
  grid: NightGrid,
  targets: readonly Target[],
  input: ScheduleRequest['candidates'],
  cache: Map<number, TargetGrid>,
): Candidate[] {
  const gridOf = (i: number) => {
    let g = cache.get(i);
    if (!g) {
      g = targetGrid(grid, targets[i]!);
      cache.set(i, g);
    }
    return g;
  };
  return checkCandidates(input, targets).map((c) => {
    const [firstEdge, lastEdge] = timingEdges(grid, c.earliestJd, c.latestJd);
    return {
      ...c,
      slots: slotsFor(c.durationMinutes, grid),
      grid: gridOf(c.targetIndex),
      firstEdge,
      lastEdge,
    };
  });
}

/** Candidates that would repeat a kept block's target and kind tonight, with the words saying so. */
function keptRepeats(
  candidates: Candidate[],
  kept: readonly (KeptBlock & { targetIndex: number })[],
): Map<Candidate, string> {
  const repeats = new Map<Candidate, string>();
  for (const c of candidates) {
    const same = kept.find((k) => k.counts && k.targetIndex === c.targetIndex && k.kind === c.kind);
    if (same) repeats.set(c, `already has a kept block of this kind tonight (${same.label})`);
  }
  return repeats;
}

/** The changeover gaps and the solver asked for, each checked. */
function scheduleOptions(request: ScheduleRequest): {
  slewMinutes: number;
  sameTargetMinutes: number;
  method: ScheduleMethod;
} {
  const slewMinutes =
    request.slewMinutes === undefined ? 8 : numberIn('slewMinutes', request.slewMinutes, 0, 120);
  const sameTargetMinutes =
    request.sameTargetMinutes === undefined
      ? 3
      : numberIn('sameTargetMinutes', request.sameTargetMinutes, 0, 120);
  const method = request.method ?? 'auto';
  if (!(SCHEDULE_METHODS as readonly string[]).includes(method))
    throw new InputError('method', method, `must be one of ${SCHEDULE_METHODS.join(', ')}`);
  return { slewMinutes, sameTargetMinutes, method };
}

/**
 * Each free candidate's possible starts with their values: the slots where it fits the night's
 * limits (`everFits` remembers whether any did) and `clear` allows (pins and kept blocks).
 */
function solverItems(
  free: Candidate[],
  edgeCount: number,
  clear: (c: Candidate, start: number) => boolean,
): { items: SolverItem[]; everFits: Map<Candidate, boolean> } {
  const everFits = new Map<Candidate, boolean>();
  const items = free.map((c): SolverItem => {
    const starts: number[] = [];
    const values: number[] = [];
    let fits = false;
    for (let i = 0; i + c.slots < edgeCount; i++) {
      if (!fitsAt(c, i)) continue;
      fits = true;
      if (!clear(c, i)) continue;
      starts.push(i);
      values.push(valueAt(c, i));
    }
    everFits.set(c, fits);
    return {
      slots: c.slots,
      group: c.targetIndex,
      starts: Int32Array.from(starts),
      values: Float64Array.from(values),
    };
  });
  return { items, everFits };
}

/** "auto" solves exactly up to AUTO_EXACT_ITEMS schedulable candidates; "exact" refuses beyond its limit. */
function methodFor(method: ScheduleMethod, schedulable: number): 'exact' | 'heuristic' {
  if (method === 'exact') {
    if (schedulable > EXACT_MAX_ITEMS)
      throw new InputError(
        'method',
        method,
        `solves at most ${EXACT_MAX_ITEMS} schedulable candidates (this night has ${schedulable}` +
          `); use "auto" or "heuristic"`,
      );
    return 'exact';
  }
  return method === 'heuristic' || schedulable > AUTO_EXACT_ITEMS ? 'heuristic' : 'exact';
}

/** A placed candidate as the schedule shows it: its times, airmass at start, middle and end. */
function scheduledBlock(
  c: Candidate,
  start: number,
  pinned: boolean,
  jd: Float64Array,
  zone: string,
): ScheduledBlock {
  const end = start + c.slots;
  const mid = Math.round((start + end) / 2);
  return {
    id: c.id,
    target: c.targetName,
    kind: c.kind,
    start: instant(jd[start]!, zone),
    end: instant(jd[end]!, zone),
    minutes: Math.round((jd[end]! - jd[start]!) * 1440),
    priority: c.priority,
    value: valueAt(c, start),
    airmassStart: c.grid.airmass[start]!,
    airmassMiddle: c.grid.airmass[mid]!,
    airmassEnd: c.grid.airmass[end]!,
    altitudeMiddleDeg: c.grid.altitudeDeg[mid]!,
    pinned,
    laserGuideStar: c.laserGuideStar,
    cautions: c.laserGuideStar ? [LASER_GUIDE_STAR_CAUTION] : [],
  };
}

function readRemoved(input: unknown, byId: Map<string, Candidate>): Set<string> {
  if (input === undefined || input === null) return new Set();
  if (!Array.isArray(input))
    throw new InputError('remove', input, 'must be an array of candidate ids');
  input.forEach((id, k) => {
    if (typeof id !== 'string' || !byId.has(id))
      throw new InputError(`remove.${k}`, id, 'must be the id of a candidate');
  });
  return new Set(input as string[]);
}

function readPins(
  input: unknown,
  byId: Map<string, Candidate>,
  removed: Set<string>,
  grid: NightGrid,
  repeats: Map<Candidate, string>,
  clash: (c: Candidate, s: number) => KeptBlock | null,
): Pin[] {
  if (input === undefined || input === null) return [];
  if (!Array.isArray(input))
    throw new InputError('pins', input, 'must be an array of { id, start }');
  const jd = grid.edgeJd;
  const half = grid.slotMinutes / 2880;
  const pins: Pin[] = input.map((raw: unknown, k) => {
    const p = `pins.${k}`;
    const r = (typeof raw === 'object' && raw !== null ? raw : {}) as Record<string, unknown>;
    const c = typeof r.id === 'string' ? byId.get(r.id) : undefined;
    if (!c) throw new InputError(`${p}.id`, r.id, 'must be the id of a candidate');
    if (removed.has(c.id)) throw new InputError(`${p}.id`, r.id, 'is also in "remove"');
    if (repeats.has(c))
      throw new InputError(`${p}.id`, r.id, `cannot be pinned: its target ${repeats.get(c)}`);
    const t = parseEpoch(r.start, `${p}.start`);
    let s = -1;
    for (let i = 0; i < jd.length; i++)
      if (Math.abs(jd[i]! - t) <= half + 1e-9)
        s = s < 0 || Math.abs(jd[i]! - t) < Math.abs(jd[s]! - t) ? i : s;
    if (s < 0)
      throw new InputError(
        `${p}.start`,
        r.start,
        `is not inside darkness at ${grid.site.name} on the night of ${grid.date}: a block may only start in the dark`,
      );
    if (s + c.slots >= jd.length || !fitsAt(c, s)) {
      const bad = firstBroken(c, s);
      const why =
        bad === null
          ? 'runs past the end of darkness'
          : `is closed by ${nightReasonWords(edgeReason(bad, grid, c.grid), grid.limits, 'block')}`;
      const airmass =
        c.highestAirmass !== null && bad === null
          ? ` or above its airmass limit ${c.highestAirmass}`
          : '';
      throw new InputError(
        `${p}.start`,
        r.start,
        `would put the ${c.targetName} ${c.kind} block where ${c.targetName} ${why}${airmass}`,
      );
    }
    const over = clash(c, s);
    if (over)
      throw new InputError(
        `${p}.start`,
        r.start,
        `would put the ${c.targetName} ${c.kind} block over ${over.label} (or inside the ` +
          `changeover gap around it), which stays on the night`,
      );
    return { candidate: c, start: s };
  });
  pins.sort((a, b) => a.start - b.start);
  for (let k = 1; k < pins.length; k++) {
    const a = pins[k - 1]!,
      b = pins[k]!;
    if (a.candidate === b.candidate)
      throw new InputError('pins', b.candidate.id, 'pins the same block twice');
    if (a.start + a.candidate.slots > b.start)
      throw new InputError('pins', b.candidate.id, `overlaps the pinned block ${a.candidate.id}`);
  }
  return pins;
}

function firstBroken(c: Candidate, s: number): (typeof REASON_CODES)[number] | null {
  for (let j = s; j <= s + c.slots && j < c.grid.ok.length; j++)
    if (!c.grid.ok[j]) return REASON_CODES[c.grid.reason[j]! - 1]!;
  return null;
}

function whyLeftOut(
  c: Candidate,
  grid: NightGrid,
  removed: Set<string>,
  everFits: boolean,
  pins: Pin[],
  placed: { c: Candidate; start: number; pinned: boolean }[],
  anyKept: boolean,
): string {
  if (removed.has(c.id)) return 'removed by the user';
  if (grid.edgeJd.length === 0)
    return `no darkness (${grid.limits.darknessLabel}) at ${grid.site.name} on this night`;
  if (!everFits) {
    const r = closingLimit(grid, c.grid, c.slots, c.durationMinutes);
    if (r !== null) return `${c.targetName} on this night: ${nightReasonWords(r, grid.limits)}`;
    if (Number.isFinite(c.earliestJd) || Number.isFinite(c.latestJd))
      return (
        `its timing window (${Number.isFinite(c.earliestJd) ? jdToIso(c.earliestJd) : 'dusk'}` +
        ` to ${Number.isFinite(c.latestJd) ? jdToIso(c.latestJd) : 'dawn'}) holds no ` +
        `${c.durationMinutes}-min window`
      );
    return (
      `${c.targetName} never stays below the block's own airmass limit ${c.highestAirmass} ` +
      `for ${c.durationMinutes} min`
    );
  }
  const jd = grid.edgeJd;
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i + c.slots < jd.length; i++) {
    if (fitsAt(c, i)) {
      lo = Math.min(lo, i);
      hi = Math.max(hi, i + c.slots);
    }
  }
  const rivals = placed.filter((p) => p.start <= hi && p.start + p.c.slots >= lo);
  const pinnedRivals = rivals.filter((p) => p.pinned).map((p) => p.c.id);
  if (rivals.length > 0 && pinnedRivals.length === rivals.length)
    return `its windows are taken by pinned blocks: ${pinnedRivals.join(', ')}`;
  void pins;
  if (rivals.length === 0 && anyKept)
    return 'its windows are taken by blocks already stored on the night, which stay';
  return `its windows are taken by blocks worth more in total: ${rivals.map((p) => p.c.id).join(', ')}`;
}
