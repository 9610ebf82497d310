/**
 * Flags: computed warnings for a campaign's targets, soonest first, each with a plain reason.
 * - periapsis ahead: date ± 1σ (linear, from the covariance), lead-time band, observable hours per
 *   night at each site over the ± window, rates of change and the sampling they call for, and the
 *   sizes of the relativistic terms; "periapsis unobservable" when no site sees it;
 * - blend risk: intervals when two stars of a system (or a star and a visible primary) are closer on
 *   the sky than the resolution limit;
 * - stale prediction: position uncertainty now beyond a limit, or no measurement for longer than the cadence.
 */
import { DateTime } from 'luxon';
import {
  eventsWithUncertainty,
  ephemeris,
  physicalQuantities,
  predictBatch,
  type Orbit,
} from '../orbit/index.ts';
import { intervalsWhere } from '../sky/darkness.ts';
import type { Limits } from '../sky/limits.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { jdToIso, jdToUnixMs } from '../time/index.ts';
import { positive } from './checks.ts';
import { nightGrid, targetGrid } from './grid.ts';
import { closingLimit, nightReasonWords, type NightReason } from './night-reasons.ts';
import type { Precision } from './information.ts';
import { InputError } from '../errors.ts';

export const FLAG_KINDS = [
  'periapsis-ahead',
  'periapsis-unobservable',
  'blend-risk',
  'stale-prediction',
] as const;
export type FlagKind = (typeof FLAG_KINDS)[number];

export interface FlagTarget {
  target: Target;
  /** Stars of one system are checked in pairs for blends. */
  system: string;
  cadenceDays?: number;
  lastMeasuredJd?: number | null;
  /** The primary itself shows in the images (a star, not a dark compact object). */
  primaryVisible?: boolean;
  /** Middles of accepted planned blocks of the target still to come, JD. */
  plannedEpochsJd?: readonly number[];
}

export interface FlagSite {
  site: Site;
  limits: Limits;
  /** The campaign's allocated nights at the site (local evening dates); absent: unknown. */
  nights?: readonly string[];
}

export interface FlagOptions {
  /** The moment flags are computed for, JD (UTC). */
  nowJd: number;
  /** Lead-time bands, days, ascending; the largest is how far ahead periapses are looked for. Default [30, 182, 365]. */
  leadDays?: number[];
  /** Resolution limit for blends, mas; no blend flags without it. */
  resolutionMas?: number;
  /** Position uncertainty beyond which a prediction is stale, mas; default 10. */
  staleSigmaMas?: number;
  precision?: Precision;
}

export interface SiteHours {
  site: string;
  /** Observable hours per night over the ± window (nights in order); a night with 0 h names the limit that closed it. */
  nights: { date: string; hours: number; reason: NightReason | null; words: string | null }[];
  minHours: number;
  maxHours: number;
  /** Why it cannot be observed on the night of periapsis, if it cannot. */
  blocked: string | null;
}

export interface Flag {
  kind: FlagKind;
  target: string;
  /** When it applies (periapsis, blend start, or now), ISO 8601 UTC. */
  date: string;
  daysAhead: number;
  reason: string;
  periapsis?: {
    sigmaDays: number | null;
    band: string;
    sites: SiteHours[];
    radialVelocityRateKmSPerDay: number | null;
    skyRateMasPerDay: number;
    /** Longest interval between epochs that still follows the change at the expected precision, days. */
    samplingDays: number | null;
    /** Which nights of the ± window hold a planned epoch or an allocated night (with hours), and whether the most likely night does. */
    coverage: {
      planned: { site: string; date: string }[];
      allocated: { site: string; date: string }[];
      mostLikelyCovered: boolean;
      text: string;
    };
    relativity: {
      gravitationalRedshiftKmS: number;
      transverseDopplerKmS: number;
      precessionArcminPerOrbit: number;
    } | null;
  };
  blend?: { other: string; start: string; end: string; closestMas: number };
  stale?: {
    sigmaMas: number | null;
    daysSinceMeasured: number | null;
    /** The next planned epoch, ISO 8601 UTC, if any. */
    nextPlanned: string | null;
  };
}

