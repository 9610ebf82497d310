/**
 * A stored site's statistics: every night report of the site (any campaign) with its darkness,
 * its clear-night priors, and the measurements made there with the seeing of their night and the
 * airmass of their target at the epoch; combined by the science layer's `siteStatistics`.
 */
import { and, eq, gte, lte } from 'drizzle-orm';
import {
  blocks,
  measurements,
  nightReports,
  nights,
  systems,
  targets,
} from '../../../db/schema.ts';
import { MEASUREMENT_KINDS } from '../../../descriptors/measurement-kinds.ts';
import {
  siteStatistics,
  type AchievedMeasurement,
  type LoggedNight,
  type SiteStatistics,
} from '../../science/plan/site-statistics.ts';
import { airmassAt, darkHoursOf } from '../../science/plan/site-log.ts';
import { validateSite, validateTarget, type Site, type Target } from '../../science/sky/index.ts';
import { parseNightDate } from '../../science/sky/night.ts';
import { getById } from '../crud.ts';
import type { DbOrTx } from '../database.ts';
import { systemSkyPosition } from '../repos/catalogue.ts';
import { clearPriorOf, type ClearPriorView } from '../repos/clear-priors.ts';
import { siteEntity } from '../repos/sites.ts';

export interface SiteStatisticsView extends SiteStatistics {
  siteId: number;
  site: string;
  /** The range of night dates read (null: unbounded). */
  start: string | null;
  end: string | null;
  priors: ClearPriorView['months'];
}

/** The 1σ of a measurement in its block kind's unit: the RMS of its mas or km/s σ's. */
function sigmaOf(row: typeof measurements.$inferSelect): number | null {
  const d = MEASUREMENT_KINDS[row.kind];
  const s = d.values
    .filter((v) => v.unit !== 'deg')
    .map((v) => (row as unknown as Record<string, number | null>)[v.sigma] ?? null)
    .filter((x): x is number => x !== null && x > 0);
  return s.length ? Math.sqrt(s.reduce((a, x) => a + x * x, 0) / s.length) : null;
}

export async function siteStatisticsView(
  db: DbOrTx,
  siteId: number,
  range: { start?: string | undefined; end?: string | undefined } = {},
): Promise<SiteStatisticsView> {
  const row = await getById(db, siteEntity, siteId);
  if (range.start) parseNightDate(range.start, 'start');
  if (range.end) parseNightDate(range.end, 'end');
  const site = validateSite(row, 'site');
  const inRange = and(
    eq(nights.siteId, siteId),
    range.start ? gte(nights.date, range.start) : undefined,
    range.end ? lte(nights.date, range.end) : undefined,
  );
  const reports = await db
    .select({ date: nights.date, r: nightReports })
    .from(nightReports)
    .innerJoin(nights, eq(nights.id, nightReports.nightId))
    .where(inRange)
    .orderBy(nights.date);
  const logged: LoggedNight[] = reports.map(({ date, r }) => ({
    date,
    darkHours: darkHoursOf(site, date),
    lostHours: r.timeLostHours,
    lostReason: r.timeLostReason,
    seeingArcsec: r.seeingArcsec,
    strehlRatio: r.strehlRatio,
  }));
  const made = await db
    .select({ m: measurements, seeing: nightReports.seeingArcsec, s: systems, name: targets.name })
    .from(measurements)
    .innerJoin(blocks, eq(blocks.id, measurements.blockId))
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .leftJoin(nightReports, eq(nightReports.nightId, nights.id))
    .innerJoin(targets, eq(targets.id, measurements.targetId))
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(inRange);
  const skyOf = new Map<number, Target>();
  const achieved: AchievedMeasurement[] = [];
  for (const { m, seeing, s, name } of made) {
    const sigma = sigmaOf(m);
    if (sigma === null) continue;
    let target = skyOf.get(s.id);
    if (!target) {
      target = validateTarget({ name, ...systemSkyPosition(s) }, `systems.${s.id}`);
      skyOf.set(s.id, target);
    }
    // The primary's position stands for the star's: at airmass X the airmass changes by
    // sec z · tan z per radian, 3.5 at X = 2, so even a 0.6″ offset (the demo binary's orbit; stars
    // at a galactic nucleus sit within ~0.1″) moves X by < 1e-5, four decades below the bins' width.
    achieved.push({
      instrument: m.instrument,
      kind: MEASUREMENT_KINDS[m.kind].blockKind,
      sigma,
      seeingArcsec: seeing,
      airmass: airmassAt(site as Site, target, m.epochJd),
    });
  }
  const priors = (await clearPriorOf(db, siteId)).months;
  return {
    siteId,
    site: row.name,
    start: range.start ?? null,
    end: range.end ?? null,
    priors,
    ...siteStatistics(logged, priors, achieved),
  };
}
