/**
 * Why a target gets no epoch on a site-night: one string union and ONE table of wording, read by
 * the season plan, the flags and the night scheduler, so the CLI, the JSON and the client say the
 * same words. The limit named is the one that actually closed that night (`closingLimit`), not a
 * majority over a window.
 */
import type { Limits } from '../sky/limits.ts';
import { altitudeForAirmass } from '../sky/airmass.ts';
import type { NightGrid, ReasonCode, TargetGrid } from './grid.ts';

export const NIGHT_REASONS = [
  'not-allocated',
  'no-darkness',
  'altitude',
  'airmass',
  'horizon-mask',
  'moon',
  'sun-distance',
  'too-short',
  'kept-epoch',
  'kept-full',
  'taken',
  'no-room',
] as const;
export type NightReason = (typeof NIGHT_REASONS)[number];

/** A reason with the numbers its words need. */
export interface NightReasonDetail {
  reason: NightReason;
  /** Closest Moon distance while the Moon is up in darkness, degrees ('moon'). */
  moonDistanceDeg?: number;
  /** Distance from the Sun at the night's middle, degrees ('sun-distance'). */
  sunDistanceDeg?: number;
  /** Longest observable run of the night, hours, and the block it must hold, minutes ('too-short'). */
  longestHours?: number;
  blockMinutes?: number;
  /** The limit that cut the longest run short ('too-short'), when one other than altitude did. */
  cutBy?: 'horizon-mask' | 'moon' | 'sun-distance';
  /** The epochs that hold the night's time ('taken', 'kept-full'), e.g. "Ilex astrometry (priority 3)". */
  takenBy?: string[];
  /** Minutes of the plan's share of the night still free, and what the block needs ('no-room'). */
  roomMinutes?: number;
}

const f1 = (x: number | undefined) => (x === undefined ? '?' : x.toFixed(1));
const f0 = (x: number | undefined) => (x === undefined ? '?' : x.toFixed(0));

/** Whether the words speak of a whole night (why it has no epoch) or of one block's span (a pin). */
export type ReasonSpan = 'night' | 'block';
const WHEN: Record<ReasonSpan, { all: string; high: string }> = {
  night: { all: 'all through darkness', high: 'whenever it is high enough' },
  block: { all: 'during the block', high: 'during the block' },
};

/** The one wording table. `c` gives the limits' values; it is null for a night with no grid. */
const WORDS: Record<
  NightReason,
  (d: NightReasonDetail, c: Limits | null, span: ReasonSpan) => string
> = {
  'not-allocated': () => 'no allocated night',
  'no-darkness': (_, c) => `no darkness (${c?.darknessLabel ?? 'Sun never below the limit'})`,
  altitude: (_, c, w) =>
    `below the altitude limit (${c ? c.altitudeLimitDeg.toFixed(1) : '?'}°) ${WHEN[w].all}`,
  airmass: (_, c, w) => `above the airmass limit (${c?.highestAirmass ?? '?'}) ${WHEN[w].all}`,
  'horizon-mask': (_, _c, w) => `behind the horizon mask ${WHEN[w].high}`,
  moon: (d, c, w) =>
    `the Moon (${f0(d.moonDistanceDeg)}° away, limit ${c?.leastMoonDistanceDeg ?? '?'}°) ${WHEN[w].high}`,
  'sun-distance': (d, c) =>
    `inside the Sun-avoidance angle (${f0(d.sunDistanceDeg)}° from the Sun, limit ${c?.leastSunDistanceDeg ?? '?'}°)`,
  'too-short': (d) =>
    `its longest window (${f1(d.longestHours)} ` +
    `h${d.cutBy ? `, cut short by ${CUT_WORDS[d.cutBy]}` : ''}) is shorter than the ` +
    `${f0(d.blockMinutes)}-min block`,
  'kept-epoch': () => 'already has its epoch there in a block that stays',
  'kept-full': (d) =>
    `its window is held by blocks that stay${d.takenBy?.length ? ` (${d.takenBy.join(', ')})` : ''}`,
  taken: (d) =>
    `taken by higher-priority epochs${d.takenBy?.length ? `: ${d.takenBy.join(', ')}` : ''}`,
  'no-room': (d) =>
    `the plan's share of the night (${f0(d.roomMinutes)} min free) is shorter than the ` +
    `${f0(d.blockMinutes)}-min block and its changeover`,
};
const CUT_WORDS = {
  'horizon-mask': 'the horizon mask',
  moon: 'the Moon',
  'sun-distance': 'the Sun',
};

