/**
 * Flags: computed warnings for a campaign's targets, soonest first, each with a plain reason.
 * - periapsis ahead: date ± 1σ (linear, from the covariance), lead-time band, observable hours per
 *   night at each site over the ± window, rates of change and the sampling they call for, and the
 *   sizes of the relativistic terms; "periapsis unobservable" when no site sees it;
 * - blend risk: intervals when two stars of a system (or a star and a visible primary) are closer on
 *   the sky than the resolution limit;
 * - stale prediction: position uncertainty beyond a limit, or no measurement for longer than the
 *   cadence, when the target can next be observed.
 * Dates: a flag's `date` is an instant in UTC (ISO 8601 `Z`); a night in its words is named by its
 * site and local evening date ("the night of 2027-02-15 at Tolvane Ridge", "Tolvane Ridge 06-03").
 * Numbers in the words are rounded to what they are known to, and carry their units.
 */
import {
  eventsWithUncertainty,
  ephemeris,
  physicalQuantities,
  predictBatch,
  type Orbit,
} from '../orbit/index.ts';
import { intervalsWhere } from '../sky/darkness.ts';
import type { Limits } from '../sky/limits.ts';
import { nightOf } from '../sky/night.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { jdToIso, parseEpoch } from '../time/index.ts';
import { positive } from './checks.ts';
import { nightGrid, targetGrid } from './grid.ts';
import { closingLimit, nightReasonWords, type NightReason } from './night-reasons.ts';
import { InputError } from '../errors.ts';
import type { DetectionForecast } from './forecast.ts';
import { skyAtMoment } from './moment.ts';
import { precisionAt, precisionModel, type PrecisionModel } from './precision.ts';
import { rounded } from './words.ts';

export const FLAG_KINDS = [
  'periapsis-ahead',
  'periapsis-unobservable',
  'relativity-epoch',
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
  /** Accepted planned blocks of the target still to come: each one's middle (JD) and site name. */
  planned?: readonly { jd: number; site: string }[];
  /** The detection forecast of its relativity factors over those blocks (forecast.ts), if it has one. */
  forecast?: DetectionForecast;
}

export interface FlagSite {
  site: Site;
  limits: Limits;
  /** The campaign's allocated nights at the site (local evening dates); absent: unknown. */
  nights?: readonly string[];
  /** The site's precision model (the options' `precision` overrides it field by field). */
  precision?: Partial<PrecisionModel>;
}

export interface FlagOptions {
  /** The moment flags are computed for, JD (UTC). */
  nowJd: number;
  /**
   * Lead-time bands, days, ascending; the largest is how far ahead periapses are looked for.
   * Default [30, 182, 365].
   */
  leadDays?: number[];
  /** Resolution limit for blends, mas; no blend flags without it. */
  resolutionMas?: number;
  /** Position uncertainty beyond which a prediction is stale, mas; default 10. */
  staleSigmaMas?: number;
  /** The campaign's precision model, over each site's (plan/precision.ts). */
  precision?: Partial<PrecisionModel>;
}

