/** Observing sites: where, how high, which zone, and the limits that protect people and equipment. */
import { sites } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { validateSite } from '../../science/sky/index.ts';
import { entity } from '../crud.ts';
import type { Db } from '../database.ts';
import { repository } from '../repository.ts';
import { SiteInput } from '../schemas/entities.ts';

export type SiteRow = typeof sites.$inferSelect;

export const siteEntity = entity<SiteRow>({
  name: 'site',
  table: sites,
  hasUpdatedAt: true,
  versioned: false,
  orderBy: [sites.name],
  // The sky engine's validateSite is the one gate for sites: stored sites pass it too.
  check: async (_tx, next) => {
    try {
      validateSite(next, 'site');
    } catch (err) {
      if (err instanceof InputError) throw new InputError(err.field.replace(/^site\./, ''), err.value, err.rule);
      throw err;
    }
  },
});

export function siteRepository(db: Db) {
  return repository(db, { entity: siteEntity, schema: SiteInput, keys: Object.keys(SiteInput.shape) });
}
