/**
 * The season planner's working state: each target's information model, its passages, the
 * information its chosen epochs add, and each site-night's accepted blocks (checked by
 * earliest-latest-start packing, so nothing is accepted that cannot be timed). The score of an
 * option is the fractional variance it removes from the dates of the target's passages in range
 * and from its mass (and, with the relativity goal, from its relativity factors), times the
 * site-night's weight; `gainOf` says the first two in named units.
 */
import type { BlockKind } from './candidates.ts';
import type { ForecastEpoch } from './forecast.ts';
import { rounded } from './words.ts';
import {
  addInformation,
  informationModel,
  jacobians,
  posteriorCovariance,
  varianceReduction,
  type InformationModel,
} from './information.ts';
import type { KeptBlock } from './night-schedule.ts';
import { passagesIn, quadratic, type Passage } from './passage.ts';
import type { Option, SeasonNights } from './season-nights.ts';
import { relativityReduction, type RelativityState } from './season-relativity.ts';
import type { EpochGain, ResolvedTarget } from './season-types.ts';

export interface Accepted {
  first: number;
  last: number;
  slots: number;
  ti: number;
  label: string;
}

export interface TargetState {
  t: ResolvedTarget;
  model: InformationModel | null;
  /** Passages whose window meets the range; `passage` is the first of them (the coming one). */
  passages: Passage[];
  /** Every periapsis near the range (for densified cadence), JD. */
  periapsesJd: number[];
  /** Information added by kept and chosen epochs, n×n. */
  planned: Float64Array | null;
  /** The information of kept blocks alone, and their middles (JD). */
  keptInfo: Float64Array | null;
  keptJd: number[];
  /** The kept blocks as forecast epochs (middle, kind, σ at their airmass), for the report's relativity forecast. */
  keptEpochs: ForecastEpoch[];
  options: Option[];
  /** The relativity goal's information (season-relativity.ts), when asked for and the orbit has the terms. */
  rel: RelativityState | null;
}

export function targetState(
  t: ResolvedTarget,
  startJd: number,
  endJd: number,
  windowSigma: number,
): TargetState {
  const orbit = t.input.target.orbit;
  const model = orbit ? informationModel(orbit) : null;
  const all = model
    ? passagesIn(model, posteriorCovariance(model, null), startJd - 400, endJd + 400, windowSigma)
    : [];
  return {
    t,
    model,
    passages: all.filter((p) => p.windowEndJd >= startJd && p.windowStartJd <= endJd),
    periapsesJd: all.map((p) => p.jd),
    planned: model ? new Float64Array(model.parameters.length ** 2) : null,
    keptInfo: null,
    keptJd: [],
    keptEpochs: [],
    options: [],
    rel: null,
  };
}

/** Add one epoch's information (at its own precision) to the target's planned information. */
export function addEpoch(
  ts: TargetState,
  jac: Float64Array,
  kind: BlockKind,
  precision: Option['precision'],
): void {
  if (ts.model && ts.planned)
    addInformation(ts.planned, jac, ts.model.parameters.length, kind, precision);
}

/** Add kept blocks of the target (those that count) to its planned information. */
export function addKept(
  ts: TargetState,
  kept: readonly { k: KeptBlock; precision: Option['precision'] }[],
): void {
  ts.keptJd = kept.map(({ k }) => (k.startJd + k.endJd) / 2);
  ts.keptEpochs = kept.map(({ k, precision }, j) => ({
    jd: ts.keptJd[j]!,
    kind: k.kind,
    sigma: k.kind === 'astrometry' ? precision.astrometryMas : precision.spectroscopyKmS,
  }));
  if (ts.model && kept.length === 0) ts.keptInfo = Float64Array.from(ts.planned!);
  if (!ts.model || kept.length === 0) return;
  const jac = jacobians(
    ts.model,
    Float64Array.from(kept, ({ k }) => (k.startJd + k.endJd) / 2),
  );
  kept.forEach(({ k, precision }, j) => {
    addEpoch(ts, jac[j]!, k.kind, precision);
  });
  ts.keptInfo = Float64Array.from(ts.planned!);
}