export interface SiteHours {
  site: string;
  /**
   * Observable hours per night over the ± window (nights in order); a night with 0 h names the
   * limit that closed it.
   */
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
    /**
     * Which nights of the ± window hold a planned epoch at a moment the target is observable, or
     * an allocated night with observable hours; planned epochs at a closed moment (the Moon, …) do
     * not cover it and are listed apart with what closes them; whether the most likely date is covered.
     */
    coverage: {
      planned: { site: string; date: string }[];
      closed: { site: string; date: string; words: string }[];
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
  /** The coming planned epochs the relativity forecast depends on (relativity-epoch). */
  relativity?: {
    epochs: {
      epoch: string;
      /** Share of each factor's information after the plan that the epoch carries, 0–1. */
      shares: { factor: string; share: number }[];
      /** Detections (e.g. "redshift 5σ") reached with this epoch. */
      reaches: string[];
    }[];
    summary: string[];
  };
  stale?: {
    /** Position uncertainty (1σ) at the flag's date, mas. */
    sigmaMas: number | null;
    /** Days from the last measurement to the flag's date. */
    daysSinceMeasured: number | null;
    /** The next planned epoch, ISO 8601 UTC, if any. */
    nextPlanned: string | null;
    /** When a site can next observe the target, if not now: its first open moment (UTC), site and night. */
    observableFrom: { utc: string; site: string; night: string } | null;
  };
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
    const date = nightOf(centreJd + d, site.timeZone);
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
  // The best zenith σ per kind over the sites: what the sampling advice assumes.
  const zenith = sites.map((s, i) =>
    precisionAt(precisionModel([options.precision, s.precision], `sites.${i}.precision`), 1, null),
  );
  const precision = {
    astrometryMas: Math.min(...zenith.map((z) => z.astrometryMas)),
    spectroscopyKmS: Math.min(...zenith.map((z) => z.spectroscopyKmS)),
  };
  const flags: Flag[] = [];

  for (const ft of targets) {
    const orbit = ft.target.orbit;
    if (orbit) flags.push(...periapsisFlags(ft, orbit, sites, now, horizon, lead, precision));
    const stale = staleFlag(ft, sites, now, staleSigma);
    if (stale) flags.push(stale);
    const rel = ft.forecast ? relativityFlag(ft.target.name, ft.forecast, now, horizon) : null;
    if (rel) flags.push(rel);
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
  precision: { astrometryMas: number; spectroscopyKmS: number },
): Flag[] {
  const name = ft.target.name;
  const ev = eventsWithUncertainty(orbit, now, now + horizon, { kinds: ['periapsis'] })[0];
  if (!ev) return [];
  const sigmaDays = ev.sigmaDays ?? null;
  const half = Math.max(1, Math.min(60, Math.ceil(sigmaDays ?? 1)));
  const siteHours = sites.map((s) => hoursAround(s.site, s.limits, ft.target, ev.jd, half));
  const { rvRate, skyRate, samplingDays } = passageRates(orbit, ev.jd, precision);
  const relativity = relativityAtPeriapsis(orbit);
  const daysAhead = ev.jd - now;
  const band = bandOf(daysAhead, lead);
  const seen = siteHours.filter((s) => s.maxHours > 0);
  const date = ev.epoch;
  const pm =
    sigmaDays === null ? '(no covariance: uncertainty unknown)' : `± ${sigmaDays.toFixed(1)} d`;
  const rates = ratesWords(rvRate, skyRate, samplingDays, relativity);
  const where = siteHours.map(siteHoursWords).join('; ');
  const coverage = passageCoverage(ft, sites, siteHours, ev.jd, half);
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
      reason:
        `${name} passes periapsis on ${date.slice(0, 10)} ${pm}, but no campaign site can ` +
        `observe it in that window: ${why}.`,
      periapsis: details,
    });
  }
  out.push({
    kind: 'periapsis-ahead',
    target: name,
    date,
    daysAhead,
    reason:
      `${name} passes periapsis on ${date.slice(0, 10)} ${pm}, ${Math.round(daysAhead)} ` +
      `days ahead (${band}). Observable: ${where}. ${coverage.text ? `${coverage.text} ` : ''}` +
      `Its ${rates}.`,
    periapsis: details,
  });
  return out;
}

/**
 * How fast the star moves at periapsis (radial velocity per day over ± 12 h, sky speed per day)
 * and the sampling that resolves it: the interval over which either changes by its 1σ.
 */
function passageRates(
  orbit: Orbit,
  jd: number,
  precision: { astrometryMas: number; spectroscopyKmS: number },
): { rvRate: number | null; skyRate: number; samplingDays: number | null } {
  const rows = predictBatch(orbit, Float64Array.of(jd - 0.5, jd, jd + 0.5));
  const rvRate =
    orbit.distancePc === null ? null : rows.radialVelocityKmS[2]! - rows.radialVelocityKmS[0]!;
  const skyRate = Math.hypot(rows.vRaMasYr[1]!, rows.vDecMasYr[1]!) / 365.25;
  const cands = [
    precision.astrometryMas / skyRate,
    rvRate ? precision.spectroscopyKmS / Math.abs(rvRate) : Infinity,
  ].filter((x) => Number.isFinite(x));
  return { rvRate, skyRate, samplingDays: cands.length ? Math.min(...cands) : null };
}