function localNight(jd: number, zone: string): string {
  return DateTime.fromMillis(jdToUnixMs(jd - 0.5), { zone }).toISODate()!;
}

function bandOf(days: number, lead: number[]): string {
  const b = lead.find((l) => days <= l);
  return b === undefined ? `more than ${lead[lead.length - 1]} days ahead` : `within ${b} days`;
}

/** Observable hours per night around a date at one site (nights spaced to at most 31). */
export function hoursAround(
  site: Site,
  c: Limits,
  target: Target,
  centreJd: number,
  halfDays: number,
): SiteHours {
  const step = Math.max(1, Math.ceil((2 * halfDays + 1) / 31));
  const nights: SiteHours['nights'] = [];
  let blocked: string | null = null;
  for (let d = -halfDays; d <= halfDays; d += step) {
    const date = localNight(centreJd + d, site.timeZone);
    const g = nightGrid(site, c, date, 10);
    const tg = targetGrid(g, target);
    const hours =
      g.edgeJd.length === 0 ? 0 : Math.max(0, tg.ok.reduce((n, v) => n + v, 0) - 1) * (10 / 60);
    // A night with no observable time names the limit that closed it (one slot: any window at all).
    const why = hours > 0 ? null : closingLimit(g, tg, 1, 10);
    const words = why ? nightReasonWords(why, c) : null;
    nights.push({ date, hours, reason: why?.reason ?? null, words });
    if (Math.abs(d) < step / 2 + 1e-9 || (d <= 0 && d + step > 0)) blocked = words;
  }
  const hs = nights.map((n) => n.hours);
  return { site: site.name, nights, minHours: Math.min(...hs), maxHours: Math.max(...hs), blocked };
}

export function computeFlags(
  targets: readonly FlagTarget[],
  sites: readonly FlagSite[],
  options: FlagOptions,
): Flag[] {
  const now = options.nowJd;
  const lead = (options.leadDays ?? [30, 182, 365]).map((d, i) =>
    positive(`leadDays.${i}`, d, 36525),
  );
  if (lead.length === 0) throw new InputError('leadDays', lead, 'must list at least one lead time');
  lead.sort((a, b) => a - b);
  const horizon = lead[lead.length - 1]!;
  const staleSigma = positive('staleSigmaMas', options.staleSigmaMas ?? 10, 1e9);
  const resolution =
    options.resolutionMas === undefined
      ? null
      : positive('resolutionMas', options.resolutionMas, 1e6);
  const precision = options.precision ?? { astrometryMas: 1, spectroscopyKmS: 5 };
  const flags: Flag[] = [];

  for (const ft of targets) {
    const orbit = ft.target.orbit;
    if (orbit) flags.push(...periapsisFlags(ft, orbit, sites, now, horizon, lead, precision));
    const stale = staleFlag(ft, sites, now, staleSigma);
    if (stale) flags.push(stale);
  }

  if (resolution !== null) {
    const bySystem = new Map<string, FlagTarget[]>();
    for (const t of targets)
      if (t.target.orbit) bySystem.set(t.system, [...(bySystem.get(t.system) ?? []), t]);
    for (const group of bySystem.values()) {
      for (let i = 0; i < group.length; i++) {
        const a = group[i]!;
        if (a.primaryVisible) flags.push(...blendFlags(a, null, now, horizon, resolution));
        for (let j = i + 1; j < group.length; j++)
          flags.push(...blendFlags(a, group[j]!, now, horizon, resolution));
      }
    }
  }
  // Stale predictions rank below every periapsis and blend flag; the rest soonest first.
  const staleLast = (f: Flag) => (f.kind === 'stale-prediction' ? 1 : 0);
  return flags.sort(
    (x, y) =>
      staleLast(x) - staleLast(y) ||
      x.date.localeCompare(y.date) ||
      FLAG_KINDS.indexOf(x.kind) - FLAG_KINDS.indexOf(y.kind) ||
      x.target.localeCompare(y.target),
  );
}

