/**
 * What an accepted plan may overwrite. The rule (the same for the season plan and the night
 * schedule): a stored block is replaceable while it is still only a plan that a plan made —
 * status `planned`, no outcome, no measurement tied to it, on a night without a report, written by
 * an accepted plan and not pinned by a person, starting after the moment of the request. Anything
 * else (obtained, partial, lost, withdrawn, logged, measured, made by hand, pinned, begun) is kept.
 *
 * The moment of an accept may not lie in the past (beyond a small allowance for clock skew), so a
 * plan cannot reach back and replace blocks that have in fact begun; a preview may be made as of
 * any moment, since it writes nothing.
 */
import { createHash } from 'node:crypto';
import { and, eq, gte, inArray, lte, max } from 'drizzle-orm';
import { blockOutcomes, blocks, measurements, nightReports, nights } from '../../../db/schema.ts';
import { describeKind } from '../../../descriptors/measurement-kinds.ts';
import type { KeptBlock, BlockKind } from '../../science/plan/index.ts';
import { InputError } from '../../science/errors.ts';
import { jdToIso, jdToUnixMs, unixMsToJd } from '../../science/time/index.ts';
import type { DbOrTx } from '../database.ts';
import type { BlockRow, NightRow } from '../repos/nights.ts';
import { nowMs } from '../../clock.ts';

export interface BlockState {
  block: BlockRow;
  /** Why the block must stay; null when a plan may replace it. */
  kept: string | null;
}

export interface NightState {
  night: NightRow;
  reported: boolean;
  blocks: BlockState[];
}

/** Why a block stays, or null when it is still only a plan. */
export function keptBecause(
  b: BlockRow,
  reported: boolean,
  hasOutcome: boolean,
  hasMeasurement: boolean,
  atIso: string,
): string | null {
  if (b.status !== 'planned') return `its status is ${b.status}`;
  if (reported || hasOutcome) return 'its night has a report';
  if (hasMeasurement) return 'a measurement is tied to it';
  if (b.pinned) return 'a person pinned it';
  if (b.origin === 'by-hand') return 'it was made by hand';
  if (Date.parse(b.startUtc) <= Date.parse(atIso))
    return `it started at ${b.startUtc}, not after ${atIso}`;
  return null;
}

/**
 * How far before the server's clock an accept's `at` may lie: clock skew between a client and the
 * server, not more (common practice, no source).
 */
export const ACCEPT_AT_TOLERANCE_MINUTES = 2;

/**
 * Refuse an accept whose moment lies before the server's clock (less the tolerance): blocks begun
 * since then would be replaced.
 */
export function requireAcceptMoment(atJd: number, clockMs: number = nowMs()): void {
  const earliest = clockMs - ACCEPT_AT_TOLERANCE_MINUTES * 60_000;
  if (jdToUnixMs(atJd) < earliest) {
    throw new InputError(
      'at',
      jdToIso(atJd),
      `must not be earlier than the server's clock less ${ACCEPT_AT_TOLERANCE_MINUTES} min ` +
        `(${new Date(earliest).toISOString()}) when accepting: a plan may not replace blocks ` +
        `that have begun; preview as of a past moment instead, or leave "at" out`,
    );
  }
}

