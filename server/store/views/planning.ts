/**
 * A stored campaign turned into the planners' inputs: its sites (with the campaign's limits),
 * its targets placed by their system and current orbit, with their last measurement. Then the
 * campaign's flags. Systems are placed at their stored position epoch with their proper motions, as in visibility.ts.
 */
import { and, eq, gte, inArray, max } from 'drizzle-orm';
import { jdToIso, parseEpoch } from '../../science/time/index.ts';
import {
  blocks,
  measurements,
  nights,
  sites as sitesTable,
  systems,
  targets as targetsTable,
} from '../../../db/schema.ts';
import type { DetectionForecast, Flag, PrecisionModel } from '../../science/plan/index.ts';
import { targetForecast } from './forecast.ts';
import {
  validateLimits,
  validateSite,
  validateTarget,
  type Limits,
  type Site,
  type Target,
} from '../../science/sky/index.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { NotFoundError } from '../errors.ts';
import { campaignEntity, campaignMembers, type CampaignRow } from '../repos/campaigns.ts';
import { systemSkyPosition } from '../repos/catalogue.ts';
import { currentOrbit } from '../repos/orbits.ts';
import { sitePrecision } from '../repos/sites.ts';

export interface CampaignPlanningInput {
  campaign: CampaignRow;
  sites: {
    id: number;
    site: Site;
    limits: Limits;
    laserGuideStar: boolean;
    /** The site's stored precision model (fields left out take the default). */
    precision: Partial<PrecisionModel>;
  }[];
  targets: { id: number; system: string; target: Target; lastMeasuredJd: number | null }[];
}

/** A stored site seen in a campaign's band: its refraction at the campaign's wavelength, when set. */
export function campaignSite(row: typeof sitesTable.$inferSelect, wavelengthUm?: number): Site {
  if (wavelengthUm === undefined) return validateSite(row, `sites.${row.id}`);
  return {
    ...validateSite({ ...row, wavelengthUm }, `sites.${row.id}`),
    wavelengthFrom: 'campaign',
  };
}

/** A stored site as the planners read it, under a campaign's limits (none: the site's own). */
export function planningSite(
  row: typeof sitesTable.$inferSelect,
  c: NonNullable<CampaignRow['limits']>,
  wavelengthUm?: number,
): CampaignPlanningInput['sites'][number] {
  const site = campaignSite(row, wavelengthUm);
  const limits = validateLimits(
    {
      ...(c.darkness ? { darkness: c.darkness } : {}),
      ...(c.highestAirmass ? { highestAirmass: c.highestAirmass } : {}),
      ...(c.leastMoonDistanceDeg !== undefined
        ? { leastMoonDistanceDeg: c.leastMoonDistanceDeg }
        : {}),
      lowestAltitudeDeg: row.lowestAltitudeDeg,
    },
    site,
    'limits',
  );
  return {
    id: row.id,
    site,
    limits,
    laserGuideStar: row.laserGuideStar,
    precision: sitePrecision(row),
  };
}

/**
 * A stored target placed on the sky: its system's position (carried by proper motion) and its
 * current orbit, if any.
 */
export async function placedTarget(
  db: DbOrTx,
  t: typeof targetsTable.$inferSelect,
  s: typeof systems.$inferSelect,
): Promise<Target> {
  let orbit: Awaited<ReturnType<typeof currentOrbit>>['solution']['orbit'] | undefined;
  try {
    orbit = (await currentOrbit(db, t.id)).solution.orbit;
  } catch (err) {
    if (!(err instanceof NotFoundError)) throw err;
  }
  return validateTarget(
    { name: t.name, ...systemSkyPosition(s), ...(orbit ? { orbit } : {}) },
    `targets.${t.id}`,
  );
}

