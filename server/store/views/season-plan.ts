/**
 * A stored campaign's season plan: preview it (the season planner over the campaign's targets,
 * goals and sites, on the nights that are still open), then accept it into stored blocks.
 *
 * Open nights: the campaign's own stored nights in the range (`nights: "allocated"`, the default),
 * or every date of the range (`"all"`, creating the night rows it uses) — leaving out nights of
 * other campaigns, nights with a report and nights that have begun. On an open night, blocks that
 * stay (plan-scope.ts: made by hand, pinned, logged, measured…) are planned around: new blocks go in
 * the time they leave free, and a kept block counts as that night's epoch of its target and kind.
 * Accepting replaces the open stored nights' blocks that are still only plans with the new plan's,
 * in one transaction; nothing else is touched, so a re-plan keeps what was made by hand, pinned,
 * observed and logged. An accept's moment may not lie in the past (plan-scope.ts).
 */
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { InputError } from '../../science/errors.ts';
import { addDays, parseNightDate } from '../../science/sky/night.ts';
import type {
  KeptBlock,
  BlockKind,
  SeasonOptions,
  SeasonPlan,
  SeasonSite,
  SeasonTarget,
} from '../../science/plan/index.ts';
import { jdToIso, jdToUnixMs } from '../../science/time/index.ts';
import type { Actor } from '../audit.ts';
import { removeIn } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { ConflictError } from '../errors.ts';
import type { StoreContext } from '../context.ts';
import { blockEntity, nightIntervalUtc, type BlockRow, type NightRow } from '../repos/nights.ts';
import {
  asKeptBlock,
  lastEpochs,
  type NightState,
  nightStates,
  planDigest,
  plannerNames,
  requireAcceptMoment,
} from './plan-scope.ts';
import { campaignPlanningInput } from './planning.ts';
import { siteStatisticsView } from './site-statistics.ts';
import { clearNightWeights } from '../../science/plan/site-statistics.ts';
import { inArray } from 'drizzle-orm';
import { measurements } from '../../../db/schema.ts';
import type { MeasurementInput } from '../../science/orbit/fit/types.ts';
import { toInput } from '../fits.ts';
import { nowMs } from '../../clock.ts';
import type { CampaignGoals } from '../../../db/schema.ts';

/** Each target's measurements as the fit reads them (epochs, kinds, σ). */
async function targetMeasurements(
  db: DbOrTx,
  ids: number[],
): Promise<Map<number, MeasurementInput[]>> {
  const out = new Map<number, MeasurementInput[]>();
  if (ids.length === 0) return out;
  for (const r of await db.select().from(measurements).where(inArray(measurements.targetId, ids)))
    out.set(r.targetId, [...(out.get(r.targetId) ?? []), toInput(r)]);
  return out;
}

export const NIGHT_CHOICES = ['allocated', 'all'] as const;
/** "aware": each night weighs by its site's learned chance of being clear (site statistics); "blind": every night weighs 1. */
export const WEATHER_CHOICES = ['blind', 'aware'] as const;
export type WeatherChoice = (typeof WEATHER_CHOICES)[number];
/** Every planning request (season plan, its draws, re-plan, time request) is weather-aware unless it asks for "blind". */
export const DEFAULT_WEATHER: WeatherChoice = 'aware';

export interface SeasonPlanRequest extends SeasonOptions {
  startDate: string;
  endDate: string;
  /** Sites of the campaign to plan for; default all of them. */
  siteIds?: number[];
  nights?: (typeof NIGHT_CHOICES)[number];
  /** Whether the plan weighs each night by its chance of being clear; default "aware" (DEFAULT_WEATHER). */
  weather?: (typeof WEATHER_CHOICES)[number];
  /** The preview's digest: accept refuses (409) when the plan would now come out differently. */
  digest?: string;
}

export interface SeasonPlanPreview {
  campaignId: number;
  /** The moment the plan was made for: nights begun before it are not planned, blocks begun before it are kept. */
  at: string;
  nights: (typeof NIGHT_CHOICES)[number];
  weather: (typeof WEATHER_CHOICES)[number];
  sites: {
    siteId: number;
    name: string;
    openNights: number;
    /** The mean chance an open night is clear (site statistics) and the night reports it rests on. */
    clearChance: { mean: number | null; nightsLogged: number };
    skipped: { date: string; reason: string }[];
    plannedAround: { date: string; kept: { id: number; reason: string }[] }[];
  }[];
  plan: SeasonPlan;
  /** Stored blocks accepting would delete (all still only plans). */
  replaces: number[];
  digest: string;
}

