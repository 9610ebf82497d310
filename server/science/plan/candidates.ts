/**
 * Candidate blocks for one night: what a user asks the night scheduler to choose from, checked
 * field by field, and turned into placements on the night's grid.
 */
import { InputError, requireFinite } from '../errors.ts';
import { parseEpoch } from '../time/index.ts';
import type { Target } from '../sky/target.ts';
import { blockQuality, type NightGrid, type TargetGrid } from './grid.ts';

import { BLOCK_KINDS, type BlockKind } from '../../../descriptors/measurement-kinds.ts';

export { BLOCK_KINDS, type BlockKind };

export interface CandidateInput {
  /** The caller's name for the block, unique in the request. */
  id: string;
  /** Name of one of the request's targets. */
  target: string;
  kind: BlockKind;
  /** Time on target, minutes, (0, 720]. Rounded up to whole slots. */
  durationMinutes: number;
  /** Weight of the block in the night's value, (0, 1000]. */
  priority: number;
  /** A stricter airmass limit for this block only, (1, 40]. */
  highestAirmass?: number;
  /** The block uses a laser guide star (it then carries the laser caution). */
  laserGuideStar?: boolean;
  /** Timing window: the block starts no earlier and ends no later than these, ISO 8601 UTC. */
  earliestStart?: string;
  latestEnd?: string;
}

/** A candidate checked and tied to its target's grid. */
export interface Candidate {
  index: number;
  id: string;
  targetIndex: number;
  targetName: string;
  kind: BlockKind;
  durationMinutes: number;
  priority: number;
  highestAirmass: number | null;
  laserGuideStar: boolean;
  /** Timing window, UTC JD (−∞, +∞ when open). */
  earliestJd: number;
  latestJd: number;
  /** Slots the block spans (its last edge is start + slots). */
  slots: number;
  grid: TargetGrid;
  /** First start edge and last end edge the timing window allows. */
  firstEdge: number;
  lastEdge: number;
}

const ID_RE = /^[\w.:@ -]{1,80}$/;

export function checkCandidates(
  input: unknown,
  targets: readonly Target[],
  field = 'candidates',
): Omit<Candidate, 'slots' | 'grid' | 'firstEdge' | 'lastEdge'>[] {
  if (!Array.isArray(input))
    throw new InputError(field, input, 'must be an array of candidate blocks');
  if (input.length > 2000)
    throw new InputError(field, input.length, 'must hold at most 2000 candidate blocks');
  const ids = new Set<string>();
  const byName = new Map(targets.map((t, i) => [t.name, i]));
  return input.map((raw: unknown, k) => {
    const p = `${field}.${k}`;
    if (typeof raw !== 'object' || raw === null)
      throw new InputError(
        p,
        raw,
        'must be an object { id, target, kind, durationMinutes, priority }',
      );
    const c = raw as Record<string, unknown>;
    if (typeof c.id !== 'string' || !ID_RE.test(c.id))
      throw new InputError(`${p}.id`, c.id, 'must be 1–80 letters, digits, spaces or . : @ _ -');
    if (ids.has(c.id)) throw new InputError(`${p}.id`, c.id, 'is used by an earlier candidate');
    ids.add(c.id);
    const targetIndex = typeof c.target === 'string' ? byName.get(c.target.trim()) : undefined;
    if (targetIndex === undefined)
      throw new InputError(
        `${p}.target`,
        c.target,
        `must name one of the targets (${[...byName.keys()].slice(0, 5).join(', ')}${byName.size > 5 ? ', …' : ''})`,
      );
    if (!(BLOCK_KINDS as readonly unknown[]).includes(c.kind))
      throw new InputError(`${p}.kind`, c.kind, 'must be "astrometry" or "spectroscopy"');
    const durationMinutes = requireFinite(`${p}.durationMinutes`, c.durationMinutes);
    if (!(durationMinutes > 0 && durationMinutes <= 720))
      throw new InputError(`${p}.durationMinutes`, durationMinutes, 'must lie in (0, 720] minutes');
    const priority = requireFinite(`${p}.priority`, c.priority);
    if (!(priority > 0 && priority <= 1000))
      throw new InputError(`${p}.priority`, priority, 'must lie in (0, 1000]');
    let highestAirmass: number | null = null;
    if (c.highestAirmass !== undefined && c.highestAirmass !== null) {
      highestAirmass = requireFinite(`${p}.highestAirmass`, c.highestAirmass);
      if (!(highestAirmass > 1 && highestAirmass <= 40))
        throw new InputError(`${p}.highestAirmass`, highestAirmass, 'must lie in (1, 40]');
    }
    if (c.laserGuideStar !== undefined && typeof c.laserGuideStar !== 'boolean')
      throw new InputError(`${p}.laserGuideStar`, c.laserGuideStar, 'must be true or false');
    const earliestJd =
      c.earliestStart === undefined ? -Infinity : parseEpoch(c.earliestStart, `${p}.earliestStart`);
    const latestJd =
      c.latestEnd === undefined ? Infinity : parseEpoch(c.latestEnd, `${p}.latestEnd`);
    if (!(latestJd > earliestJd))
      throw new InputError(
        `${p}.latestEnd`,
        c.latestEnd,
        `must be after earliestStart ${String(c.earliestStart)}`,
      );
    return {
      index: k,
      id: c.id,
      targetIndex,
      targetName: targets[targetIndex]!.name,
      kind: c.kind as BlockKind,
      durationMinutes,
      priority,
      highestAirmass,
      laserGuideStar: c.laserGuideStar === true,
      earliestJd,
      latestJd,
    };
  });
}

/** Whether the block may start at edge i: every edge it covers is observable (and under its own airmass limit). */
export function fitsAt(c: Candidate, i: number): boolean {
  if (i < c.firstEdge || i + c.slots > c.lastEdge) return false;
  if (c.grid.okRun[i]! < c.slots + 1) return false;
  if (c.highestAirmass !== null) {
    for (let j = i; j <= i + c.slots; j++) if (c.grid.airmass[j]! > c.highestAirmass) return false;
  }
  return true;
}

/** The block's value at edge i: priority × mean 1/airmass over the block (1 at the zenith). */
export function valueAt(c: Candidate, i: number): number {
  return c.priority * blockQuality(c.grid, i, c.slots);
}

/** The edge range [first start, last end] a timing window allows on the grid. */
export function timingEdges(
  grid: NightGrid,
  earliestJd: number,
  latestJd: number,
): [number, number] {
  const jd = grid.edgeJd;
  let lo = 0,
    hi = jd.length - 1;
  while (lo < jd.length && jd[lo]! < earliestJd - 1e-9) lo++;
  while (hi >= 0 && jd[hi]! > latestJd + 1e-9) hi--;
  return [lo, hi];
}

/** Slots covered by a duration. */
export function slotsFor(durationMinutes: number, grid: NightGrid): number {
  return Math.max(1, Math.ceil(durationMinutes / grid.slotMinutes - 1e-9));
}
