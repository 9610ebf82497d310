/**
 * Backups for the epochs a season cannot do without. Two kinds of epoch are critical:
 *
 * - a periapsis-window epoch (the passage cannot be repeated for a period);
 * - an epoch the relativity forecast rests on: one that carries at least RELATIVITY_CRITICAL_SHARE
 *   of a relativity factor's information after the plan (forecast.ts, the target's measurements and
 *   the plan's epochs at their own σ), so that losing it raises that factor's σ by ≥ 5 %.
 *
 * A critical epoch whose site-night is likely lost (its `nightWeights` entry, the chance the night
 * is clear, at most 1 − `backupLossAbove`) gets one more epoch of the same target and kind that
 * would stand in for it: on another site-night (the other site, or the next nights) within reach —
 * `coverageWithinDays` + 1 day for a periapsis epoch, so the stand-in still covers the passage;
 * RELATIVITY_BACKUP_DAYS for a relativity epoch — the one most likely clear (ties: the nearer in
 * time, then the lower airmass), in time the plan leaves free, and only on a night more likely
 * clear than not (the two nights are drawn independently, so both are lost with the product of their
 * chances). A weather-blind plan (every weight 1) needs none.
 */
import { jdToIso } from '../time/index.ts';
import { forecastDetection } from './forecast.ts';
import { fits, take, type Choice, type Planner } from './season-plan.ts';

/** A critical epoch on a night lost with at least this chance gets a backup; default 0.2. */
export const DEFAULT_BACKUP_LOSS_ABOVE = 0.2;
/** Share of a relativity factor's information after the plan that makes an epoch critical (σ +5 % without it). */
export const RELATIVITY_CRITICAL_SHARE = 0.1;
/**
 * How far a relativity epoch's stand-in may lie, days: the terms change over the passage's time
 * scale P(1 − e)^{3/2}/2π, weeks for the stars followed here, so a few days samples nearly the same phase.
 */
export const RELATIVITY_BACKUP_DAYS = 3;
/** A backup night must be clear with at least this chance. */
const BACKUP_LEAST_CLEAR = 0.5;

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
const FACTOR_WORDS = { redshiftFactor: 'redshift', precessionFactor: 'precession' } as const;

interface Critical {
  c: Choice;
  /** Why the epoch is critical, in words. */
  why: string[];
  reachDays: number;
}

/** Whether a chosen epoch's night is lost with at least the given chance. */
const likelyLost = (p: Planner, c: Choice, lossAbove: number) =>
  1 - p.nights.weight[c.o.s * p.nights.nD + c.o.d]! >= lossAbove - 1e-12;

/** The chosen epochs that carry ≥ RELATIVITY_CRITICAL_SHARE of a relativity factor's information, with words. */
function relativityCritical(p: Planner, ti: number): Map<Choice, string> {
  const out = new Map<Choice, string>();
  const ts = p.states[ti]!;
  const orbit = ts.t.input.target.orbit;
  if (!orbit || orbit.distancePc === null) return out;
  if (!orbit.relativity.gravitationalRedshift && !orbit.relativity.precession) return out;
  const mine = p.chosen.filter((c) => c.ti === ti);
  const byKey = new Map(mine.map((c) => [`${jdToIso(c.o.jd)}/${c.o.kind}`, c]));
  const f = forecastDetection({
    orbit,
    measurements: ts.t.input.measurements ?? [],
    plan: mine.map((c) => ({
      jd: c.o.jd,
      kind: c.o.kind,
      sigma:
        c.o.kind === 'astrometry' ? c.o.precision.astrometryMas : c.o.precision.spectroscopyKmS,
    })),
    precision: mine[0]!.o.precision,
  });
  for (const factor of f.factors) {
    if (factor.sigmaAfter === null) continue;
    for (const e of factor.topEpochs) {
      if (e.share < RELATIVITY_CRITICAL_SHARE) continue;
      const c = byKey.get(`${e.epoch}/${e.kind}`);
      if (!c) continue;
      const without = factor.sigmaAfter / Math.sqrt(Math.max(1e-12, 1 - e.share));
      const words = `the ${FACTOR_WORDS[factor.name]} factor's forecast rests on it (${pct(e.share)} of its information; lost, its σ rises from ${factor.sigmaAfter.toFixed(3)} to ${without.toFixed(3)})`;
      out.set(c, out.has(c) ? `${out.get(c)}; ${words}` : words);
    }
  }
  return out;
}

/** The critical epochs on likely-lost nights, periapsis epochs first, in the order they were chosen. */
function criticalEpochs(p: Planner, lossAbove: number): Critical[] {
  const out: Critical[] = [];
  const { dates } = p.nights;
  const list = new Map<Choice, Critical>();
  for (const c of p.chosen) {
    if (c.why !== 'periapsis' || !likelyLost(p, c, lossAbove)) continue;
    const site = p.sites[c.o.s]!.site.name;
    const entry = {
      c,
      why: [`the periapsis epoch at ${site} ${dates[c.o.d]}`],
      reachDays: p.coverageWithinDays + 1,
    };
    list.set(c, entry);
    out.push(entry);
  }
  const targets = new Set(p.chosen.filter((c) => likelyLost(p, c, lossAbove)).map((c) => c.ti));
  for (const ti of targets)
    for (const [c, words] of relativityCritical(p, ti)) {
      if (!likelyLost(p, c, lossAbove)) continue;
      const known = list.get(c);
      if (known) {
        known.why.push(words);
        continue;
      }
      const site = p.sites[c.o.s]!.site.name;
      const entry = {
        c,
        why: [`the ${c.o.kind} epoch at ${site} ${dates[c.o.d]}: ${words}`],
        reachDays: RELATIVITY_BACKUP_DAYS,
      };
      list.set(c, entry);
      out.push(entry);
    }
  return out;
}

export function backupPass(p: Planner, lossAbove: number): void {
  const { nD, weight, dates } = p.nights;
  for (const { c, why, reachDays } of criticalEpochs(p, lossAbove)) {
    const loss = 1 - weight[c.o.s * nD + c.o.d]!;
    let best = null as (typeof p.states)[number]['options'][number] | null;
    let bestKey: [number, number, number] = [-1, 0, 0];
    for (const o of p.states[c.ti]!.options) {
      if (o.kind !== c.o.kind || (o.s === c.o.s && o.d === c.o.d)) continue;
      const dt = Math.abs(o.jd - c.o.jd);
      if (dt > reachDays || !fits(p, c.ti, o)) continue;
      const w = weight[o.s * nD + o.d]!;
      if (w < BACKUP_LEAST_CLEAR - 1e-12) continue;
      const key: [number, number, number] = [w, -dt, -o.airmass];
      if (
        key[0] > bestKey[0] + 1e-12 ||
        (Math.abs(key[0] - bestKey[0]) <= 1e-12 &&
          (key[1] > bestKey[1] + 1e-9 || (key[1] === bestKey[1] && key[2] > bestKey[2])))
      ) {
        best = o;
        bestKey = key;
      }
    }
    if (!best) continue;
    const other = p.sites[best.s]!.site.name;
    const b = best;
    const both = loss * (1 - weight[b.s * nD + b.d]!);
    take(
      p,
      c.ti,
      b,
      'backup',
      (g) =>
        `backup for ${why.join('; ')} (lost with chance ${pct(loss)}): ${other} ${dates[b.d]} is clear with chance ${pct(weight[b.s * nD + b.d]!)}, so both are lost with chance ${pct(both)}; ${g.text}`,
    );
  }
}
