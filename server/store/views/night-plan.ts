/**
 * A stored night's schedule: the night scheduler over the night's campaign (its targets, goal kinds
 * and limits at the night's site), previewed, edited (pin or move a block with `pins`, drop
 * one with `remove`, bring your own `candidates`), then accepted into stored blocks.
 *
 * The campaign's candidates, unless the request brings its own: the science's `nightCandidates`
 * over the campaign's per-target settings (block length, priority, laser guide star use per kind,
 * repeated epochs inside a periapsis window), the same settings the season plan reads.
 *
 * The night's stored blocks that stay (plan-scope.ts: logged, measured, made by hand, pinned, begun…)
 * are planned around: no new block overlaps one, and a candidate of the same target and kind as a
 * kept planned or obtained block is left out ("already has a kept block of this kind tonight").
 *
 * Accepting replaces the night's blocks that are still only plans and keeps the rest; it refuses,
 * writing nothing, when a new block would start before the moment of the request, when that moment
 * lies in the past, or when the night has a report. Blocks it writes record their origin and
 * whether the user pinned them (a pinned block then stays through later re-plans).
 */
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { InputError } from '../../science/errors.ts';
import {
  checkCandidates,
  nightCandidates,
  type CandidateInput,
  type KeptBlock,
  type BlockKind,
  type NightSchedule,
  type ScheduleMethod,
} from '../../science/plan/index.ts';
import { jdToIso } from '../../science/time/index.ts';
import type { Actor } from '../audit.ts';
import { getById, removeIn } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { ConflictError } from '../errors.ts';
import type { StoreContext } from '../context.ts';
import { blockEntity, nightEntity, nightIntervalUtc, type BlockRow } from '../repos/nights.ts';
import {
  asKeptBlock,
  nightStates,
  planDigest,
  plannerNames,
  requireAcceptMoment,
} from './plan-scope.ts';
import { campaignPlanningInput } from './planning.ts';
import { campaignOptions, seasonTargets } from './season-plan.ts';
import { nowMs } from '../../clock.ts';

export interface NightScheduleRequest {
  /** Candidate blocks in the night scheduler's shape; default: the campaign's (see above). */
  candidates?: unknown;
  /** Keep (or move) blocks at a start: [{ id, start }]. */
  pins?: unknown;
  /** Candidate ids to leave out. */
  remove?: unknown;
  slotMinutes?: number;
  slewMinutes?: number;
  sameTargetMinutes?: number;
  method?: ScheduleMethod;
  /** Length of the campaign's default candidates per kind, minutes. */
  blockMinutes?: Partial<Record<BlockKind, number>>;
  /** The preview's digest: accept refuses (409) when the schedule would now come out differently. */
  digest?: string;
}

export interface NightSchedulePreview {
  nightId: number;
  campaignId: number;
  at: string;
  candidatesFrom: 'campaign' | 'request';
  candidates: CandidateInput[];
  schedule: NightSchedule;
  /** Stored blocks accepting would delete (all still only plans), and those it keeps with the reason. */
  replaces: number[];
  kept: { id: number; reason: string }[];
  digest: string;
}

async function prepare(
  db: DbOrTx,
  nightId: number,
  request: NightScheduleRequest,
  atJd: number,
  run: Runner,
) {
  const at = jdToIso(atJd);
  const night = await getById(db, nightEntity, nightId);
  if (night.campaignId === null)
    throw new InputError(
      'nightId',
      nightId,
      'is stored without a campaign: give the night a campaignId so its targets and limits are known',
    );
  const input = await campaignPlanningInput(db, night.campaignId);
  const site = input.sites.find((s) => s.id === night.siteId);
  if (!site)
    throw new InputError(
      'nightId',
      nightId,
      `is at site ${night.siteId}, which is not one of the sites of campaign ${night.campaignId}`,
    );
  const names = plannerNames(input.targets);
  const targets = input.targets.map((t) => ({ ...t.target, name: names.get(t.id)! }));
  const [state] = await nightStates(db, { nightIds: [nightId] }, at);
  const keptBlocks = state!.blocks.filter((b) => b.kept !== null);
  const kept: KeptBlock[] = keptBlocks.map(({ block }) => asKeptBlock(block, names));
  const fromCampaign = request.candidates === undefined;
  const candidates = fromCampaign
    ? campaignCandidates(input, site, night.date, names, request)
    : requestCandidates(request.candidates, targets);
  const schedule = await run('scheduleNight', site.site, site.limits, night.date, targets, {
    candidates,
    pins: request.pins,
    remove: request.remove,
    kept,
    ...(request.slotMinutes !== undefined ? { slotMinutes: request.slotMinutes } : {}),
    ...(request.slewMinutes !== undefined ? { slewMinutes: request.slewMinutes } : {}),
    ...(request.sameTargetMinutes !== undefined
      ? { sameTargetMinutes: request.sameTargetMinutes }
      : {}),
    ...(request.method !== undefined ? { method: request.method } : {}),
  });
  const replaces = state!.blocks.filter((b) => b.kept === null).map((b) => b.block.id);
  const digest = planDigest({
    blocks: schedule.blocks.map((b) => [b.id, b.target, b.kind, b.start.utc, b.end.utc]),
    replaces,
  });
  const preview: NightSchedulePreview = {
    nightId,
    campaignId: night.campaignId,
    at,
    candidatesFrom: fromCampaign ? 'campaign' : 'request',
    candidates,
    schedule,
    replaces,
    kept: keptBlocks.map((b) => ({ id: b.block.id, reason: b.kept! })),
    digest,
  };
  return {
    preview,
    reported: state!.reported,
    targetIdByName: new Map(input.targets.map((t) => [names.get(t.id)!, t.id])),
  };
}

