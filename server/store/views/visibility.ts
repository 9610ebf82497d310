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
import { campaignEntity, campaignMembers, type CampaignRow } from '../repos/campaigns.ts';
import { systemSkyPosition, type SystemRow, type TargetRow } from '../repos/catalogue.ts';
import { nightEntity } from '../repos/nights.ts';
import { currentOrbit, type OrbitSolutionRow } from '../repos/orbits.ts';
import { siteEntity, type SiteRow } from '../repos/sites.ts';
import { campaignSite } from './planning.ts';

/** What the sky engine needs to show a stored site's sky: the site, the targets and the limits. */
export interface StoredSky {
  site: Site;
  targets: Target[];
  limits: Limits;
  /** The site runs a laser guide star: its caution goes with every night shown there. */
  laserGuideStar: boolean;
}

/** A member of a stored sky: a target, its system, and its current orbit (none: placed at its primary). */
export interface SkyMember {
  target: TargetRow;
  system: SystemRow;
  orbit?: OrbitSolutionRow['orbit'] | undefined;
}

/**
 * The sky of stored rows, however they were read (here from the database, or by the command line
 * from a server's answers): the site with the campaign's wavelength, the targets placed by their
 * systems' positions plus current orbits (by target id), under the campaign's limits and the
 * site's lowest altitude.
 */
export function skyOfRows(
  siteRow: SiteRow,
  campaign: Pick<CampaignRow, 'goals' | 'limits'> | null,
  members: readonly SkyMember[],
): StoredSky {
  const site = campaignSite(siteRow, campaign?.goals.wavelengthUm);
  const skyTargets = [...members]
    .sort((a, b) => a.target.id - b.target.id)
    .map(({ target: t, system: s, orbit }) =>
      validateTarget(
        { name: `${t.name} (${s.name})`, ...systemSkyPosition(s), ...(orbit ? { orbit } : {}) },
        `targets.${t.id}`,
      ),
    );
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

/** A stored site with a campaign's targets (or the given targets): skyOfRows over the database. */
export async function storedSky(
  db: DbOrTx,
  scope: { siteId: number; campaignId?: number | null; targetIds?: number[] },
): Promise<StoredSky> {
  const siteRow = await getById(db, siteEntity, scope.siteId);
  const campaign =
    scope.campaignId == null ? null : await getById(db, campaignEntity, scope.campaignId);
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
  const members: SkyMember[] = [];
  for (const { t, s } of rows) {
    let orbit: OrbitSolutionRow['orbit'] | undefined;
    try {
      orbit = (await currentOrbit(db, t.id)).solution.orbit;
    } catch (err) {
      if (!(err instanceof NotFoundError)) throw err; // a target without a solution is placed at its primary
    }
    members.push({ target: t, system: s, orbit });
  }
  return skyOfRows(siteRow, campaign, members);
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