/** Stored nights at the given sites from `from` to `to` (any campaign), with their blocks judged at `atIso`. */
export async function nightStates(
  db: DbOrTx,
  where: { siteIds: number[]; from: string; to: string } | { nightIds: number[] },
  atIso: string,
): Promise<NightState[]> {
  const cond =
    'nightIds' in where
      ? inArray(nights.id, where.nightIds)
      : and(
          inArray(nights.siteId, where.siteIds),
          gte(nights.date, where.from),
          lte(nights.date, where.to),
        );
  const rows = await db.select().from(nights).where(cond).orderBy(nights.date, nights.siteId);
  if (rows.length === 0) return [];
  const ids = rows.map((n) => n.id);
  const reported = new Set(
    (
      await db
        .select({ id: nightReports.nightId })
        .from(nightReports)
        .where(inArray(nightReports.nightId, ids))
    ).map((r) => r.id),
  );
  const blockRows = await db
    .select()
    .from(blocks)
    .where(inArray(blocks.nightId, ids))
    .orderBy(blocks.startUtc);
  const blockIds = blockRows.map((b) => b.id);
  const withOutcome = new Set(
    blockIds.length
      ? (
          await db
            .select({ id: blockOutcomes.blockId })
            .from(blockOutcomes)
            .where(inArray(blockOutcomes.blockId, blockIds))
        ).map((r) => r.id)
      : [],
  );
  const measured = new Set(
    blockIds.length
      ? (
          await db
            .select({ id: measurements.blockId })
            .from(measurements)
            .where(inArray(measurements.blockId, blockIds))
        ).map((r) => r.id)
      : [],
  );
  return rows.map((night) => ({
    night,
    reported: reported.has(night.id),
    blocks: blockRows
      .filter((b) => b.nightId === night.id)
      .map((block) => ({
        block,
        kept: keptBecause(
          block,
          reported.has(night.id),
          withOutcome.has(block.id),
          measured.has(block.id),
          atIso,
        ),
      })),
  }));
}

/** A kept stored block as the planners see it (`names`: the planners' target names by id; another target is null). */
export function asKeptBlock(b: BlockRow, names: ReadonlyMap<number, string>): KeptBlock {
  return {
    label: `block ${b.id}`,
    target: names.get(b.targetId) ?? null,
    kind: b.kind,
    startJd: unixMsToJd(Date.parse(b.startUtc)),
    endJd: unixMsToJd(Date.parse(b.endUtc)),
    counts: b.status === 'planned' || b.status === 'obtained' || b.status === 'partial',
    obtained: b.status === 'obtained' || b.status === 'partial',
  };
}

/**
 * The latest epoch of each kind per target before `beforeIso`: measurements, and blocks of the
 * campaign that were obtained or are still planned (a planned epoch counts as one to come).
 */
export async function lastEpochs(
  db: DbOrTx,
  campaignId: number,
  targetIds: number[],
  beforeIso: string,
): Promise<Map<number, Partial<Record<BlockKind, number>>>> {
  const out = new Map<number, Partial<Record<BlockKind, number>>>();
  const note = (target: number, kind: BlockKind, jd: number) => {
    const m = out.get(target) ?? {};
    if (m[kind] === undefined || jd > m[kind]!) m[kind] = jd;
    out.set(target, m);
  };
  if (targetIds.length === 0) return out;
  const beforeJd = unixMsToJd(Date.parse(beforeIso));
  const measured = await db
    .select({
      target: measurements.targetId,
      kind: measurements.kind,
      jd: max(measurements.epochJd),
    })
    .from(measurements)
    .where(inArray(measurements.targetId, targetIds))
    .groupBy(measurements.targetId, measurements.kind);
  for (const m of measured)
    if (m.jd !== null && m.jd < beforeJd) note(m.target, describeKind(m.kind).blockKind, m.jd);
  const planned = await db
    .select({ b: blocks })
    .from(blocks)
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .where(
      and(
        eq(nights.campaignId, campaignId),
        inArray(blocks.targetId, targetIds),
        inArray(blocks.status, ['planned', 'obtained', 'partial']),
      ),
    );
  for (const { b } of planned) {
    if (b.endUtc >= beforeIso) continue;
    note(b.targetId, b.kind, unixMsToJd((Date.parse(b.startUtc) + Date.parse(b.endUtc)) / 2));
  }
  return out;
}

/**
 * A short fingerprint of what a plan would write and replace: accept with it to be sure nothing
 * changed since the preview.
 */
export function planDigest(value: unknown): string {
  return createHash('sha256').update(JSON.stringify(value)).digest('hex').slice(0, 16);
}

/** Target names as the planners see them: the stored name, with the system added where two systems share a name. */
export function plannerNames(
  targets: readonly { id: number; system: string; target: { name: string } }[],
): Map<number, string> {
  const count = new Map<string, number>();
  for (const t of targets) count.set(t.target.name, (count.get(t.target.name) ?? 0) + 1);
  return new Map(
    targets.map((t) => [
      t.id,
      count.get(t.target.name)! > 1 ? `${t.target.name} (${t.system})` : t.target.name,
    ]),
  );
}
