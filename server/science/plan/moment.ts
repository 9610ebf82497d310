/**
 * One moment of one site-night for one target: open or not under the limits, its airmass when
 * open, and the limit that closes it when not — on the same grid the planners place blocks on, so a
 * stored block, a flag and a forecast read a moment exactly as the planner would have.
 */
import type { Limits } from '../sky/limits.ts';
import { nightOf } from '../sky/night.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { nightGrid, REASON_CODES, targetGrid, type TargetGrid } from './grid.ts';
import { edgeReason, nightReasonWords, type NightReasonDetail } from './night-reasons.ts';

const SLOT_MINUTES = 10;

export interface MomentSky {
  /** The night the moment falls in (local evening date). */
  date: string;
  open: boolean;
  /** Airmass at the nearest slot edge when open, else null. */
  airmass: number | null;
  /** What closes the moment (darkness when it lies outside the night's dark time), else null. */
  reason: NightReasonDetail | null;
  words: string | null;
}

/**
 * A reader of moments of one site-night (local evening date): the night's 10-minute grid is built
 * once, each target's once; a moment is read at the nearest grid edge.
 */
export function nightMoments(
  site: Site,
  limits: Limits,
  date: string,
): (target: Target, jd: number) => MomentSky {
  const g = nightGrid(site, limits, date, SLOT_MINUTES);
  const grids = new Map<Target, TargetGrid>();
  const closed = (reason: NightReasonDetail): MomentSky => ({
    date,
    open: false,
    airmass: null,
    reason,
    words: nightReasonWords(reason, limits),
  });
  return (target, jd) => {
    let best = -1;
    for (let i = 0; i < g.edgeJd.length; i++)
      if (best < 0 || Math.abs(g.edgeJd[i]! - jd) < Math.abs(g.edgeJd[best]! - jd)) best = i;
    // Farther than a slot from every dark edge: the moment is outside darkness.
    if (best < 0 || Math.abs(g.edgeJd[best]! - jd) > SLOT_MINUTES / 1440)
      return closed({ reason: 'no-darkness' });
    const tg = grids.get(target) ?? targetGrid(g, target);
    grids.set(target, tg);
    if (tg.ok[best])
      return { date, open: true, airmass: tg.airmass[best]!, reason: null, words: null };
    return closed(edgeReason(REASON_CODES[tg.reason[best]! - 1]!, g, tg));
  };
}

/** The target at `jd` (UTC JD) at the site, on the grid of the night the moment falls in. */
export function skyAtMoment(site: Site, limits: Limits, target: Target, jd: number): MomentSky {
  return nightMoments(site, limits, nightOf(jd, site.timeZone))(target, jd);
}
