/**
 * The seasons a stored campaign's plan could have: the plan previewed as season-plan.ts makes it
 * (weather-aware or blind), then drawn `draws` times with each site-night lost at its learned
 * chance (site statistics), whatever the plan's own mode, so an aware and a blind plan are judged
 * against the same weather. The relativity factors use each target's stored measurements.
 */
import { inArray } from 'drizzle-orm';
import { measurements } from '../../../db/schema.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import type { DrawOptions, SeasonDraws } from '../../science/plan/season-monte-carlo.ts';
import type { DbOrTx } from '../database.ts';
import { toInput } from '../fits.ts';
import { prepare, type SeasonPlanPreview, type SeasonPlanRequest } from './season-plan.ts';

export type SeasonDrawsRequest = SeasonPlanRequest & Omit<DrawOptions, 'keepSamples'>;

export interface SeasonDrawsView {
  campaignId: number;
  at: string;
  weather: SeasonPlanPreview['weather'];
  sites: SeasonPlanPreview['sites'];
  /** The plan drawn, as its preview gives it. */
  planned: { epochs: number; digest: string };
  draws: SeasonDraws;
}

export async function seasonPlanDraws(
  db: DbOrTx,
  campaignId: number,
  request: SeasonDrawsRequest,
  atJd: number,
  run: Runner = inProcess,
): Promise<SeasonDrawsView> {
  const { draws, seed, precisionScatter, ...planRequest } = request;
  const p = await prepare(db, campaignId, planRequest, atJd, run);
  const ids = [...p.targetIdByName.values()];
  const rows = ids.length
    ? await db.select().from(measurements).where(inArray(measurements.targetId, ids))
    : [];
  const targets = p.targets.map((t) => {
    const id = p.targetIdByName.get(t.target.name);
    return { ...t, measurements: rows.filter((m) => m.targetId === id).map(toInput) };
  });
  const plan = p.preview.plan;
  const out = await run('seasonMonteCarlo', plan, p.weatherSites, targets, {
    draws,
    seed,
    ...(precisionScatter !== undefined ? { precisionScatter } : {}),
    ...(p.options.precision ? { precision: p.options.precision } : {}),
    ...(planRequest.periapsisWindowSigma !== undefined
      ? { periapsisWindowSigma: planRequest.periapsisWindowSigma }
      : {}),
    ...(planRequest.coverageWithinDays !== undefined
      ? { coverageWithinDays: planRequest.coverageWithinDays }
      : {}),
  });
  return {
    campaignId,
    at: p.preview.at,
    weather: p.preview.weather,
    sites: p.preview.sites,
    planned: { epochs: plan.epochs.length, digest: p.preview.digest },
    draws: out,
  };
}
