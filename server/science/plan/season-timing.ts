/**
 * Timing the season plan's site-nights: each night's chosen epochs go to the night scheduler (the
 * same one a user runs on a single night), around the blocks that stay, with a timing window for
 * each of a target's repeated epochs so they spread through the night. The information of the
 * timed epochs, at the precision of their real airmass, is what the report's "after" σ reads.
 */
import { jdToIso, parseEpoch } from '../time/index.ts';
import { jacobians } from './information.ts';
import type { CandidateInput } from './candidates.ts';
import type { NightGrid } from './grid.ts';
import { scheduleOnGrid, type ScheduledBlock } from './night-schedule.ts';
import { precisionAt } from './precision.ts';
import type { Choice, Planner } from './season-plan.ts';
import { addEpoch, type TargetState } from './season-state.ts';
import type { PlannedEpoch, UnmetGoal } from './season-types.ts';

export interface TimedPlan {
  epochs: PlannedEpoch[];
  /** Per target, a state holding the information of kept and timed epochs only. */
  final: TargetState[];
  /** Epochs chosen that the night scheduler could not time. */
  leftOut: UnmetGoal[];
}

export function timeNights(p: Planner): TimedPlan {
  const { nD, dates } = p.nights;
  const final = p.states.map((ts) => ({
    ...ts,
    planned: ts.keptInfo ? Float64Array.from(ts.keptInfo) : null,
  }));
  const byNight = new Map<number, Choice[]>();
  for (const c of p.chosen) {
    const key = c.o.s * nD + c.o.d;
    byNight.set(key, [...(byNight.get(key) ?? []), c]);
  }
  const skyTargets = p.states.map((ts) => ts.t.input.target);
  const epochs: PlannedEpoch[] = [];
  const leftOut: UnmetGoal[] = [];
  for (const [key, list] of [...byNight.entries()].sort((a, b) => a[0] - b[0])) {
    const s = Math.floor(key / nD),
      d = key % nD;
    const site = p.sites[s]!;
    const grid = p.nights.grids[key]!;
    const schedule = scheduleOnGrid(
      grid,
      skyTargets,
      {
        candidates: list.map((c, k) => nightCandidate(p, site, grid, c, k)),
        slewMinutes: p.slewMinutes,
        sameTargetMinutes: p.sameTargetMinutes,
        kept: p.nights.kept[key]!,
      },
      new Map(),
    );
    for (const b of schedule.blocks) {
      const c = list[Number(b.id)]!;
      const ts = p.states[c.ti]!;
      const prec = precisionAt(p.precision[s]!, b.airmassMiddle, site.limits.zenithSeeingArcsec);
      epochs.push(plannedEpoch(ts.t.name, site.site.name, dates[d]!, b, c, prec));
      const f = final[c.ti]!;
      if (f.model) {
        const jd = (parseEpoch(b.start.utc) + parseEpoch(b.end.utc)) / 2;
        addEpoch(f, jacobians(f.model, Float64Array.of(jd))[0]!, c.o.kind, prec);
      }
    }
    for (const l of schedule.leftOut) {
      const c = list[Number(l.id)]!;
      p.cadenceMet[c.ti] = false;
      leftOut.push({
        target: l.target,
        kind: l.kind,
        start: dates[d]!,
        end: dates[d]!,
        reason: `chosen for ${site.site.name} but did not fit in the night's schedule: ${l.reason}`,
        nights: [],
      });
    }
  }
  epochs.sort(
    (a, b) =>
      a.block.start.utc.localeCompare(b.block.start.utc) || a.target.localeCompare(b.target),
  );
  return { epochs, final, leftOut };
}

/** A chosen option as a candidate of its night's schedule (timed options keep their edges). */
function nightCandidate(
  p: Planner,
  site: Planner['sites'][number],
  grid: NightGrid,
  c: Choice,
  k: number,
): CandidateInput {
  const t = p.states[c.ti]!.t;
  return {
    id: `${k}`,
    target: t.name,
    kind: c.o.kind,
    durationMinutes: t.blockMinutes[c.o.kind],
    // A periapsis-window epoch's priority doubles, as in the night's own candidates (night-candidates.ts).
    priority: Math.min(1000, t.priority * (c.why === 'periapsis' ? 2 : 1) * (1 + c.rank)),
    laserGuideStar: site.laserGuideStar === true && t.laserGuideStar[c.o.kind],
    ...(c.o.timed
      ? {
          earliestStart: jdToIso(grid.edgeJd[c.o.first]!),
          latestEnd: jdToIso(grid.edgeJd[c.o.last]!),
        }
      : {}),
  };
}

/** A scheduled block as an epoch of the plan, with its precision at the block's middle. */
function plannedEpoch(
  target: string,
  site: string,
  date: string,
  b: ScheduledBlock,
  c: Choice,
  prec: ReturnType<typeof precisionAt>,
): PlannedEpoch {
  const astro = c.o.kind === 'astrometry';
  return {
    target,
    kind: c.o.kind,
    site,
    date,
    block: {
      ...b,
      id: `${target}/${c.o.kind}/${date}/${site}/${b.start.utc.slice(11, 16)}`,
    },
    precision: {
      sigma: astro ? prec.astrometryMas : prec.spectroscopyKmS,
      unit: astro ? 'mas' : 'km/s',
      airmass: b.airmassMiddle,
      seeingArcsec: prec.seeingArcsec,
    },
    gain: c.gain,
    why: c.why,
    reason: c.reason,
  };
}