function periapsisFlags(
  ft: FlagTarget,
  orbit: Orbit,
  sites: readonly FlagSite[],
  now: number,
  horizon: number,
  lead: number[],
  precision: Precision,
): Flag[] {
  const name = ft.target.name;
  const ev = eventsWithUncertainty(orbit, now, now + horizon, { kinds: ['periapsis'] })[0];
  if (!ev) return [];
  const sigmaDays = ev.sigmaDays ?? null;
  const half = Math.max(1, Math.min(60, Math.ceil(sigmaDays ?? 1)));
  const siteHours = sites.map((s) => hoursAround(s.site, s.limits, ft.target, ev.jd, half));
  const rows = predictBatch(orbit, Float64Array.of(ev.jd - 0.5, ev.jd, ev.jd + 0.5));
  const rvRate =
    orbit.distancePc === null ? null : rows.radialVelocityKmS[2]! - rows.radialVelocityKmS[0]!;
  const skyRate = Math.hypot(rows.vRaMasYr[1]!, rows.vDecMasYr[1]!) / 365.25;
  const cands = [
    precision.astrometryMas / skyRate,
    rvRate ? precision.spectroscopyKmS / Math.abs(rvRate) : Infinity,
  ].filter((x) => Number.isFinite(x));
  const samplingDays = cands.length ? Math.min(...cands) : null;
  let relativity: NonNullable<Flag['periapsis']>['relativity'] = null;
  if (orbit.distancePc !== null) {
    const q = physicalQuantities(orbit);
    relativity = {
      gravitationalRedshiftKmS: q.gravitationalRedshiftAtPeriapsisKmS,
      transverseDopplerKmS: q.transverseDopplerAtPeriapsisKmS,
      precessionArcminPerOrbit: q.precessionArcminPerOrbit,
    };
  }
  const daysAhead = ev.jd - now;
  const band = bandOf(daysAhead, lead);
  const seen = siteHours.filter((s) => s.maxHours > 0);
  const date = ev.epoch;
  const pm =
    sigmaDays === null ? '(no covariance: uncertainty unknown)' : `± ${sigmaDays.toFixed(1)} d`;
  const rates = `radial velocity changes by ${rvRate === null ? '? (no distance)' : `${Math.abs(rvRate).toFixed(2)} km/s`} and position by ${skyRate.toFixed(3)} mas per day there${samplingDays !== null ? `, so sample at least every ${samplingDays < 1 ? `${(samplingDays * 24).toFixed(1)} h` : `${samplingDays.toFixed(1)} d`}` : ''}`;
  const rel = relativity
    ? `; gravitational redshift ${relativity.gravitationalRedshiftKmS.toFixed(3)} km/s, transverse Doppler ${relativity.transverseDopplerKmS.toFixed(3)} km/s, precession ${relativity.precessionArcminPerOrbit.toFixed(2)}′ per orbit`
    : '';
  const where = siteHours.map(siteHoursWords).join('; ');
  const coverage = passageCoverage(ft, sites, siteHours, ev.jd);
  const details = {
    coverage,
    sigmaDays,
    band,
    sites: siteHours,
    radialVelocityRateKmSPerDay: rvRate,
    skyRateMasPerDay: skyRate,
    samplingDays,
    relativity,
  };
  const out: Flag[] = [];
  if (seen.length === 0) {
    const why = siteHours.map((s) => `at ${s.site}: ${s.blocked ?? 'no window'}`).join('; ');
    out.push({
      kind: 'periapsis-unobservable',
      target: name,
      date,
      daysAhead,
      reason: `${name} passes periapsis on ${date.slice(0, 10)} ${pm}, but no campaign site can observe it in that window: ${why}.`,
      periapsis: details,
    });
  }
  out.push({
    kind: 'periapsis-ahead',
    target: name,
    date,
    daysAhead,
    reason: `${name} passes periapsis on ${date.slice(0, 10)} ${pm}, ${Math.round(daysAhead)} days ahead (${band}). Observable: ${where}. ${coverage.text ? `${coverage.text} ` : ''}Its ${rates}${rel}.`,
    periapsis: details,
  });
  return out;
}