interface Prepared {
  preview: SeasonPlanPreview;
  /** The sites with their learned night weights, whatever the plan's mode (what a Monte Carlo draws from). */
  weatherSites: SeasonSite[];
  targets: SeasonTarget[];
  /** The planner's settings: the campaign's goals with the request's own over them. */
  options: SeasonOptions;
  siteIdByName: Map<string, number>;
  targetIdByName: Map<string, number>;
  nightByKey: Map<string, NightRow>;
}

export async function prepare(
  db: DbOrTx,
  campaignId: number,
  request: SeasonPlanRequest,
  atJd: number,
  run: Runner,
): Promise<Prepared> {
  const at = jdToIso(atJd);
  const input = await campaignPlanningInput(db, campaignId);
  const { mode, weather, chosen } = checkedRequest(request, input, campaignId);
  const names = plannerNames(input.targets);
  const states = await nightStates(
    db,
    { siteIds: chosen.map((s) => s.id), from: request.startDate, to: request.endDate },
    at,
  );
  const nightByKey = new Map<string, NightRow>();
  const replaces: number[] = [];
  const seasonSites: SeasonSite[] = [];
  const weatherSites: SeasonSite[] = [];
  const sitesOut: SeasonPlanPreview['sites'] = [];
  for (const s of chosen) {
    const mine = states.filter((n) => n.night.siteId === s.id);
    const nights = siteNights(s, mine, request, { campaignId, mode, atJd, at }, names);
    for (const [d, night] of nights.open) nightByKey.set(`${s.id}/${d}`, night);
    replaces.push(...nights.replaces);
    const stats = await siteStatisticsView(db, s.id);
    const nightWeights = clearNightWeights(stats, nights.dates);
    const site: SeasonSite = {
      site: s.site,
      limits: s.limits,
      nights: nights.dates,
      laserGuideStar: s.laserGuideStar,
      kept: nights.keptByDate,
      precision: s.precision,
    };
    seasonSites.push(weather === 'aware' ? { ...site, nightWeights } : site);
    weatherSites.push({ ...site, nightWeights });
    const chances = Object.values(nightWeights);
    sitesOut.push({
      siteId: s.id,
      name: s.site.name,
      openNights: nights.dates.length,
      clearChance: {
        mean: chances.length ? chances.reduce((a, x) => a + x, 0) / chances.length : null,
        nightsLogged: stats.year.nights,
      },
      skipped: nights.skipped,
      plannedAround: nights.plannedAround,
    });
  }
  const { targets, options } = await planTargets(db, input, request, names, weather, chosen);
  const { startDate, endDate } = request;
  const plan = await run('planSeason', startDate, endDate, seasonSites, targets, options);
  replaces.sort((a, b) => a - b);
  const digest = planDigest({
    epochs: plan.epochs.map((e) => [
      e.target,
      e.kind,
      e.site,
      e.date,
      e.block.start.utc,
      e.block.end.utc,
    ]),
    replaces,
  });
  return {
    preview: { campaignId, at, nights: mode, weather, sites: sitesOut, plan, replaces, digest },
    weatherSites,
    targets,
    options,
    siteIdByName: new Map(chosen.map((s) => [s.site.name, s.id])),
    targetIdByName: new Map(input.targets.map((t) => [names.get(t.id)!, t.id])),
    nightByKey,
  };
}

type PlanningInput = Awaited<ReturnType<typeof campaignPlanningInput>>;

/** The request's choices checked against the campaign: night mode, weather, dates, sites, targets. */
function checkedRequest(request: SeasonPlanRequest, input: PlanningInput, campaignId: number) {
  const { campaign } = input;
  const mode = request.nights ?? 'allocated';
  if (!(NIGHT_CHOICES as readonly string[]).includes(mode))
    throw new InputError(
      'nights',
      mode,
      'must be "allocated" (the campaign’s stored nights) or "all" (every night of the range)',
    );
  const weather = request.weather ?? DEFAULT_WEATHER;
  if (!(WEATHER_CHOICES as readonly string[]).includes(weather))
    throw new InputError(
      'weather',
      weather,
      'must be "aware" (nights weighed by their chance of being clear) or "blind"',
    );
  for (const field of ['startDate', 'endDate'] as const) {
    const d = request[field];
    parseNightDate(d, field); // a real date first: 2027-02-30 is named as such, under its own field
    if (typeof d !== 'string' || d < campaign.startDate || d > campaign.endDate)
      throw new InputError(
        field,
        d,
        `must be a date within the campaign's dates ${campaign.startDate} to ${campaign.endDate}`,
      );
  }
  const ids = request.siteIds ?? input.sites.map((s) => s.id);
  ids.forEach((id, k) => {
    if (!input.sites.some((s) => s.id === id))
      throw new InputError(
        `siteIds.${k}`,
        id,
        `must be one of the campaign's sites (${input.sites.map((s) => s.id).join(', ')})`,
      );
  });
  const chosen = input.sites.filter((s) => ids.includes(s.id));
  if (chosen.length === 0)
    throw new InputError('siteIds', ids, 'must name at least one of the campaign’s sites');
  if (input.targets.length === 0)
    throw new InputError('campaignId', campaignId, 'has no targets to plan');
  return { mode, weather, chosen };
}

