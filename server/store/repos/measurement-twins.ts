/**
 * Duplicate measurements. Two measurements are the same when they have the same target, kind,
 * component (the two stars of a binary may share a velocity at one epoch), epoch to the second and
 * values (the kind's quantities, their σ and correlation): storing one
 * twice would count it twice in every fit and shrink every σ. The one-row write refuses a twin of
 * a stored row; the import reports each twin row (of a stored row or of an earlier line).
 */
import { and, gt, gte, inArray, lte } from 'drizzle-orm';
import { measurements } from '../../../db/schema.ts';
import { SECONDS_PER_DAY } from '../../science/constants.ts';
import type { DbOrTx } from '../database.ts';
import { ConflictError } from '../errors.ts';
import { MEASUREMENT_VALUE_FIELDS as VALUE_FIELDS } from '../../../descriptors/measurement-kinds.ts';
import { yieldToOthers } from '../yield.ts';

/** Stored rows read per statement while twins are sought (a file's worth may be stored already). */
const PAGE = 5000;

type Row = Record<string, unknown>;

/** What makes two measurements the same, as one string. */
export function twinKey(row: Row): string {
  const second = Math.round((row.epochJd as number) * SECONDS_PER_DAY);
  return JSON.stringify([
    row.targetId,
    row.kind,
    row.component ?? 'relative',
    second,
    ...VALUE_FIELDS.map((f) => row[f] ?? null),
  ]);
}

export const TWIN_RULE = 'has the same target, kind, component, epoch (to the second) and values';

/** Stored measurements that are twins of `rows`, by key (the lowest id of each). */
export async function storedTwins(tx: DbOrTx, rows: readonly Row[]): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  if (rows.length === 0) return out;
  const targetIds = [...new Set(rows.map((r) => r.targetId as number))];
  const jds = rows.map((r) => r.epochJd as number);
  const margin = 1 / SECONDS_PER_DAY;
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (const jd of jds) {
    if (jd < lo) lo = jd;
    if (jd > hi) hi = jd;
  }
  for (let after = 0; ; ) {
    const page = await tx
      .select()
      .from(measurements)
      .where(
        and(
          gt(measurements.id, after),
          inArray(measurements.targetId, targetIds),
          gte(measurements.epochJd, lo - margin),
          lte(measurements.epochJd, hi + margin),
        ),
      )
      .orderBy(measurements.id)
      .limit(PAGE);
    for (const s of page) {
      const key = twinKey(s as Row);
      if (!out.has(key)) out.set(key, s.id);
    }
    if (page.length < PAGE) break;
    after = page[page.length - 1]!.id;
    await yieldToOthers();
  }
  return out;
}

/** Refuse (409) a measurement that repeats a stored one other than itself. */
export async function refuseStoredTwin(tx: DbOrTx, next: Row, selfId?: number): Promise<void> {
  const twin = (await storedTwins(tx, [next])).get(twinKey(next));
  if (twin !== undefined && twin !== selfId)
    throw new ConflictError('duplicate', `measurement ${twin} ${TWIN_RULE}; it is stored once`, {
      measurementId: twin,
    });
}