/** The relativistic terms' sizes at periapsis, when the distance is known. */
function relativityAtPeriapsis(orbit: Orbit): NonNullable<Flag['periapsis']>['relativity'] {
  if (orbit.distancePc === null) return null;
  const q = physicalQuantities(orbit);
  return {
    gravitationalRedshiftKmS: q.gravitationalRedshiftAtPeriapsisKmS,
    transverseDopplerKmS: q.transverseDopplerAtPeriapsisKmS,
    precessionArcminPerOrbit: q.precessionArcminPerOrbit,
  };
}

/** The rates, the sampling and the relativistic terms in words. */
function ratesWords(
  rvRate: number | null,
  skyRate: number,
  samplingDays: number | null,
  relativity: NonNullable<Flag['periapsis']>['relativity'],
): string {
  const sampling =
    samplingDays === null
      ? ''
      : `, so sample at least every ` +
        `${samplingDays < 1 ? `${rounded(samplingDays * 24, 2)} h` : `${rounded(samplingDays, 2)} d`}`;
  const rates =
    `radial velocity changes by ` +
    `${rvRate === null ? '? (no distance)' : `${rounded(Math.abs(rvRate))} km/s`} and position ` +
    `by ${rounded(skyRate)} mas per day there${sampling}`;
  const rel = relativity
    ? `; gravitational redshift ${rounded(relativity.gravitationalRedshiftKmS)} km/s, transverse ` +
      `Doppler ${rounded(relativity.transverseDopplerKmS)} km/s, precession ` +
      `${rounded(relativity.precessionArcminPerOrbit)}′ per orbit`
    : '';
  return `${rates}${rel}`;
}

/** "Tolvane 0.0–6.5 h per night (0 h on 08-05, 08-06: the Moon (12° away, limit 25°) …)". */
function siteHoursWords(s: SiteHours): string {
  const zero = new Map<string, string[]>();
  for (const n of s.nights)
    if (n.words) zero.set(n.words, [...(zero.get(n.words) ?? []), n.date.slice(5)]);
  const zeros = [...zero.entries()].map(([w, ds]) => `0 h on ${ds.join(', ')}: ${w}`).join('; ');
  return `${s.site} ${s.minHours.toFixed(1)}–${s.maxHours.toFixed(1)} h per night${zeros ? ` (${zeros})` : ''}`;
}

/**
 * An epoch the forecast depends on: it carries this share of a factor's information, or a detection
 * is reached with it.
 */
export const CRITICAL_SHARE = 0.1;
const FACTOR_WORDS: Record<string, string> = {
  redshiftFactor: 'redshift',
  precessionFactor: 'precession',
};

/**
 * The coming planned epochs a relativity forecast depends on: those carrying at least
 * CRITICAL_SHARE of a factor's information after the plan, and those with which a factor reaches
 * 3σ or 5σ. Dated at the soonest (within the horizon); null when there is none.
 */
function relativityFlag(
  name: string,
  f: DetectionForecast,
  now: number,
  horizon: number,
): Flag | null {
  const byEpoch = new Map<
    string,
    { shares: { factor: string; share: number }[]; reaches: string[] }
  >();
  const entry = (epoch: string) => {
    const e = byEpoch.get(epoch) ?? { shares: [], reaches: [] };
    byEpoch.set(epoch, e);
    return e;
  };
  for (const factor of f.factors) {
    for (const t of factor.topEpochs)
      if (t.share >= CRITICAL_SHARE)
        entry(t.epoch).shares.push({ factor: factor.name, share: t.share });
    for (const r of factor.reaches)
      if (!r.already && r.epoch)
        entry(r.epoch).reaches.push(`${FACTOR_WORDS[factor.name]} ${r.sigma}σ`);
  }
  const epochs = [...byEpoch.entries()]
    .map(([epoch, e]) => ({ epoch, ...e, jd: parseEpoch(epoch) }))
    .filter((e) => e.jd >= now && e.jd <= now + horizon)
    .sort((a, b) => a.jd - b.jd);
  const first = epochs[0];
  if (!first) return null;
  const words = epochs.map((e) => {
    const parts = [
      ...e.shares.map(
        (x) => `${Math.round(100 * x.share)} % of the ${FACTOR_WORDS[x.factor]} information`,
      ),
      ...e.reaches.map((r) => `reaches ${r}`),
    ];
    return `${e.epoch.slice(0, 16).replace('T', ' ')} UTC (${parts.join(', ')})`;
  });
  return {
    kind: 'relativity-epoch',
    target: name,
    date: first.epoch,
    daysAhead: first.jd - now,
    reason:
      `${name}: the relativity forecast depends on coming planned epochs: ` +
      `${words.join('; ')}. ${f.summary.join('; ')}.`,
    relativity: {
      epochs: epochs.map(({ epoch, shares, reaches }) => ({ epoch, shares, reaches })),
      summary: f.summary,
    },
  };
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
      reason:
        `${a.target.name} and ${other} are closer than the ${resolution} mas resolution ` +
        `limit from ${start.slice(0, 10)} to ${end.slice(0, 10)} (closest ${min.toFixed(1)} ` +
        `mas): astrometry of either is unreliable then.`,
      blend: { other, start, end, closestMas: min },
    };
  });
}