/** "Tolvane 0.0–6.5 h per night (0 h on 08-05, 08-06: the Moon (12° away, limit 25°) …)". */
function siteHoursWords(s: SiteHours): string {
  const zero = new Map<string, string[]>();
  for (const n of s.nights)
    if (n.words) zero.set(n.words, [...(zero.get(n.words) ?? []), n.date.slice(5)]);
  const zeros = [...zero.entries()].map(([w, ds]) => `0 h on ${ds.join(', ')}: ${w}`).join('; ');
  return `${s.site} ${s.minHours.toFixed(1)}–${s.maxHours.toFixed(1)} h per night${zeros ? ` (${zeros})` : ''}`;
}

function blendFlags(
  a: FlagTarget,
  b: FlagTarget | null,
  now: number,
  horizon: number,
  resolution: number,
): Flag[] {
  const oa = a.target.orbit!,
    ob = b?.target.orbit ?? null;
  const period = Math.min(oa.periodDays, ob?.periodDays ?? Infinity);
  const step = Math.min(5, Math.max(0.25, period / 2000));
  const n = Math.ceil(horizon / step) + 1;
  const jd = Float64Array.from({ length: n }, (_, i) => now + (i * horizon) / (n - 1));
  const pa = predictBatch(oa, jd),
    pb = ob ? predictBatch(ob, jd) : null;
  const sepAt = (i: number) =>
    Math.hypot(
      pa.dRaMas[i]! - (pb ? pb.dRaMas[i]! : 0),
      pa.dDecMas[i]! - (pb ? pb.dDecMas[i]! : 0),
    );
  const sep = (t: number) => {
    const x = predictBatch(oa, Float64Array.of(t)),
      y = ob ? predictBatch(ob, Float64Array.of(t)) : null;
    return Math.hypot(
      x.dRaMas[0]! - (y ? y.dRaMas[0]! : 0),
      x.dDecMas[0]! - (y ? y.dDecMas[0]! : 0),
    );
  };
  let closest = Infinity;
  for (let i = 0; i < n; i++) closest = Math.min(closest, sepAt(i));
  if (closest > resolution * 3) return [];
  const other = b ? b.target.name : `the primary of ${a.system}`;
  return intervalsWhere((t) => sep(t) < resolution, now, now + horizon, step, 0.01).map((iv) => {
    let min = Infinity;
    for (let k = 0; k <= 50; k++)
      min = Math.min(min, sep(iv.startJd + ((iv.endJd - iv.startJd) * k) / 50));
    const start = jdToIso(iv.startJd),
      end = jdToIso(iv.endJd);
    return {
      kind: 'blend-risk' as const,
      target: a.target.name,
      date: start,
      daysAhead: iv.startJd - now,
      reason: `${a.target.name} and ${other} are closer than the ${resolution} mas resolution limit from ${start.slice(0, 10)} to ${end.slice(0, 10)} (closest ${min.toFixed(1)} mas): astrometry of either is unreliable then.`,
      blend: { other, start, end, closestMas: min },
    };
  });
}

/**
 * Stale prediction: position uncertainty now beyond the limit, or no measurement for longer than the
 * cadence. A planned epoch within the cadence answers the second; a target no site can observe in
 * the coming nights is not flagged now, and the reason says when it becomes observable instead.
 */