/**
 * One site's nights of the range: those open to the plan (with their stored night, if any), those
 * skipped and why, the kept blocks it plans around, and the planned blocks it would replace.
 */
function siteNights(
  s: PlanningInput['sites'][number],
  stored: readonly NightState[],
  request: SeasonPlanRequest,
  when: { campaignId: number; mode: string; atJd: number; at: string },
  names: ReturnType<typeof plannerNames>,
) {
  const skipped: { date: string; reason: string }[] = [];
  const plannedAround: { date: string; kept: { id: number; reason: string }[] }[] = [];
  const keptByDate: Record<string, KeptBlock[]> = {};
  const dates: string[] = [];
  const open: [string, NightRow][] = [];
  const replaces: number[] = [];
  const byDate = new Map(stored.map((n) => [n.night.date, n]));
  for (let d = request.startDate; d <= request.endDate; d = addDays(d, 1)) {
    const state = byDate.get(d);
    const begun = Date.parse(nightIntervalUtc(d, s.site.timeZone).start) <= jdToUnixMs(when.atJd);
    if (!state) {
      if (when.mode === 'all' && !begun) dates.push(d);
      continue;
    }
    const reason =
      state.night.campaignId !== when.campaignId
        ? state.night.campaignId === null
          ? 'the night is stored without a campaign'
          : `the night belongs to campaign ${state.night.campaignId}`
        : state.reported
          ? 'the night has a report'
          : begun
            ? `the night began before ${when.at}`
            : null;
    if (reason) {
      skipped.push({ date: d, reason });
      continue;
    }
    dates.push(d);
    open.push([d, state.night]);
    const kept = state.blocks.filter((b) => b.kept !== null);
    if (kept.length > 0) {
      keptByDate[d] = kept.map((b) => asKeptBlock(b.block, names));
      plannedAround.push({
        date: d,
        kept: kept.map((b) => ({ id: b.block.id, reason: b.kept! })),
      });
    }
    replaces.push(...state.blocks.filter((b) => b.kept === null).map((b) => b.block.id));
  }
  return { dates, open, skipped, plannedAround, keptByDate, replaces };
}

/** The planner's targets (with their measurements where a forecast needs them) and its options. */
async function planTargets(
  db: DbOrTx,
  input: PlanningInput,
  request: SeasonPlanRequest,
  names: ReturnType<typeof plannerNames>,
  weather: string,
  chosen: PlanningInput['sites'],
) {
  const { campaign } = input;
  const last = await lastEpochs(
    db,
    campaign.id,
    input.targets.map((t) => t.id),
    nightIntervalUtc(request.startDate, chosen[0]!.site.timeZone).start,
  );
  const {
    startDate: _a,
    endDate: _b,
    siteIds: _s,
    nights: _n,
    digest: _d,
    weather: _w,
    ...asked
  } = request;
  const options = { ...campaignOptions(campaign.goals), ...asked };
  // The relativity forecast starts from the targets' measurements: the plan's report gives it for
  // every target with a relativistic term, the relativity goal and a weather-aware plan's backups
  // (season-backups.ts) read it too.
  const relativistic = (o: (typeof input.targets)[number]['target']['orbit']) =>
    !!o && (o.relativity.gravitationalRedshift || o.relativity.precession);
  const measured = await targetMeasurements(
    db,
    input.targets
      .filter((t) => options.relativityGoal || weather === 'aware' || relativistic(t.target.orbit))
      .map((t) => t.id),
  );
  const targets = seasonTargets(input.targets, campaign.goals, names, last).map((t, i) => {
    const m = measured.get(input.targets[i]!.id);
    return m ? { ...t, measurements: m } : t;
  });
  return { targets, options };
}

/** The campaign's goals as the planner's settings (the request's own settings override them). */
export function campaignOptions(goals: CampaignGoals): SeasonOptions {
  return {
    ...(goals.blockMinutes ? { blockMinutes: goals.blockMinutes } : {}),
    ...(goals.laserGuideStar ? { laserGuideStar: goals.laserGuideStar } : {}),
    ...(goals.periapsisRepeat ? { periapsisRepeat: goals.periapsisRepeat } : {}),
    ...(goals.periapsisWindowSigma ? { periapsisWindowSigma: goals.periapsisWindowSigma } : {}),
    ...(goals.coverageWithinDays ? { coverageWithinDays: goals.coverageWithinDays } : {}),
    ...(goals.precision ? { precision: goals.precision } : {}),
    ...(goals.relativityGoal !== undefined ? { relativityGoal: goals.relativityGoal } : {}),
  };
}