/** Plain words for a reason. */
export function nightReasonWords(
  d: NightReasonDetail,
  c: Limits | null,
  span: ReasonSpan = 'night',
): string {
  return WORDS[d.reason](d, c, span);
}

/** Whether the altitude limit is set by the airmass limit rather than by a fixed altitude. */
function airmassBinds(c: Limits, grid: NightGrid): boolean {
  if (c.highestAirmass === null) return false;
  const alt = altitudeForAirmass(c.airmassFormula, c.highestAirmass, grid.frame.refraction);
  return Math.abs(alt - c.altitudeLimitDeg) < 1e-9;
}

/**
 * The limit that closed the night for a block of `slots` slots, or null when one fits. Darkness
 * first, then the Sun-avoidance angle (the Sun is the cause even though the target is also low),
 * then, among the edges where the target is high enough, the limit broken most often (that limit,
 * not the altitude, is what a user could wait out or work around); altitude or airmass only when
 * the target is never high enough; 'too-short' when some edges are open but no run holds the block.
 */
export function closingLimit(
  grid: NightGrid,
  tg: TargetGrid,
  slots: number,
  blockMinutes: number,
): NightReasonDetail | null {
  const c = grid.limits;
  if (grid.edgeJd.length === 0) return { reason: 'no-darkness' };
  let longest = 0;
  for (let i = 0; i < tg.okRun.length; i++) longest = Math.max(longest, tg.okRun[i]!);
  if (longest >= slots + 1) return null;
  if (tg.sunSeparationDeg < c.leastSunDistanceDeg)
    return { reason: 'sun-distance', sunDistanceDeg: tg.sunSeparationDeg };
  // Counts per broken limit among edges where the target is above the altitude limit (codes: grid.ts REASON_CODES).
  const counts = [0, 0, 0, 0, 0];
  for (let i = 0; i < tg.reason.length; i++) counts[tg.reason[i]!]!++;
  const up = [2, 3, 4].sort((a, b) => counts[b]! - counts[a]! || a - b)[0]!;
  const upLimit =
    counts[up]! > 0 ? (['horizon-mask', 'sun-distance', 'moon'] as const)[up - 2]! : null;
  const moon = { moonDistanceDeg: tg.moonDistanceDeg };
  if (longest > 0)
    return {
      reason: 'too-short',
      longestHours: (Math.max(0, longest - 1) * grid.slotMinutes) / 60,
      blockMinutes,
      ...(upLimit ? { cutBy: upLimit } : {}),
    };
  if (upLimit === 'moon') return { reason: 'moon', ...moon };
  if (upLimit === 'sun-distance')
    return { reason: 'sun-distance', sunDistanceDeg: tg.sunSeparationDeg };
  if (upLimit === 'horizon-mask') return { reason: 'horizon-mask' };
  return { reason: airmassBinds(c, grid) ? 'airmass' : 'altitude' };
}

/** The detail for one edge's broken limit (grid.ts REASON_CODES), for a block placed by hand there. */
export function edgeReason(limit: ReasonCode, grid: NightGrid, tg: TargetGrid): NightReasonDetail {
  switch (limit) {
    case 'altitude':
      return { reason: airmassBinds(grid.limits, grid) ? 'airmass' : 'altitude' };
    case 'horizon-mask':
      return { reason: 'horizon-mask' };
    case 'sun-distance':
      return { reason: 'sun-distance', sunDistanceDeg: tg.sunSeparationDeg };
    case 'moon':
      return { reason: 'moon', moonDistanceDeg: tg.moonDistanceDeg };
  }
}