/**
 * Stale prediction: position uncertainty beyond the limit, or no measurement for longer than the
 * cadence — judged when a site can next observe the target (now, if it can tonight), since nothing
 * can be done before. A planned epoch within one cadence of that moment answers the second; the
 * flag is dated at that moment and its words name the night and site.
 */
function staleFlag(
  ft: FlagTarget,
  sites: readonly FlagSite[],
  now: number,
  staleSigma: number,
): Flag | null {
  const orbit = ft.target.orbit;
  const opens = firstObservable(ft.target, sites, now);
  const when = opens === undefined ? now : Math.max(now, opens.jd);
  const later = opens !== undefined && opens.jd > now + 1;
  const sigma = orbit?.covariance
    ? (() => {
        const r = ephemeris(orbit, Float64Array.of(when))[0]!;
        return Math.hypot(r.sigma?.dRaMas ?? 0, r.sigma?.dDecMas ?? 0);
      })()
    : null;
  const last = ft.lastMeasuredJd ?? null;
  const since = last === null ? null : when - last;
  const next = (ft.planned ?? [])
    .map((p) => p.jd)
    .filter((j) => j >= now)
    .sort((a, b) => a - b)[0];
  const cadence = ft.cadenceDays;
  const plannedInTime = next !== undefined && cadence !== undefined && next - when <= cadence;
  const at = later
    ? ` by the night of ${opens.date} at ${opens.site}, when it can next be observed`
    : '';
  const reasons: string[] = [];
  if (sigma !== null && sigma > staleSigma)
    reasons.push(
      `its predicted position${later ? ' then' : ''} is uncertain by ${rounded(sigma, 2)} mas ` +
        `(1σ), beyond the ${staleSigma} mas limit`,
    );
  if (!plannedInTime && since !== null && cadence !== undefined && since > cadence)
    reasons.push(
      `its last measurement (${jdToIso(last!).slice(0, 10)}) is ${Math.floor(since)} days old${at}` +
        `, longer than its ${cadence}-day cadence`,
    );
  if (!plannedInTime && cadence !== undefined && last === null)
    reasons.push('it has never been measured');
  if (reasons.length === 0) return null;
  const seen =
    opens === undefined ? '; no campaign site can observe it within the coming year' : '';
  const after =
    next !== undefined && (later || next - now > 1)
      ? ` (${Math.round(next - when)} days after ${later ? 'that night' : 'today'})`
      : '';
  const plan =
    next === undefined
      ? 'no epoch is planned'
      : `the next planned epoch is ${jdToIso(next).slice(0, 10)}${after}`;
  return {
    kind: 'stale-prediction',
    target: ft.target.name,
    date: jdToIso(when),
    daysAhead: when - now,
    reason: `${ft.target.name}: ${reasons.join('; ')}; ${plan}${seen}.`,
    stale: {
      sigmaMas: sigma,
      daysSinceMeasured: since,
      nextPlanned: next === undefined ? null : jdToIso(next),
      observableFrom: later
        ? { utc: jdToIso(opens.jd), site: opens.site, night: opens.date }
        : null,
    },
  };
}

/**
 * The first moment (within a year) a site can observe the target: the first open edge of the first
 * night with one, found in weekly steps and then night by night within the week. Undefined: none.
 */