export async function campaignPlanningInput(
  db: DbOrTx,
  campaignId: number,
): Promise<CampaignPlanningInput> {
  const campaign = await getById(db, campaignEntity, campaignId);
  const { targetIds, siteIds } = await campaignMembers(db, campaignId);
  const siteRows = siteIds.length
    ? await db.select().from(sitesTable).where(inArray(sitesTable.id, siteIds))
    : [];
  const sites = siteRows.map((row) =>
    planningSite(row, campaign.limits ?? {}, campaign.goals.wavelengthUm),
  );
  const rows = targetIds.length
    ? await db
        .select({ t: targetsTable, s: systems })
        .from(targetsTable)
        .innerJoin(systems, eq(systems.id, targetsTable.systemId))
        .where(inArray(targetsTable.id, targetIds))
    : [];
  const last = targetIds.length
    ? await db
        .select({ id: measurements.targetId, jd: max(measurements.epochJd) })
        .from(measurements)
        .where(inArray(measurements.targetId, targetIds))
        .groupBy(measurements.targetId)
    : [];
  const targets = [];
  for (const { t, s } of rows) {
    targets.push({
      id: t.id,
      system: s.name,
      target: await placedTarget(db, t, s),
      lastMeasuredJd: last.find((l) => l.id === t.id)?.jd ?? null,
    });
  }
  return { campaign, sites, targets };
}

/** The campaign's flags now (or at `nowJd`). */
export async function campaignFlags(
  db: DbOrTx,
  campaignId: number,
  options: { nowJd: number; resolutionMas?: number },
  run: Runner = inProcess,
): Promise<{ campaignId: number; flags: Flag[] }> {
  const input = await campaignPlanningInput(db, campaignId);
  const nightRows = await db
    .select({ id: nights.id, siteId: nights.siteId, date: nights.date })
    .from(nights)
    .where(eq(nights.campaignId, campaignId));
  const nowIso = jdToIso(options.nowJd);
  const planned = nightRows.length
    ? await db
        .select({
          targetId: blocks.targetId,
          nightId: blocks.nightId,
          start: blocks.startUtc,
          end: blocks.endUtc,
        })
        .from(blocks)
        .where(
          and(
            inArray(
              blocks.nightId,
              nightRows.map((n) => n.id),
            ),
            eq(blocks.status, 'planned'),
            gte(blocks.endUtc, nowIso),
          ),
        )
    : [];
  const goals = input.campaign.goals;
  const nightSite = new Map(nightRows.map((n) => [n.id, n.siteId]));
  const siteName = new Map(input.sites.map((s) => [s.id, s.site.name]));
  // The relativity forecast of each target whose orbit has the terms on (the forecast's own rules).
  const forecasts = new Map<number, DetectionForecast>();
  for (const t of input.targets) {
    const o = t.target.orbit;
    if (o?.distancePc && (o.relativity.gravitationalRedshift || o.relativity.precession))
      forecasts.set(t.id, await targetForecast(db, t.id, { atJd: options.nowJd }, run));
  }
  const flags = await run(
    'computeFlags',
    input.targets.map((t) => ({
      ...(forecasts.has(t.id) ? { forecast: forecasts.get(t.id)! } : {}),
      target: t.target,
      system: t.system,
      cadenceDays: goals.targets?.[String(t.id)]?.cadenceDays ?? goals.cadenceDays,
      lastMeasuredJd: t.lastMeasuredJd,
      planned: planned
        .filter((b) => b.targetId === t.id)
        .map((b) => ({
          jd: (parseEpoch(b.start) + parseEpoch(b.end)) / 2,
          site: siteName.get(nightSite.get(b.nightId)!) ?? '',
        })),
    })),
    input.sites.map((s) => ({
      ...s,
      nights: nightRows.filter((n) => n.siteId === s.id).map((n) => n.date),
    })),
    {
      nowJd: options.nowJd,
      leadDays: [30, 182, 365],
      ...(goals.precision ? { precision: goals.precision } : {}),
      ...(options.resolutionMas ? { resolutionMas: options.resolutionMas } : {}),
    },
  );
  return { campaignId, flags };
}