/** Each target with its own settings, defaulting to the campaign's. @throws InputError for a setting of a target outside the campaign. */
export function seasonTargets(
  rows: readonly { id: number; target: SeasonTarget['target'] }[],
  goals: CampaignGoals,
  names: Map<number, string>,
  last: Map<number, Partial<Record<BlockKind, number>>>,
): SeasonTarget[] {
  for (const key of Object.keys(goals.targets ?? {}))
    if (!rows.some((t) => String(t.id) === key))
      throw new InputError(
        `goals.targets.${key}`,
        key,
        `must be one of the campaign's targets (${rows.map((t) => t.id).join(', ')})`,
      );
  return rows.map((t) => {
    const own = goals.targets?.[String(t.id)] ?? {};
    return {
      target: { ...t.target, name: names.get(t.id)! },
      kinds: goals.kinds as BlockKind[],
      cadenceDays: own.cadenceDays ?? goals.cadenceDays,
      ...(goals.densifiedCadenceDays !== undefined
        ? { densifiedCadenceDays: goals.densifiedCadenceDays }
        : {}),
      ...(goals.densifyWithinDays !== undefined
        ? { densifyWithinDays: goals.densifyWithinDays }
        : {}),
      ...(own.priority !== undefined ? { priority: own.priority } : {}),
      ...(own.blockMinutes ? { blockMinutes: own.blockMinutes } : {}),
      ...(own.laserGuideStar ? { laserGuideStar: own.laserGuideStar } : {}),
      ...(own.periapsisRepeat ? { periapsisRepeat: own.periapsisRepeat } : {}),
      lastEpochJd: last.get(t.id) ?? {},
    };
  });
}

/** The season plan for a stored campaign, written nowhere. @throws InputError naming the field. */
export async function previewSeasonPlan(
  db: DbOrTx,
  campaignId: number,
  request: SeasonPlanRequest,
  atJd: number,
  run: Runner = inProcess,
): Promise<SeasonPlanPreview> {
  return (await prepare(db, campaignId, request, atJd, run)).preview;
}

/**
 * Compute the plan again inside one transaction and store it: delete the blocks it replaces,
 * create the nights it needs (`nights: "all"`), write its blocks. Any failure writes nothing.
 */
export async function acceptSeasonPlan(
  store: StoreContext,
  actor: Actor,
  campaignId: number,
  request: SeasonPlanRequest,
  atJd: number,
  clockMs: number = nowMs(),
  run: Runner = inProcess,
): Promise<SeasonPlanPreview & { written: BlockRow[]; nightsCreated: NightRow[] }> {
  requireAcceptMoment(atJd, clockMs);
  return store.db.transaction(async (tx) => {
    const { preview, siteIdByName, targetIdByName, nightByKey } = await prepare(
      tx,
      campaignId,
      request,
      atJd,
      run,
    );
    if (request.digest !== undefined && request.digest !== preview.digest) {
      throw new ConflictError(
        'stale_version',
        `the plan has changed since the preview (digest ${request.digest}, now ${preview.digest}): the ` +
          `stored campaign, its nights or the moment moved on; preview again`,
        { digest: preview.digest },
      );
    }
    for (const id of preview.replaces) await removeIn(tx, blockEntity, actor, id);
    const written: BlockRow[] = [];
    const nightsCreated: NightRow[] = [];
    for (const e of preview.plan.epochs) {
      const siteId = siteIdByName.get(e.site)!;
      let night = nightByKey.get(`${siteId}/${e.date}`);
      if (!night) {
        night = await store.nights.createIn(tx, actor, {
          siteId,
          campaignId,
          date: e.date,
          notes: 'allocated by an accepted season plan',
        });
        nightByKey.set(`${siteId}/${e.date}`, night);
        nightsCreated.push(night);
      }
      written.push(
        await store.blocks.createIn(tx, actor, {
          nightId: night.id,
          targetId: targetIdByName.get(e.target)!,
          kind: e.kind,
          startUtc: e.block.start.utc,
          endUtc: e.block.end.utc,
          laserGuideStar: e.block.laserGuideStar,
          origin: 'season-plan',
          notes: `season plan ${preview.digest} (${e.why}): ${e.reason}`,
        }),
      );
    }
    return { ...preview, written, nightsCreated };
  });
}
