/**
 * Re-plan after a lost night: when a night's report records lost time, the rest of its campaign's
 * season is planned again in one action, preview first. It is the season plan of the campaign's
 * allocated nights from the night after the lost one (or from the day before the moment of
 * planning, whichever is later) to the campaign's end (at most 400 nights), weather-aware by
 * default, with the season plan's own safety rules: only blocks that are still plans are replaced,
 * obtained, logged, measured, begun, hand-made and pinned blocks stay, and accepting recomputes
 * inside one transaction with the preview's digest.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { blocks, nightReports, targets } from '../../../db/schema.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { InputError } from '../../science/errors.ts';
import { addDays } from '../../science/sky/night.ts';
import { jdToIso } from '../../science/time/index.ts';
import type { Actor } from '../audit.ts';
import type { StoreContext } from '../context.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { campaignEntity } from '../repos/campaigns.ts';
import { nightEntity } from '../repos/nights.ts';
import { nowMs } from '../../clock.ts';
import {
  acceptSeasonPlan,
  DEFAULT_WEATHER,
  previewSeasonPlan,
  type SeasonPlanPreview,
  type SeasonPlanRequest,
  type WeatherChoice,
} from './season-plan.ts';

export interface ReplanRequest {
  /** Last night to plan (local evening date); default the campaign's last, at most 400 nights on. */
  endDate?: string;
  weather?: SeasonPlanRequest['weather'];
  digest?: string;
}

export interface ReplanPreview {
  night: { id: number; date: string; siteId: number; timeLostHours: number; reason: string };
  /** The night's blocks that were lost or only partly obtained. */
  lost: { blockId: number; target: string; kind: string; status: string }[];
  /** The season plan request the re-plan makes. */
  request: { startDate: string; endDate: string; weather: WeatherChoice };
  preview: SeasonPlanPreview;
}

async function replanRequest(
  db: DbOrTx,
  nightId: number,
  request: ReplanRequest,
  atJd: number,
): Promise<Omit<ReplanPreview, 'preview'> & { campaignId: number; digest?: string }> {
  const night = await getById(db, nightEntity, nightId);
  if (night.campaignId === null)
    throw new InputError('nightId', nightId, 'belongs to no campaign: there is no plan to redo');
  const [report] = await db.select().from(nightReports).where(eq(nightReports.nightId, nightId));
  const rows = await db
    .select({ id: blocks.id, status: blocks.status, kind: blocks.kind, target: targets.name })
    .from(blocks)
    .innerJoin(targets, eq(targets.id, blocks.targetId))
    .where(and(eq(blocks.nightId, nightId), inArray(blocks.status, ['lost', 'partial'])));
  if (!report || (!(report.timeLostHours > 0) && rows.length === 0))
    throw new InputError(
      'nightId',
      nightId,
      report
        ? 'has a report with no time lost and no block lost: nothing to re-plan after'
        : 'has no night report yet: write it (with the time lost) first',
    );
  const campaign = await getById(db, campaignEntity, night.campaignId);
  const dayBefore = addDays(jdToIso(atJd).slice(0, 10), -1);
  const after = addDays(night.date, 1);
  const startDate = [after, dayBefore].sort()[1]!; // the later of the two dates
  if (startDate > campaign.endDate)
    throw new InputError(
      'nightId',
      nightId,
      `is the campaign's last night or later (${campaign.endDate}): no nights are left to plan`,
    );
  const last = addDays(startDate, 399);
  const endDate = request.endDate ?? [campaign.endDate, last].sort()[0]!; // the earlier
  return {
    campaignId: night.campaignId,
    night: {
      id: night.id,
      date: night.date,
      siteId: night.siteId,
      timeLostHours: report.timeLostHours,
      reason: report.timeLostReason,
    },
    lost: rows.map((r) => ({ blockId: r.id, target: r.target, kind: r.kind, status: r.status })),
    request: { startDate, endDate, weather: request.weather ?? DEFAULT_WEATHER },
    ...(request.digest !== undefined ? { digest: request.digest } : {}),
  };
}

/** The rest of the season planned again after a lost night, written nowhere. */
export async function previewReplan(
  db: DbOrTx,
  nightId: number,
  request: ReplanRequest,
  atJd: number,
  run: Runner = inProcess,
): Promise<ReplanPreview> {
  const { campaignId, digest: _d, ...r } = await replanRequest(db, nightId, request, atJd);
  const preview = await previewSeasonPlan(db, campaignId, r.request, atJd, run);
  return { ...r, preview };
}

/** The same re-plan computed again and stored (the season plan's accept: all or nothing). */
export async function acceptReplan(
  store: StoreContext,
  actor: Actor,
  nightId: number,
  request: ReplanRequest,
  atJd: number,
  clockMs: number = nowMs(),
  run: Runner = inProcess,
) {
  const { campaignId, digest, ...r } = await replanRequest(store.db, nightId, request, atJd);
  const accepted = await acceptSeasonPlan(
    store,
    actor,
    campaignId,
    { ...r.request, ...(digest !== undefined ? { digest } : {}) },
    atJd,
    clockMs,
    run,
  );
  const { written, nightsCreated, ...preview } = accepted;
  return { ...r, preview, written, nightsCreated };
}
