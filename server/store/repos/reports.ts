/**
 * Night reports: the conditions of a night and the outcome of each of its blocks, written
 * together, once the night is over. Writing an outcome sets the block's status (and bumps its
 * version) in the same transaction, so a block never disagrees with the report that says what
 * became of it; the status it had before is kept with the outcome, and dropping the outcome or
 * deleting the report gives it back.
 */
import { eq, gte, inArray, lte, type SQL } from 'drizzle-orm';
import { blockOutcomes, nightReports, nights } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import type { Actor } from '../audit.ts';
import { nowMs } from '../../clock.ts';
import { entity, findById, removeIn, requireRef, updateIn } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { NightReportFields, type OutcomeInput } from '../schemas/entities.ts';
import { nightPlace, timesOf } from './block-rules.ts';
import { isoSecond } from './night-times.ts';
import { blockEntity, nightEntity } from './nights.ts';
import type { z } from 'zod';

export type NightReportRow = typeof nightReports.$inferSelect;
export type OutcomeRow = typeof blockOutcomes.$inferSelect;
export type NightReportView = NightReportRow & { outcomes: OutcomeRow[] };

export const nightReportEntity = entity<NightReportRow>({
  name: 'night report',
  table: nightReports,
  hasUpdatedAt: true,
  versioned: true,
  orderBy: [nightReports.nightId],
  check: async (tx, next, previous) => {
    const night = await requireRef(tx, nightEntity, 'nightId', next.nightId);
    if (previous) return;
    const place = await nightPlace(tx, night);
    const over = timesOf(place).overMs;
    if (over > nowMs())
      throw new InputError(
        'nightId',
        next.nightId,
        `night ${night.date} at ${place.site.name} is not over until sunrise (${isoSecond(over)}` +
          `); write its report after that`,
      );
  },
});

export async function outcomesOf(db: DbOrTx, reportId: number): Promise<OutcomeRow[]> {
  return db
    .select()
    .from(blockOutcomes)
    .where(eq(blockOutcomes.reportId, reportId))
    .orderBy(blockOutcomes.blockId);
}

async function writeOutcomes(
  tx: DbOrTx,
  actor: Actor,
  report: NightReportRow,
  outcomes: z.output<typeof OutcomeInput>[],
): Promise<void> {
  const seen = new Set<number>();
  for (const [k, o] of outcomes.entries()) {
    const block = await requireRef(tx, blockEntity, `outcomes.${k}.blockId`, o.blockId);
    if (block.nightId !== report.nightId)
      throw new InputError(
        `outcomes.${k}.blockId`,
        o.blockId,
        `belongs to night ${block.nightId}, not to night ${report.nightId} of this report`,
      );
    if (seen.has(o.blockId))
      throw new InputError(`outcomes.${k}.blockId`, o.blockId, 'appears twice in outcomes');
    seen.add(o.blockId);
  }
  const before = new Map((await outcomesOf(tx, report.id)).map((o) => [o.blockId, o]));
  await tx.delete(blockOutcomes).where(eq(blockOutcomes.reportId, report.id));
  for (const o of outcomes) {
    const block = (await findById(tx, blockEntity, o.blockId))!;
    await tx.insert(blockOutcomes).values({
      reportId: report.id,
      blockId: o.blockId,
      status: o.status,
      // The status before the first report of it, kept across rewrites of the report.
      previousStatus: before.has(o.blockId) ? before.get(o.blockId)!.previousStatus : block.status,
      exposureMinutes: o.exposureMinutes ?? null,
      notes: o.notes,
    });
    if (block.status !== o.status)
      await updateIn(tx, blockEntity, actor, block.id, { status: o.status }, block.version);
  }
  // Blocks whose outcome the report no longer holds get their earlier status back.
  await restoreStatuses(
    tx,
    actor,
    [...before.values()].filter((o) => !seen.has(o.blockId)),
  );
}

/** Give each block the status it had before the report set it (`planned` for outcomes older than that record). */
async function restoreStatuses(tx: DbOrTx, actor: Actor, dropped: OutcomeRow[]): Promise<void> {
  for (const o of dropped) {
    const block = await findById(tx, blockEntity, o.blockId);
    const status = o.previousStatus ?? 'planned';
    if (block && block.status !== status)
      await updateIn(tx, blockEntity, actor, block.id, { status }, block.version);
  }
}

/** Which night reports to list: of a night, at a site, of a campaign, nights (YYYY-MM-DD) in [start, end]. */
export interface NightReportFilter {
  nightId?: number | undefined;
  siteId?: number | undefined;
  campaignId?: number | undefined;
  start?: string | undefined;
  end?: string | undefined;
}

function nightReportWhere(f: NightReportFilter, db: DbOrTx) {
  const ofNights = (cond: SQL) =>
    inArray(nightReports.nightId, db.select({ id: nights.id }).from(nights).where(cond));
  return [
    f.nightId ? eq(nightReports.nightId, f.nightId) : undefined,
    f.siteId ? ofNights(eq(nights.siteId, f.siteId)) : undefined,
    f.campaignId ? ofNights(eq(nights.campaignId, f.campaignId)) : undefined,
    f.start ? ofNights(gte(nights.date, f.start)) : undefined,
    f.end ? ofNights(lte(nights.date, f.end)) : undefined,
  ];
}

export function nightReportRepository(db: Db) {
  const keys = Object.keys(NightReportFields.shape).filter((k) => k !== 'outcomes');
  const repo = repository(db, {
    entity: nightReportEntity,
    where: nightReportWhere,
    schema: NightReportFields,
    keys,
    fixedKeys: ['nightId'],
    extraInput: async (tx, row) => ({
      outcomes: (await outcomesOf(tx, row.id)).map(
        ({ blockId, status, exposureMinutes, notes }) => ({
          blockId,
          status,
          exposureMinutes,
          notes,
        }),
      ),
    }),
    toRow: (input, actor) => {
      const row: Record<string, unknown> = { authorId: actor.userId };
      for (const k of keys) row[k] = (input as Record<string, unknown>)[k] ?? null;
      return row;
    },
    after: (tx, actor, report, input, raw) =>
      raw.outcomes === undefined
        ? Promise.resolve()
        : writeOutcomes(tx, actor, report, input.outcomes),
  });
  return {
    ...repo,
    /** Delete the report; its blocks get back the status they had before it. */
    remove: (actor: Actor, id: number) =>
      db.transaction(async (tx) => {
        const outcomes = await outcomesOf(tx, id);
        await removeIn(tx, nightReportEntity, actor, id);
        await restoreStatuses(tx, actor, outcomes);
      }),
    /** The report with the outcome of each of its blocks, as the API shows it. */
    withOutcomes: async (row: NightReportRow): Promise<NightReportView> => ({
      ...row,
      outcomes: await outcomesOf(db, row.id),
    }),
  };
}