function staleFlag(
  ft: FlagTarget,
  sites: readonly FlagSite[],
  now: number,
  staleSigma: number,
): Flag | null {
  const orbit = ft.target.orbit;
  const sigma = orbit?.covariance
    ? (() => {
        const r = ephemeris(orbit, Float64Array.of(now))[0]!;
        return Math.hypot(r.sigma?.dRaMas ?? 0, r.sigma?.dDecMas ?? 0);
      })()
    : null;
  const since =
    ft.lastMeasuredJd === undefined || ft.lastMeasuredJd === null ? null : now - ft.lastMeasuredJd;
  const next = (ft.plannedEpochsJd ?? []).filter((j) => j >= now).sort((a, b) => a - b)[0] ?? null;
  const plannedInTime =
    next !== null && ft.cadenceDays !== undefined && next - now <= ft.cadenceDays;
  const reasons: string[] = [];
  if (sigma !== null && sigma > staleSigma)
    reasons.push(
      `its predicted position is uncertain by ${sigma.toFixed(1)} mas (1σ), beyond the ${staleSigma} mas limit`,
    );
  if (!plannedInTime && since !== null && ft.cadenceDays !== undefined && since > ft.cadenceDays)
    reasons.push(
      `it has not been measured for ${Math.floor(since)} days, longer than its ${ft.cadenceDays}-day cadence`,
    );
  if (!plannedInTime && ft.cadenceDays !== undefined && ft.lastMeasuredJd === null)
    reasons.push('it has never been measured');
  if (reasons.length === 0) return null;
  // Not raised while no site can observe it: dated when it becomes observable, and saying so.
  const opens = firstObservable(ft.target, sites, now);
  const when = opens === undefined ? now : opens;
  const seen =
    opens === undefined
      ? '; no campaign site can observe it within the coming year'
      : opens > now + 0.5
        ? `; no campaign site can observe it until the night of ${localNight(opens, sites[0]!.site.timeZone)}, when this applies`
        : '';
  const plan =
    next === null
      ? 'no epoch is planned'
      : `the next planned epoch is ${jdToIso(next).slice(0, 10)}`;
  return {
    kind: 'stale-prediction',
    target: ft.target.name,
    date: jdToIso(when),
    daysAhead: when - now,
    reason: `${ft.target.name}: ${reasons.join('; ')}; ${plan}${seen}.`,
    stale: {
      sigmaMas: sigma,
      daysSinceMeasured: since,
      nextPlanned: next === null ? null : jdToIso(next),
    },
  };
}

/** The JD of the first night (weekly steps over a year) on which some site sees the target, or undefined. */
export function firstObservable(
  target: Target,
  sites: readonly FlagSite[],
  now: number,
): number | undefined {
  for (let d = 0; d <= 365; d += 7) {
    for (const s of sites) {
      const g = nightGrid(s.site, s.limits, localNight(now + d + 0.5, s.site.timeZone), 30);
      if (targetGrid(g, target).ok.some((v) => v === 1)) return now + d;
    }
  }
  return undefined;
}

/**
 * Whether planned epochs or allocated observable nights cover the ± window: "covered: Tolvane
 * 06-13 (planned), 06-15; not covered: the most likely night 06-14".
 */
function passageCoverage(
  ft: FlagTarget,
  sites: readonly FlagSite[],
  hours: readonly SiteHours[],
  jd: number,
): NonNullable<Flag['periapsis']>['coverage'] {
  const planned: { site: string; date: string }[] = [];
  const allocated: { site: string; date: string }[] = [];
  const epochs = ft.plannedEpochsJd ?? [];
  sites.forEach((s, i) => {
    const zone = s.site.timeZone;
    for (const n of hours[i]!.nights) {
      if (epochs.some((e) => localNight(e, zone) === n.date))
        planned.push({ site: s.site.name, date: n.date });
      else if (s.nights?.includes(n.date) && n.hours > 0)
        allocated.push({ site: s.site.name, date: n.date });
    }
  });
  const likely = sites.map((s) => localNight(jd, s.site.timeZone));
  const mostLikelyCovered = epochs.some((e) => Math.abs(e - jd) <= 1);
  const list = (xs: { site: string; date: string }[], tag: string) =>
    xs.map((x) => `${x.site} ${x.date.slice(5)}${tag}`);
  const covered = [...list(planned, ' (planned)'), ...list(allocated, ' (allocated)')];
  const known = sites.some((s) => s.nights !== undefined) || epochs.length > 0;
  const text = !known
    ? ''
    : `Covered: ${covered.length ? covered.join(', ') : 'no planned epoch or allocated observable night in the window'}${mostLikelyCovered ? '.' : `; not covered: the most likely night ${[...new Set(likely)].map((d) => d.slice(5)).join('/')} (no planned epoch within 1 d of the date).`}`;
  return { planned, allocated, mostLikelyCovered, text };
}
