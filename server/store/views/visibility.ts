/**
 * A stored night's visibility: the sky engine's night report for the night's site, for the
 * campaign's targets (or, without a campaign, the targets of the night's blocks), each placed by
 * its system's position (ICRS at the system's position epoch, carried by its proper motion) plus its
 * current orbit, under the campaign's limits and the site's stored horizon mask.
 */
import { eq, inArray } from 'drizzle-orm';
import { blocks, systems, targets } from '../../../db/schema.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import {
  validateLimits,
  validateTarget,
  type Limits,
  type NightReport,
  type Site,
  type Target,
} from '../../science/sky/index.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { NotFoundError } from '../errors.ts';
import { campaignEntity, campaignMembers } from '../repos/campaigns.ts';
import { systemSkyPosition } from '../repos/catalogue.ts';
import { nightEntity } from '../repos/nights.ts';
import { currentOrbit } from '../repos/orbits.ts';
import { siteEntity } from '../repos/sites.ts';
import { campaignSite } from './planning.ts';

/** What the sky engine needs to show a stored site's sky: the site, the targets and the limits. */
export interface StoredSky {
  site: Site;
  targets: Target[];
  limits: Limits;
  /** The site runs a laser guide star: its caution goes with every night shown there. */
  laserGuideStar: boolean;
}

/**
 * A stored site with a campaign's targets (or the given targets) placed by their systems'
 * positions plus current orbits, under the campaign's limits and the site's lowest altitude.
 */
export async function storedSky(
  db: DbOrTx,
  scope: { siteId: number; campaignId?: number | null; targetIds?: number[] },
): Promise<StoredSky> {
  const siteRow = await getById(db, siteEntity, scope.siteId);
  const campaign =
    scope.campaignId == null ? null : await getById(db, campaignEntity, scope.campaignId);
  const site = campaignSite(siteRow, campaign?.goals.wavelengthUm);
  const targetIds = campaign
    ? (await campaignMembers(db, campaign.id)).targetIds
    : (scope.targetIds ?? []);
  const rows =
    targetIds.length === 0
      ? []
      : await db
          .select({ t: targets, s: systems })
          .from(targets)
          .innerJoin(systems, eq(systems.id, targets.systemId))
          .where(inArray(targets.id, targetIds));
  const skyTargets: Target[] = [];
  for (const { t, s } of rows) {
    let orbit: Awaited<ReturnType<typeof currentOrbit>>['solution']['orbit'] | undefined;
    try {
      orbit = (await currentOrbit(db, t.id)).solution.orbit;
    } catch (err) {
      if (!(err instanceof NotFoundError)) throw err; // a target without a solution is placed at its primary
    }
    skyTargets.push(
      validateTarget(
        { name: `${t.name} (${s.name})`, ...systemSkyPosition(s), ...(orbit ? { orbit } : {}) },
        `targets.${t.id}`,
      ),
    );
  }
  const c = campaign?.limits ?? {};
  const limits = validateLimits(
    {
      ...(c.darkness ? { darkness: c.darkness } : {}),
      ...(c.highestAirmass ? { highestAirmass: c.highestAirmass } : {}),
      ...(c.leastMoonDistanceDeg !== undefined
        ? { leastMoonDistanceDeg: c.leastMoonDistanceDeg }
        : {}),
      lowestAltitudeDeg: siteRow.lowestAltitudeDeg,
    },
    site,
    'limits',
  );
  return { site, targets: skyTargets, limits, laserGuideStar: siteRow.laserGuideStar };
}

export async function nightVisibility(
  db: DbOrTx,
  nightId: number,
  options: { curves?: boolean } = {},
  run: Runner = inProcess,
): Promise<NightReport & { nightId: number; campaignId: number | null }> {
  const night = await getById(db, nightEntity, nightId);
  const blockTargets =
    night.campaignId === null
      ? [
          ...new Set(
            (
              await db
                .select({ id: blocks.targetId })
                .from(blocks)
                .where(eq(blocks.nightId, nightId))
            ).map((r) => r.id),
          ),
        ]
      : [];
  const sky = await storedSky(db, {
    siteId: night.siteId,
    campaignId: night.campaignId,
    targetIds: blockTargets,
  });
  const report = await run('nightReport', sky.site, night.date, sky.targets, sky.limits, {
    curveStepMinutes: options.curves ? 10 : 0,
  });
  if (sky.laserGuideStar) report.cautions.push(LASER_GUIDE_STAR_CAUTION);
  return { nightId, campaignId: night.campaignId, ...report };
}
