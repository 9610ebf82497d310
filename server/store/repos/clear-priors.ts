/**
 * A site's clear-night prior per calendar month (migration 0007): read as twelve entries (null where
 * none is stored) and replaced whole in one transaction with its audit entry, so a half-written
 * set never exists. The rule for a month's values is the science layer's (`checkPrior`).
 */
import { eq } from 'drizzle-orm';
import { siteClearPriors } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { checkPrior, type ClearPrior } from '../../science/plan/site-statistics.ts';
import { recordAudit, type Actor } from '../audit.ts';
import { getById } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { nowIso } from '../../clock.ts';
import { siteEntity } from './sites.ts';

export interface MonthPrior extends ClearPrior {
  /** Calendar month, 1–12. */
  month: number;
}

export interface ClearPriorView {
  siteId: number;
  /** One entry per calendar month, January first; null where the site has no prior. */
  months: (MonthPrior | null)[];
}

export async function clearPriorOf(db: DbOrTx, siteId: number): Promise<ClearPriorView> {
  await getById(db, siteEntity, siteId);
  const rows = await db.select().from(siteClearPriors).where(eq(siteClearPriors.siteId, siteId));
  const months: (MonthPrior | null)[] = Array.from({ length: 12 }, () => null);
  for (const r of rows)
    months[r.month - 1] = {
      month: r.month,
      clearFraction: r.clearFraction,
      strengthNights: r.strengthNights,
    };
  return { siteId, months };
}

/** Check a whole set: months 1–12, each at most once, values by `checkPrior`. @throws InputError. */
export function checkMonthPriors(input: readonly MonthPrior[]): MonthPrior[] {
  if (!Array.isArray(input) || input.length > 12)
    throw new InputError('months', input, 'must list at most 12 months');
  const seen = new Set<number>();
  return input.map((m, i) => {
    if (!Number.isInteger(m.month) || m.month < 1 || m.month > 12)
      throw new InputError(`months.${i}.month`, m.month, 'must be a whole month number 1–12');
    if (seen.has(m.month))
      throw new InputError(`months.${i}.month`, m.month, 'is given by an earlier entry');
    seen.add(m.month);
    checkPrior(`months.${i}`, m);
    return { month: m.month, clearFraction: m.clearFraction, strengthNights: m.strengthNights };
  });
}

/** Replace the site's priors with `months` inside an open transaction (an empty list clears them). */
export async function replaceClearPriorIn(
  tx: DbOrTx,
  actor: Actor,
  siteId: number,
  months: readonly MonthPrior[],
): Promise<void> {
  const checked = checkMonthPriors(months);
  await getById(tx, siteEntity, siteId);
  await tx.delete(siteClearPriors).where(eq(siteClearPriors.siteId, siteId));
  const at = nowIso();
  if (checked.length)
    await tx.insert(siteClearPriors).values(checked.map((m) => ({ siteId, ...m, updatedAt: at })));
  await recordAudit(tx, actor, 'update', 'site clear prior', siteId, { months: checked });
}

/** Replace the site's priors in one transaction of its own. */
export async function replaceClearPrior(
  db: Db,
  actor: Actor,
  siteId: number,
  months: readonly MonthPrior[],
): Promise<ClearPriorView> {
  checkMonthPriors(months);
  await db.transaction((tx) => replaceClearPriorIn(tx, actor, siteId, months));
  return clearPriorOf(db, siteId);
}