export function covarianceOf(ts: TargetState): Float64Array | null {
  return ts.model ? posteriorCovariance(ts.model, ts.planned) : null;
}

/** Variance removed from each objective (passage dates, then ln M) by one option, with the variance before. */
function reductions(
  ts: TargetState,
  cov: Float64Array,
  o: Option,
): { removed: number; base: number }[] {
  const m = ts.model!;
  const n = m.parameters.length;
  const gs = [
    ...ts.passages.map((p) => p.gradient),
    ...(m.lnMassGradient ? [m.lnMassGradient] : []),
  ];
  return gs.map((g) => ({
    base: quadratic(cov, n, g),
    removed: o.jac ? varianceReduction(cov, n, o.jac, o.kind, o.precision, g) : 0,
  }));
}

/** The option's score: Σ fractional variance removed, times the night's weight. */
export function score(
  ts: TargetState,
  cov: Float64Array | null,
  o: Option,
  nights: SeasonNights,
): number {
  if (!ts.model || !cov) return 0;
  const s = reductions(ts, cov, o).reduce((a, r) => a + (r.base > 0 ? r.removed / r.base : 0), 0);
  const rel = ts.rel ? relativityReduction(ts.rel, o) : 0;
  return (s + rel) * nights.weight[o.s * nights.nD + o.d]!;
}

/** What the option buys in named units: hours of σ off the coming passage's date, % of the mass variance. */
export function gainOf(ts: TargetState, cov: Float64Array | null, o: Option): EpochGain {
  if (!ts.model || !cov) return gainWords(null, null, null);
  const r = reductions(ts, cov, o);
  const p = ts.passages[0];
  const hours =
    p && r[0]
      ? (Math.sqrt(r[0].base) - Math.sqrt(Math.max(0, r[0].base - r[0].removed))) * 24
      : null;
  const m = ts.model.lnMassGradient ? r[r.length - 1]! : null;
  const pct = m && m.base > 0 ? (100 * m.removed) / m.base : null;
  return gainWords(hours, pct, p ? p.date.slice(0, 10) : null);
}

/** The one wording of a gain. */
export function gainWords(
  hours: number | null,
  pct: number | null,
  passage: string | null,
): EpochGain {
  const parts: string[] = [];
  if (hours !== null && passage)
    parts.push(`${fmtHours(hours)} of σ off the ${passage} periapsis date`);
  if (pct !== null)
    parts.push(`${pct < 0.1 && pct > 0 ? rounded(pct, 2) : pct.toFixed(1)} % of the mass variance`);
  return {
    periapsisSigmaHoursRemoved: hours,
    massVariancePercentRemoved: pct,
    text: parts.length ? `removes ${parts.join(' and ')}` : 'no orbit to tighten (no solution)',
  };
}

function fmtHours(h: number): string {
  return h >= 10
    ? `${h.toFixed(0)} h`
    : h >= 0.1
      ? `${h.toFixed(1)} h`
      : h * 60 >= 1
        ? `${(h * 60).toFixed(1)} min`
        : `${rounded(h * 3600, 2)} s`;
}

/** Whether one more block fits on its site-night beside those accepted (room, then packing by latest start). */
export function fitsNight(
  nights: SeasonNights,
  accepted: Map<number, Accepted[]>,
  o: Option,
  ti: number,
  costMinutes: number,
  gapSlots: (a: number, b: number) => number,
): boolean {
  const key = o.s * nights.nD + o.d;
  if (nights.room[key]! < costMinutes) return false;
  const list = [
    ...(accepted.get(key) ?? []),
    { first: o.first, last: o.last, slots: o.slots, ti, label: '' },
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
}
