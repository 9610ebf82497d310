/** The season planner's inputs and outputs, and the one check of its inputs. */
import { InputError } from '../errors.ts';
import type { Limits } from '../sky/limits.ts';
import { addDays, parseNightDate } from '../sky/night.ts';
import type { Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import { BLOCK_KINDS, type BlockKind } from './candidates.ts';
import { numberIn, positive } from './checks.ts';
import { parseDurationMinutes } from '../time/duration.ts';
import type { NightReason } from './night-reasons.ts';
import type { KeptBlock, ScheduledBlock } from './night-schedule.ts';
import type { MeasurementInput } from '../orbit/fit/types.ts';
import type { DetectionForecast } from './forecast.ts';
import type { PrecisionModel } from './precision.ts';

/**
 * Epochs per night inside a periapsis window: one, one per `step` (an ISO 8601 duration, PT30M to
 * PT12H) while observable, or as many as fit.
 */
export type PeriapsisRepeat = 'single' | 'fill' | { step: string };
/** The same, checked: the step in hours. */
export type RepeatRule = 'single' | 'fill' | { stepHours: number };
export type PerKind<T> = Partial<Record<BlockKind, T>>;

export interface SeasonSite {
  site: Site;
  limits: Limits;
  /** Allocated nights (local evening dates); null or absent: every night of the range. */
  nights?: readonly string[] | null;
  /** The site has a laser guide star (whether a block uses it is the targets' or campaign's setting). */
  laserGuideStar?: boolean;
  /** Stored blocks that stay, by night (local evening date, one of `nights`): planned around, never moved. */
  kept?: Readonly<Record<string, readonly KeptBlock[]>>;
  /** The site's precision model (the campaign's `precision` overrides it field by field). */
  precision?: Partial<PrecisionModel>;
  /** Weight of each night (local evening date) in (0, 1], e.g. the chance it is clear; default 1. */
  nightWeights?: Readonly<Record<string, number>>;
}

export interface SeasonTarget {
  target: Target;
  kinds: readonly BlockKind[];
  /** Longest wanted gap between epochs of each kind, days, [1, 3650]. */
  cadenceDays: number;
  /** Gap wanted within `densifyWithinDays` of a periapsis, days. */
  densifiedCadenceDays?: number;
  densifyWithinDays?: number;
  /** Last epoch already obtained per kind, JD (the first window counts from it). */
  lastEpochJd?: PerKind<number>;
  /** Weight when epochs compete for a night, (0, 1000]; default 1. */
  priority?: number;
  /** Block length per kind, minutes (the campaign's `blockMinutes` otherwise). */
  blockMinutes?: PerKind<number>;
  /** Laser guide star use per kind (the campaign's `laserGuideStar` otherwise). */
  laserGuideStar?: PerKind<boolean>;
  /** Epochs per night in the periapsis window (the campaign's `periapsisRepeat` otherwise). */
  periapsisRepeat?: PeriapsisRepeat;
  /** The measurements that exist (epochs, kinds, σ): the relativity goal's starting information. */
  measurements?: MeasurementInput[];
}

export interface SeasonOptions {
  /** Block length per kind, minutes; default astrometry 40, spectroscopy 60. */
  blockMinutes?: PerKind<number>;
  /** The campaign's precision model: overrides each site's, field by field. */
  precision?: Partial<PrecisionModel>;
  /** Slot length for the nights' grids, minutes, [1, 30]; default 10. */
  slotMinutes?: number;
  slewMinutes?: number;
  sameTargetMinutes?: number;
  /** Share of each night's darkness the plan may fill, (0, 1]; default 0.9. */
  fillFraction?: number;
  /** Epochs per target and kind beyond the cadence, placed by information, [0, 20]; default 0. */
  extraEpochsPerTarget?: number;
  /** Half-width of the periapsis window in σ of the passage date, (0, 10]; default 2. */
  periapsisWindowSigma?: number;
  /** An epoch within this many days of the passage date covers it, (0, 30]; default 1. */
  coverageWithinDays?: number;
  /** Laser guide star use per kind where a site has one; default none (no hidden rule). */
  laserGuideStar?: PerKind<boolean>;
  /** Epochs per night in a periapsis window; default 'single'. */
  periapsisRepeat?: PeriapsisRepeat;
  /** A critical epoch (season-backups.ts) whose night is lost with at least this chance (1 − its night weight) gets a backup, (0, 1]; default 0.2 (1: only certain losses). */
  backupLossAbove?: number;
  /**
   * Also maximise the relativity forecast: an epoch's score adds the fractional variance it removes
   * from the redshift and precession factors of targets whose orbits have those terms on; default false.
   */
  relativityGoal?: boolean;
}

/** The settings a request may give (the CLI's --settings keys, the HTTP body's). */
export const SEASON_SETTINGS = [
  'blockMinutes',
  'precision',
  'slotMinutes',
  'slewMinutes',
  'sameTargetMinutes',
  'fillFraction',
  'extraEpochsPerTarget',
  'periapsisWindowSigma',
  'coverageWithinDays',
  'laserGuideStar',
  'periapsisRepeat',
  'backupLossAbove',
  'relativityGoal',
] as const satisfies readonly (keyof SeasonOptions)[];

/** What one epoch buys, in named units (the same words in the CLI, the JSON and the client). */
export interface EpochGain {
  /** σ of the named passage's date it removes, hours (null: the target has no passage in range). */
  periapsisSigmaHoursRemoved: number | null;
  /** Share of the mass variance it removes, % (null: the mass is not among the parameters). */
  massVariancePercentRemoved: number | null;
  text: string;
}

export interface PlannedEpoch {
  target: string;
  kind: BlockKind;
  site: string;
  date: string;
  block: ScheduledBlock;
  /** The 1σ expected there and then (precision model at the block's middle airmass). */
  precision: { sigma: number; unit: 'mas' | 'km/s'; airmass: number; seeingArcsec: number | null };
  gain: EpochGain;
  why: 'periapsis' | 'cadence' | 'information' | 'backup';
  reason: string;
}

/** One site-night and why it has no epoch. */
export interface NightNote {
  site: string;
  date: string;
  kind: BlockKind;
  reason: NightReason;
  words: string;
}

export interface UnmetGoal {
  target: string;
  kind: BlockKind;
  /** First and last night of the cadence window (local evening dates). */
  start: string;
  end: string;
  reason: string;
  /** Per site and night of the window, the limit that closed it. */
  nights: NightNote[];
}

export interface PassagePlan {
  /** The passage these numbers are about (the coming one in the range), ISO 8601 UTC. */
  date: string;
  sigmaDays: { before: number | null; after: number | null };
  windowSigma: number;
  windowStart: string;
  windowEnd: string;
  /** Probability that the passage date lies within `withinDays` of an epoch, before (kept blocks only) and after the plan. */
  coverage: { withinDays: number; before: number; after: number };
  epochs: number;
  /** Allocated site-nights of the window the plan leaves without an epoch, each with why. */
  unused: NightNote[];
}

export interface TargetPlan {
  target: string;
  priority: number;
  cadenceDays: number;
  epochs: Record<BlockKind, number>;
  periapses: string[];
  cadenceMet: boolean;
  passage: PassagePlan | null;
  /** 1σ before and after the plan (linear, Fisher); nominalPrior: the orbit had no covariance. */
  shrinkage: {
    /** σ of the date of `passage` (the coming passage), not of the element T. */
    periapsisDays: { before: number | null; after: number | null };
    passage: string | null;
    massFraction: { before: number | null; after: number | null };
    nominalPrior: boolean;
  } | null;
  /**
   * Critical epochs (season-backups.ts) on nights likely lost and their backups, in words with the
   * numbers; null when no night of the plan is likely lost (a weather-blind plan).
   */
  backups: { critical: number; backedUp: number; words: string } | null;
  /** The best epochs not in the plan, by information given the plan. */
  nextBest: { date: string; site: string; kind: BlockKind; gain: EpochGain }[];
  /**
   * The relativity detection forecast after the plan (forecast.ts: the target's measurements, then
   * its kept blocks and the plan's epochs at their own σ); null when the orbit has no distance or no
   * relativistic term to scale. The same whether or not the relativity goal chose the epochs.
   */
  relativity: DetectionForecast | null;
}

export interface SeasonPlan {
  startDate: string;
  endDate: string;
  sites: {
    name: string;
    nights: number;
    nightsUsed: number;
    darkHours: number;
    plannedHours: number;
  }[];
  epochs: PlannedEpoch[];
  unmet: UnmetGoal[];
  targets: TargetPlan[];
  cautions: string[];
}

/** A target with every setting resolved. */
export interface ResolvedTarget {
  input: SeasonTarget;
  name: string;
  priority: number;
  blockMinutes: Record<BlockKind, number>;
  laserGuideStar: Record<BlockKind, boolean>;
  repeat: RepeatRule;
}

const MAX_NIGHTS = 400;

/** The range's dates, checked. */
export function seasonDates(startDate: string, endDate: string): string[] {
  parseNightDate(startDate, 'startDate');
  parseNightDate(endDate, 'endDate');
  if (endDate < startDate)
    throw new InputError('endDate', endDate, `must not be before startDate ${startDate}`);
  const dates: string[] = [];
  for (let d = startDate; d <= endDate; d = addDays(d, 1)) {
    dates.push(d);
    if (dates.length > MAX_NIGHTS)
      throw new InputError('endDate', endDate, `must be within ${MAX_NIGHTS} nights of startDate`);
  }
  return dates;
}

function checkRepeat(field: string, r: unknown): RepeatRule {
  if (r === 'single' || r === 'fill') return r;
  if (typeof r === 'object' && r !== null && 'everyHours' in r)
    throw new InputError(
      `${field}.everyHours`,
      (r as { everyHours: unknown }).everyHours,
      'is now { step }, an ISO 8601 duration, e.g. { "step": "PT2H" }',
    );
  if (typeof r === 'object' && r !== null && 'step' in r) {
    const minutes = parseDurationMinutes((r as { step: unknown }).step, `${field}.step`, {
      atLeast: 'PT30M',
      atMost: 'PT12H',
    });
    return { stepHours: minutes / 60 };
  }
  throw new InputError(
    field,
    r,
    'must be "single", "fill" or { step } with an ISO 8601 duration from PT30M to PT12H',
  );
}

function perKind<T>(
  field: string,
  v: PerKind<T> | undefined,
  check: (f: string, x: unknown) => T,
  fallback: Record<BlockKind, T>,
): Record<BlockKind, T> {
  return {
    astrometry:
      v?.astrometry === undefined
        ? fallback.astrometry
        : check(`${field}.astrometry`, v.astrometry),
    spectroscopy:
      v?.spectroscopy === undefined
        ? fallback.spectroscopy
        : check(`${field}.spectroscopy`, v.spectroscopy),
  };
}
const minutes = (f: string, x: unknown) => positive(f, x, 720);
const bool = (f: string, x: unknown) => {
  if (typeof x !== 'boolean') throw new InputError(f, x, 'must be true or false');
  return x;
};

/** Check the targets and resolve each one's settings against the campaign's. @throws InputError naming the field. */
export function resolveTargets(
  targets: readonly SeasonTarget[],
  options: SeasonOptions,
): ResolvedTarget[] {
  if (targets.length === 0 || targets.length > 1000)
    throw new InputError('targets', targets.length, 'must list 1 to 1000 targets');
  const blocks = perKind('blockMinutes', options.blockMinutes, minutes, {
    astrometry: 40,
    spectroscopy: 60,
  });
  const lgs = perKind('laserGuideStar', options.laserGuideStar, bool, {
    astrometry: false,
    spectroscopy: false,
  });
  const repeat =
    options.periapsisRepeat === undefined
      ? 'single'
      : checkRepeat('periapsisRepeat', options.periapsisRepeat);
  const names = new Set<string>();
  return targets.map((t, i) => {
    const f = `targets.${i}`;
    if (names.has(t.target.name))
      throw new InputError(`${f}.name`, t.target.name, 'is used by an earlier target');
    names.add(t.target.name);
    positive(`${f}.cadenceDays`, t.cadenceDays, 3650);
    if (t.densifiedCadenceDays !== undefined)
      positive(`${f}.densifiedCadenceDays`, t.densifiedCadenceDays, 3650);
    if (t.densifyWithinDays !== undefined)
      numberIn(`${f}.densifyWithinDays`, t.densifyWithinDays, 0, 3650);
    if (t.kinds.length === 0 || t.kinds.some((k) => !BLOCK_KINDS.includes(k)))
      throw new InputError(`${f}.kinds`, t.kinds, 'must list "astrometry" and/or "spectroscopy"');
    return {
      input: t,
      name: t.target.name,
      priority: t.priority === undefined ? 1 : positive(`${f}.priority`, t.priority, 1000),
      blockMinutes: perKind(`${f}.blockMinutes`, t.blockMinutes, minutes, blocks),
      laserGuideStar: perKind(`${f}.laserGuideStar`, t.laserGuideStar, bool, lgs),
      repeat:
        t.periapsisRepeat === undefined
          ? repeat
          : checkRepeat(`${f}.periapsisRepeat`, t.periapsisRepeat),
    };
  });
}
