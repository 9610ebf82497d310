/** Observing sites: where, how high, which zone, and the limits that protect people and equipment. */
import { eq } from 'drizzle-orm';
import { nights, sites } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import type { PrecisionModel } from '../../science/plan/index.ts';
import { validateSite, type Site } from '../../science/sky/index.ts';
import { entity } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { SiteFields } from '../schemas/entities.ts';
import { checkBlocksUnder } from './block-rules.ts';

export type SiteRow = typeof sites.$inferSelect;

/**
 * The sky engine's validateSite is the one gate for sites: stored sites pass it too. Fields are
 * named as in the store.
 */
function skySite(values: Record<string, unknown>): Site {
  try {
    return validateSite(values, 'site');
  } catch (err) {
    if (err instanceof InputError)
      throw new InputError(err.field.replace(/^site\./, ''), err.value, err.rule);
    throw err;
  }
}

/** The site's stored precision model, as the planner layers it (an absent field takes the default). */
export function sitePrecision(
  row: Pick<SiteRow, 'astrometrySigmaMas' | 'spectroscopySigmaKmS' | 'referenceSeeingArcsec'>,
): Partial<PrecisionModel> {
  return {
    ...(row.astrometrySigmaMas !== null ? { astrometryMas: row.astrometrySigmaMas } : {}),
    ...(row.spectroscopySigmaKmS !== null ? { spectroscopyKmS: row.spectroscopySigmaKmS } : {}),
    ...(row.referenceSeeingArcsec !== null
      ? { referenceSeeingArcsec: row.referenceSeeingArcsec }
      : {}),
  };
}

export const siteEntity = entity<SiteRow>({
  name: 'site',
  table: sites,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [sites.name],
  check: async (tx, next, previous) => {
    skySite(next);
    // A site moved or put in another zone moves its nights: its blocks are judged again there.
    const moved = (['timeZone', 'latitudeDeg', 'longitudeDeg', 'elevationM'] as const).find(
      (k) => previous && next[k] !== previous[k],
    );
    if (!previous || !moved) return;
    const ofSite = await tx.select().from(nights).where(eq(nights.siteId, previous.id));
    await checkBlocksUnder(
      tx,
      ofSite,
      { site: { ...(next as SiteRow), id: previous.id } },
      moved,
      next[moved],
    );
  },
});

export function siteRepository(db: Db) {
  return repository(db, {
    entity: siteEntity,
    schema: SiteFields,
    keys: Object.keys(SiteFields.shape),
    // The mask is stored as the sky engine reads it: checked point by point (indices as sent), then in azimuth order.
    toRow: (input) => ({ ...input, horizonMask: skySite(input).horizonMask }),
  });
}
