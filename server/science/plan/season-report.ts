/**
 * The season plan's report: per target, the coming passage with the σ of its date before and
 * after the plan, its coverage (the share of the date's distribution within a stated time of an
 * epoch) and every allocated night of its window left unused with why; σ of the mass; the next
 * best epochs; per site, the nights used and hours planned; the cautions.
 */
import { LASER_GUIDE_STAR_CAUTION, PLAN_ADVISORY } from './cautions.ts';
import { BLOCK_KINDS } from './candidates.ts';
import { forecastDetection, type DetectionForecast } from './forecast.ts';
import { uncertainties } from './information.ts';
import { DEFAULT_PRECISION } from './precision.ts';
import { coverageProbability, quadratic, type Passage } from './passage.ts';
import { inPassageWindow, nightNote, fits, type Planner } from './season-plan.ts';
import { covarianceOf, gainOf, score, type TargetState } from './season-state.ts';
import type { TimedPlan } from './season-timing.ts';
import type {
  NightNote,
  PassagePlan,
  PlannedEpoch,
  SeasonPlan,
  TargetPlan,
} from './season-types.ts';
import { jdToIso, parseEpoch } from '../time/index.ts';

export function seasonReport(
  p: Planner,
  timed: TimedPlan,
  backups: readonly TargetPlan['backups'][],
): SeasonPlan {
  const { nD, dates } = p.nights;
  const targets = p.states.map((ts, ti) => ({
    ...targetPlan(p, timed, ts, ti),
    backups: backups[ti] ?? null,
  }));
  const cautions = [PLAN_ADVISORY];
  if (timed.epochs.some((e) => e.block.laserGuideStar)) cautions.push(LASER_GUIDE_STAR_CAUTION);
  return {
    startDate: dates[0]!,
    endDate: dates[nD - 1]!,
    sites: p.sites.map((s, si) => {
      const gs = p.nights.grids.slice(si * nD, si * nD + nD);
      const mine = timed.epochs.filter((e) => e.site === s.site.name);
      return {
        name: s.site.name,
        nights: gs.filter((g) => g !== null).length,
        nightsUsed: new Set(mine.map((e) => e.date)).size,
        darkHours: gs.reduce((h, g) => h + (g?.darkHours ?? 0), 0),
        plannedHours: mine.reduce((h, e) => h + e.block.minutes / 60, 0),
      };
    }),
    epochs: timed.epochs,
    unmet: [...p.unmet, ...timed.leftOut],
    targets,
    cautions,
  };
}

function targetPlan(
  p: Planner,
  timed: TimedPlan,
  ts: TargetState,
  ti: number,
): Omit<TargetPlan, 'backups'> {
  const { nD, dates } = p.nights;
  const f = timed.final[ti]!;
  const mine = timed.epochs.filter((e) => e.target === ts.t.name);
  const q = ts.passages[0] ?? null;
  let shrinkage: TargetPlan['shrinkage'] = null;
  let passage: PassagePlan | null = null;
  if (ts.model) {
    const before = uncertainties(ts.model, ts.keptInfo);
    const after = uncertainties(ts.model, f.planned);
    const n = ts.model.parameters.length;
    const sig = (cov: Float64Array | null) =>
      q && cov ? Math.sqrt(quadratic(cov, n, q.gradient)) : null;
    const sb = sig(covarianceOf({ ...ts, planned: ts.keptInfo })),
      sa = sig(covarianceOf(f));
    shrinkage = {
      periapsisDays: { before: sb, after: sa },
      passage: q?.date ?? null,
      massFraction: { before: before.massFraction, after: after.massFraction },
      nominalPrior: ts.model.nominalPrior,
    };
    if (q) passage = passagePlan(p, ti, q, sb, sa, ts.keptJd, mine);
  }
  const cov = covarianceOf(ts);
  const nextBest = ts.options
    .filter((o) => fits(p, ti, o))
    .map((o) => ({ o, g: score(ts, cov, o, p.nights) }))
    .sort((a, b) => b.g - a.g || a.o.d - b.o.d)
    .slice(0, 3)
    .map(({ o }) => ({
      date: dates[o.d]!,
      site: p.sites[o.s]!.site.name,
      kind: o.kind,
      gain: gainOf(ts, cov, o),
    }));
  return {
    target: ts.t.name,
    priority: ts.t.priority,
    cadenceDays: ts.t.input.cadenceDays,
    epochs: {
      astrometry: mine.filter((e) => e.kind === 'astrometry').length,
      spectroscopy: mine.filter((e) => e.kind === 'spectroscopy').length,
    },
    periapses: ts.periapsesJd
      .filter((j) => j >= p.nights.darkStartJd[0]! - 0.5 && j <= p.nights.darkEndJd[nD - 1]! + 0.5)
      .map(jdToIso),
    cadenceMet: p.cadenceMet[ti]!,
    shrinkage,
    passage,
    nextBest,
    relativity: relativityAfter(ts, mine),
  };
}

/** The detection forecast after the plan: measurements, then kept blocks and the plan's epochs at their σ. */
function relativityAfter(ts: TargetState, mine: readonly PlannedEpoch[]): DetectionForecast | null {
  const orbit = ts.t.input.target.orbit;
  if (!orbit || orbit.distancePc === null) return null;
  if (!orbit.relativity.gravitationalRedshift && !orbit.relativity.precession) return null;
  const plan = [
    ...ts.keptEpochs,
    ...mine.map((e) => ({
      jd: (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2,
      kind: e.kind,
      sigma: e.precision.sigma,
    })),
  ];
  // Every epoch carries its own σ: the default precision is only the fallback the request asks for.
  return forecastDetection({
    orbit,
    measurements: ts.t.input.measurements ?? [],
    plan,
    precision: DEFAULT_PRECISION,
  });
}

function passagePlan(
  p: Planner,
  ti: number,
  q: Passage,
  before: number | null,
  after: number | null,
  keptJd: number[],
  mine: readonly PlannedEpoch[],
): PassagePlan {
  const plannedJd = mine.map(
    (e) => (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2,
  );
  const ts = p.states[ti]!;
  const w = p.coverageWithinDays;
  const unused: NightNote[] = [];
  for (let s = 0; s < p.nights.nS; s++) {
    for (let d = 0; d < p.nights.nD; d++) {
      if (
        !p.nights.grids[s * p.nights.nD + d] ||
        !inPassageWindow(p.nights, s, d, q.windowStartJd, q.windowEndJd)
      )
        continue;
      for (const kind of BLOCK_KINDS) {
        if (!ts.t.input.kinds.includes(kind)) continue;
        const site = p.sites[s]!.site.name;
        const date = p.nights.dates[d];
        if (!mine.some((e) => e.site === site && e.date === date && e.kind === kind))
          unused.push(nightNote(p, ti, kind, s, d));
      }
    }
  }
  const inWin = plannedJd.filter((j) => j >= q.windowStartJd && j <= q.windowEndJd);
  return {
    date: q.date,
    sigmaDays: { before, after },
    windowSigma: p.windowSigma,
    windowStart: jdToIso(q.windowStartJd),
    windowEnd: jdToIso(q.windowEndJd),
    coverage: {
      withinDays: w,
      before: coverageProbability(q.jd, q.sigmaDays, keptJd, w),
      after: coverageProbability(q.jd, q.sigmaDays, [...keptJd, ...plannedJd], w),
    },
    epochs: inWin.length,
    unused,
  };
}
