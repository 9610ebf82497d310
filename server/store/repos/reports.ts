/**
 * Night reports: the conditions of a night and the outcome of each of its blocks, written
 * together. Writing an outcome sets the block's status (and bumps its version) in the same
 * transaction, so a block never disagrees with the report that says what became of it.
 */
import { eq } from 'drizzle-orm';
import { blockOutcomes, nightReports } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import type { Actor } from '../audit.ts';
import { entity, findById, requireRef, updateIn } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { repository } from '../repository.ts';
import { NightReportInput, type OutcomeInput } from '../schemas/entities.ts';
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
  check: async (tx, next) => {
    await requireRef(tx, nightEntity, 'nightId', next.nightId);
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
  await tx.delete(blockOutcomes).where(eq(blockOutcomes.reportId, report.id));
  for (const o of outcomes) {
    await tx.insert(blockOutcomes).values({
      reportId: report.id,
      blockId: o.blockId,
      status: o.status,
      exposureMinutes: o.exposureMinutes ?? null,
      notes: o.notes,
    });
    const block = (await findById(tx, blockEntity, o.blockId))!;
    if (block.status !== o.status)
      await updateIn(tx, blockEntity, actor, block.id, { status: o.status }, block.version);
  }
}

export function nightReportRepository(db: Db) {
  const keys = Object.keys(NightReportInput.shape).filter((k) => k !== 'outcomes');
  return repository(db, {
    entity: nightReportEntity,
    schema: NightReportInput,
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
}