export function firstObservable(
  target: Target,
  sites: readonly FlagSite[],
  now: number,
): { jd: number; site: string; date: string } | undefined {
  const openOn = (d: number) => {
    let best: { jd: number; site: string; date: string } | undefined;
    for (const s of sites) {
      const date = nightOf(now + d, s.site.timeZone);
      const g = nightGrid(s.site, s.limits, date, 10);
      const ok = targetGrid(g, target).ok;
      for (let i = 0; i < ok.length; i++)
        if (ok[i] && g.edgeJd[i]! >= now) {
          if (!best || g.edgeJd[i]! < best.jd) best = { jd: g.edgeJd[i]!, site: s.site.name, date };
          break;
        }
    }
    return best;
  };
  // Weekly steps, then the nights of the week before the first open one; all on the planners'
  // 10-minute grid (a coarser one misses the first short windows as a star leaves the Sun).
  const tonight = openOn(0);
  if (tonight) return tonight;
  for (let d = 1; d <= 366; d += 7) {
    const found = openOn(d);
    if (!found) continue;
    for (let k = Math.max(1, d - 6); k < d; k++) {
      const early = openOn(k);
      if (early) return early;
    }
    return found;
  }
  return undefined;
}

/**
 * Whether planned epochs or allocated observable nights cover the ± window: "covered: Tolvane
 * 06-13 (planned), 06-15 (allocated); planned but closed: Tolvane 06-14 (the Moon …); not covered:
 * the most likely night 06-14". A planned epoch counts only where the target is observable at its
 * moment (the planners' grid): a block on a night the Moon closes covers nothing.
 */
function passageCoverage(
  ft: FlagTarget,
  sites: readonly FlagSite[],
  hours: readonly SiteHours[],
  jd: number,
  halfDays: number,
): NonNullable<Flag['periapsis']>['coverage'] {
  const planned: { site: string; date: string }[] = [];
  const closed: { site: string; date: string; words: string }[] = [];
  const allocated: { site: string; date: string }[] = [];
  const openEpochs: number[] = [];
  for (const e of ft.planned ?? []) {
    const s = sites.find((x) => x.site.name === e.site);
    if (!s || Math.abs(e.jd - jd) > halfDays + 1) continue;
    const m = skyAtMoment(s.site, s.limits, ft.target, e.jd);
    const same = (x: { site: string; date: string }) => x.site === e.site && x.date === m.date;
    if (m.open) {
      openEpochs.push(e.jd);
      if (!planned.some(same)) planned.push({ site: e.site, date: m.date });
    } else if (!closed.some(same))
      closed.push({ site: e.site, date: m.date, words: m.words ?? 'closed' });
  }
  sites.forEach((s, i) => {
    for (const n of hours[i]!.nights)
      if (
        s.nights?.includes(n.date) &&
        n.hours > 0 &&
        !planned.some((p) => p.site === s.site.name && p.date === n.date)
      )
        allocated.push({ site: s.site.name, date: n.date });
  });
  const likely = sites.map((s) => nightOf(jd, s.site.timeZone));
  const mostLikelyCovered = openEpochs.some((e) => Math.abs(e - jd) <= 1);
  const list = (xs: { site: string; date: string }[], tag: string) =>
    xs.map((x) => `${x.site} ${x.date.slice(5)}${tag}`);
  const covered = [...list(planned, ' (planned)'), ...list(allocated, ' (allocated)')];
  const shut = closed.map((c) => `${c.site} ${c.date.slice(5)} (${c.words})`);
  const known = sites.some((s) => s.nights !== undefined) || (ft.planned ?? []).length > 0;
  const covering = covered.length
    ? covered.join(', ')
    : 'no planned epoch or allocated observable night in the window';
  const closedWords = shut.length
    ? `; planned but closed, so not covering: ${shut.join(', ')}`
    : '';
  const likelyNights = [...new Set(likely)].map((d) => d.slice(5)).join('/');
  const uncovered = mostLikelyCovered
    ? '.'
    : `; not covered: the most likely night ${likelyNights} ` +
      '(no observable planned epoch within 1 d of the date).';
  const text = !known ? '' : `Covered: ${covering}${closedWords}${uncovered}`;
  return { planned, closed, allocated, mostLikelyCovered, text };
}