type PlanningInput = Awaited<ReturnType<typeof campaignPlanningInput>>;

/** The request's candidates as the scheduler reads them (it checks them again: the same errors). */
function requestCandidates(
  input: unknown,
  targets: Parameters<typeof checkCandidates>[1],
): CandidateInput[] {
  return checkCandidates(input, targets).map((c) => ({
    id: c.id,
    target: c.targetName,
    kind: c.kind,
    durationMinutes: c.durationMinutes,
    priority: c.priority,
    ...(c.highestAirmass === null ? {} : { highestAirmass: c.highestAirmass }),
    laserGuideStar: c.laserGuideStar,
    ...(Number.isFinite(c.earliestJd) ? { earliestStart: jdToIso(c.earliestJd) } : {}),
    ...(Number.isFinite(c.latestJd) ? { latestEnd: jdToIso(c.latestJd) } : {}),
  }));
}

/** The night's default candidates from the campaign's per-target settings (the season plan's). */
function campaignCandidates(
  input: PlanningInput,
  site: PlanningInput['sites'][number],
  date: string,
  names: Map<number, string>,
  request: NightScheduleRequest,
): CandidateInput[] {
  const last = new Map<number, Partial<Record<BlockKind, number>>>();
  const seasonal = seasonTargets(input.targets, input.campaign.goals, names, last);
  const options = {
    ...campaignOptions(input.campaign.goals),
    ...(request.blockMinutes ? { blockMinutes: request.blockMinutes } : {}),
    ...(request.sameTargetMinutes !== undefined
      ? { sameTargetMinutes: request.sameTargetMinutes }
      : {}),
  };
  return nightCandidates(site.site, site.limits, site.laserGuideStar, date, seasonal, options);
}

/** The schedule of a stored night, written nowhere. @throws InputError naming the field. */
export async function previewNightSchedule(
  db: DbOrTx,
  nightId: number,
  request: NightScheduleRequest,
  atJd: number,
  run: Runner = inProcess,
): Promise<NightSchedulePreview> {
  return (await prepare(db, nightId, request, atJd, run)).preview;
}

/** Compute the schedule again inside one transaction and store it in place of the night's planned blocks. */
export async function acceptNightSchedule(
  store: StoreContext,
  actor: Actor,
  nightId: number,
  request: NightScheduleRequest,
  atJd: number,
  clockMs: number = nowMs(),
  run: Runner = inProcess,
): Promise<NightSchedulePreview & { written: BlockRow[] }> {
  requireAcceptMoment(atJd, clockMs);
  return store.db.transaction(async (tx) => {
    const { preview, reported, targetIdByName } = await prepare(tx, nightId, request, atJd, run);
    if (request.digest !== undefined && request.digest !== preview.digest) {
      throw new ConflictError(
        'stale_version',
        `the schedule has changed since the preview (digest ${request.digest}, now ${preview.digest}); preview again`,
        { digest: preview.digest },
      );
    }
    if (reported)
      throw new ConflictError(
        'not_allowed',
        `night ${nightId} has a report: its blocks are a record now, not a plan`,
      );
    const { date, timeZone } = preview.schedule;
    if (Date.parse(nightIntervalUtc(date, timeZone).end) <= Date.parse(preview.at))
      throw new ConflictError(
        'not_allowed',
        `night ${nightId} (${date}) has ended: a schedule plans what is still ahead; record what ran as ` +
          `blocks by hand, each with its outcome and real start and end, then the night's report`,
      );
    for (const b of preview.schedule.blocks) {
      if (Date.parse(b.start.utc) <= Date.parse(preview.at)) {
        throw new ConflictError(
          'not_allowed',
          `block ${b.id} would start at ${b.start.utc}, not after ${preview.at}: pin it later or remove it`,
          { block: b.id },
        );
      }
    }
    for (const id of preview.replaces) await removeIn(tx, blockEntity, actor, id);
    const written: BlockRow[] = [];
    for (const b of preview.schedule.blocks) {
      written.push(
        await store.blocks.createIn(tx, actor, {
          nightId,
          targetId: targetIdByName.get(b.target)!,
          kind: b.kind,
          startUtc: b.start.utc,
          endUtc: b.end.utc,
          laserGuideStar: b.laserGuideStar,
          origin: 'night-schedule',
          pinned: b.pinned,
          notes: `night schedule ${preview.digest}: ${b.id}${b.pinned ? ' (pinned)' : ''}`,
        }),
      );
    }
    return { ...preview, written };
  });
}
