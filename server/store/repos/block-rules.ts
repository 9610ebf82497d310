/**
 * The rules a block keeps with its night and with the rows around it, each in one place. The
 * block's own write (create, PATCH) and the edits that move its night under it (a site's zone or
 * position, a campaign's darkness, a night's campaign) all call these, so a rule cannot be dodged
 * by editing the row next to it.
 *
 * - inside its night (local noon to local noon) and inside the darkness its campaign asks for;
 * - for a target of its night's campaign;
 * - not overlapping another block of its site, unless one of the two says why (`overlapReason`);
 * - a logged status (obtained, partial, lost) only once its night is over, and while a night
 *   report holds its outcome, only the status that outcome says;
 * - its measurements stay of its target and kind, and within its night.
 */
import { and, eq, inArray } from 'drizzle-orm';
import {
  blockOutcomes,
  blocks,
  campaignTargets,
  campaigns,
  measurements,
  nights,
  sites,
} from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { nowMs } from '../../clock.ts';
import type { DbOrTx } from '../database.ts';
import { rowById } from '../crud.ts';
import { ConflictError } from '../errors.ts';
import { checkMeasurementBlock, type BlockRef } from './measurement-rules.ts';
import { isoSecond, nightTimes, type NightTimes, type SitePlace } from './night-times.ts';

type BlockRow = typeof blocks.$inferSelect;
type NightRow = typeof nights.$inferSelect;
type CampaignRow = typeof campaigns.$inferSelect;

/**
 * Slack at the darkness edges, ms. The planners cut nights by the sky engine's fast path, which
 * agrees with the exact one used here within 30 s (DEVELOPERS.md, the sky engine's checks).
 */
const DARKNESS_SLACK_MS = 60_000;

/** Statuses that say what happened: they need the night to be over. */
const LOGGED = new Set(['obtained', 'partial', 'lost']);

/** A night with what judges its blocks: the site (as stored, or as an edit would make it) and the campaign. */
export interface NightPlace {
  night: NightRow;
  site: SitePlace & { id: number };
  campaign: CampaignRow | null;
}

/** Stored night `nightId` with its site and campaign; overrides stand for rows being edited. */
export async function nightPlace(
  tx: DbOrTx,
  night: NightRow,
  override: { site?: SitePlace & { id: number }; campaign?: CampaignRow | null } = {},
): Promise<NightPlace> {
  const site =
    override.site ?? (await rowById<typeof sites.$inferSelect>(tx, sites, night.siteId))!;
  let campaign: CampaignRow | null = null;
  if (override.campaign !== undefined) campaign = override.campaign;
  else if (night.campaignId !== null)
    campaign = await rowById<CampaignRow>(tx, campaigns, night.campaignId);
  return { night, site, campaign };
}

export function timesOf(place: NightPlace): NightTimes {
  return nightTimes(place.site, place.night.date, place.campaign?.limits?.darkness);
}

const nightName = (p: NightPlace) => `night ${p.night.date} at ${p.site.name}`;

/** The block's times against its night: inside the span, inside the darkness. */
export function blockTimeProblem(
  b: { readonly startUtc?: unknown; readonly endUtc?: unknown },
  place: NightPlace,
): InputError | null {
  const start = Date.parse(b.startUtc as string);
  const end = Date.parse(b.endUtc as string);
  if (!(end > start)) return new InputError('endUtc', b.endUtc, 'must be after startUtc');
  const t = timesOf(place);
  if (start < t.startMs || end > t.endMs)
    return new InputError(
      'startUtc',
      b.startUtc,
      `with endUtc ${String(b.endUtc)} must lie within ${nightName(place)} ` +
        `(${isoSecond(t.startMs)} to ${isoSecond(t.endMs)})`,
    );
  const inside = t.dark.some(
    (d) => start >= d.startMs - DARKNESS_SLACK_MS && end <= d.endMs + DARKNESS_SLACK_MS,
  );
  if (!inside) {
    const dark = t.dark.map((d) => `${isoSecond(d.startMs)} to ${isoSecond(d.endMs)}`);
    return new InputError(
      'startUtc',
      b.startUtc,
      `with endUtc ${String(b.endUtc)} must lie in the darkness of ${nightName(place)}, ` +
        `${t.darknessLabel}: ${dark.length ? dark.join(', ') : 'it has none'}`,
    );
  }
  return null;
}

/** The target must be one of the night's campaign's (a night without a campaign takes any). */
export async function campaignTargetProblem(
  tx: DbOrTx,
  targetId: number,
  place: NightPlace,
  targetIds?: readonly number[],
): Promise<InputError | null> {
  const c = place.campaign;
  if (!c) return null;
  const ids =
    targetIds ??
    (
      await tx
        .select({ id: campaignTargets.targetId })
        .from(campaignTargets)
        .where(eq(campaignTargets.campaignId, c.id))
    ).map((r) => r.id);
  if (ids.includes(targetId)) return null;
  return new InputError(
    'targetId',
    targetId,
    `is not a target of campaign ${c.id} (${JSON.stringify(c.name)}), to which ${nightName(place)} belongs`,
  );
}

/** Other blocks of the night that `b` overlaps; none when either says why, or either is withdrawn. */
async function overlapped(
  tx: DbOrTx,
  b: Record<string, unknown>,
  selfId: number | undefined,
): Promise<number[]> {
  if (b.status === 'withdrawn' || b.overlapReason) return [];
  const start = Date.parse(b.startUtc as string);
  const end = Date.parse(b.endUtc as string);
  const others = await tx
    .select()
    .from(blocks)
    .where(eq(blocks.nightId, b.nightId as number));
  return others
    .filter(
      (o) =>
        o.id !== selfId &&
        o.status !== 'withdrawn' &&
        !o.overlapReason &&
        Date.parse(o.startUtc) < end &&
        Date.parse(o.endUtc) > start,
    )
    .map((o) => o.id);
}

/** The outcome a night report holds for a block, with the report's id. */
async function outcomeOf(tx: DbOrTx, blockId: number) {
  const [o] = await tx.select().from(blockOutcomes).where(eq(blockOutcomes.blockId, blockId));
  return o ?? null;
}

const changed = (next: Record<string, unknown>, prev: BlockRow | null, keys: string[]) =>
  prev === null || keys.some((k) => next[k] !== (prev as Record<string, unknown>)[k]);

/** Every rule of a block being written (`previous` null on create). Throws the first broken. */
export async function checkBlock(
  tx: DbOrTx,
  next: Record<string, unknown>,
  previous: BlockRow | null,
  night: NightRow,
): Promise<void> {
  const place = await nightPlace(tx, night);
  // Rows older than a rule are judged by it only when the fields it reads change.
  if (changed(next, previous, ['nightId', 'startUtc', 'endUtc'])) {
    const p = blockTimeProblem(next, place);
    if (p) throw p;
  }
  if (changed(next, previous, ['nightId', 'targetId'])) {
    const p = await campaignTargetProblem(tx, next.targetId as number, place);
    if (p) throw p;
  }
  if (changed(next, previous, ['nightId', 'startUtc', 'endUtc', 'status', 'overlapReason'])) {
    const ids = await overlapped(tx, next, previous?.id);
    if (ids.length > 0)
      throw new ConflictError(
        'overlap',
        `block overlaps block${ids.length > 1 ? 's' : ''} ${ids.join(', ')} of ${nightName(place)}` +
          `; move it, or give overlapReason`,
        {
          field: 'startUtc',
          value: next.startUtc,
          rule: 'must not overlap another block of the same site unless overlapReason says why',
          dependents: ids.map((id) => ({ entity: 'block', id })),
        },
      );
  }
  const status = next.status as string;
  if (LOGGED.has(status) && changed(next, previous, ['status', 'nightId'])) {
    const over = timesOf(place).overMs;
    if (over > nowMs())
      throw new InputError(
        'status',
        status,
        `can be obtained, partial or lost only once ${nightName(place)} is over (sunrise, ${isoSecond(over)})`,
      );
  }
  if (previous) await checkBlockDependents(tx, next, previous, place);
}

/** What a stored block's outcome and measurements need of an edit to it. */
async function checkBlockDependents(
  tx: DbOrTx,
  next: Record<string, unknown>,
  previous: BlockRow,
  place: NightPlace,
): Promise<void> {
  const outcome = await outcomeOf(tx, previous.id);
  if (outcome && next.nightId !== previous.nightId)
    throw dependentsError(
      'nightId',
      next.nightId,
      `cannot change while night report ${outcome.reportId} of night ${previous.nightId} holds the block's outcome`,
      [{ entity: 'night report', id: outcome.reportId }],
    );
  if (outcome && next.status !== outcome.status)
    throw dependentsError(
      'status',
      next.status,
      `is set by night report ${outcome.reportId}, which says "${outcome.status}"; change the report's outcome instead`,
      [{ entity: 'night report', id: outcome.reportId }],
    );
  if (!changed(next, previous, ['nightId', 'targetId', 'kind'])) return;
  const ref = blockRef(next as BlockRow, place);
  const broken: { id: number; rule: string }[] = [];
  for (const m of await tx.select().from(measurements).where(eq(measurements.blockId, previous.id)))
    try {
      checkMeasurementBlock({ ...m, blockId: previous.id }, ref, Number.POSITIVE_INFINITY);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      broken.push({ id: m.id, rule: `${err.field} ${err.rule}` });
    }
  if (broken.length > 0) {
    const field =
      next.targetId !== previous.targetId
        ? 'targetId'
        : next.kind !== previous.kind
          ? 'kind'
          : 'nightId';
    throw dependentsError(
      field,
      next[field],
      `cannot change: measurement${broken.length > 1 ? 's' : ''} ` +
        `${broken.map((b) => b.id).join(', ')} of the block would break (${broken[0]!.rule})`,
      broken.map((b) => ({ entity: 'measurement', id: b.id })),
    );
  }
}

/** A measurement's view of a block: its target, kind and night. */
export function blockRef(
  b: Pick<BlockRow, 'id' | 'targetId' | 'kind'>,
  place: NightPlace,
): BlockRef {
  const t = timesOf(place);
  return {
    id: b.id,
    targetId: b.targetId,
    kind: b.kind,
    night: nightName(place),
    startMs: t.startMs,
    endMs: t.endMs,
    overMs: t.overMs,
  };
}

/** The blocks `ids` as measurements see them (unknown ids are left out). */
export async function blockRefs(
  tx: DbOrTx,
  ids: readonly number[],
): Promise<Map<number, BlockRef>> {
  const out = new Map<number, BlockRef>();
  for (let i = 0; i < ids.length; i += 500) {
    const rows = await tx
      .select({ b: blocks, n: nights, s: sites })
      .from(blocks)
      .innerJoin(nights, eq(nights.id, blocks.nightId))
      .innerJoin(sites, eq(sites.id, nights.siteId))
      .where(inArray(blocks.id, ids.slice(i, i + 500)));
    // A measurement needs the span and the sunrise only, which no darkness limit changes.
    for (const { b, n, s } of rows)
      out.set(b.id, blockRef(b, { night: n, site: s, campaign: null }));
  }
  return out;
}

/** A 409 for an edit that would break stored rows that depend on the edited one, naming them. */
export function dependentsError(
  field: string,
  value: unknown,
  rule: string,
  dependents: { entity: string; id: number }[],
): ConflictError {
  return new ConflictError('dependent_rows', `${field} ${rule}`, {
    field,
    value,
    rule,
    dependents,
  });
}

/**
 * Every block of `nightRows` judged again as an edit would place it (a site moved, a zone or a
 * darkness changed, a night given another campaign): a 409 naming the blocks that would break.
 */
export async function checkBlocksUnder(
  tx: DbOrTx,
  nightRows: readonly NightRow[],
  override: { site?: SitePlace & { id: number }; campaign?: CampaignRow | null },
  field: string,
  value: unknown,
  targets?: readonly number[],
): Promise<void> {
  const broken: { id: number; rule: string }[] = [];
  for (const night of nightRows) {
    const place = await nightPlace(tx, night, override);
    const rows = await tx.select().from(blocks).where(eq(blocks.nightId, night.id));
    for (const b of rows) {
      const p =
        blockTimeProblem(b, place) ??
        (targets !== undefined || override.campaign !== undefined
          ? await campaignTargetProblem(tx, b.targetId, place, targets)
          : null);
      if (p) broken.push({ id: b.id, rule: `${p.field} ${p.rule}` });
      else {
        const ref = blockRef(b, place);
        for (const m of await tx
          .select()
          .from(measurements)
          .where(and(eq(measurements.blockId, b.id))))
          try {
            checkMeasurementBlock({ ...m, blockId: b.id }, ref, Number.POSITIVE_INFINITY);
          } catch (err) {
            if (!(err instanceof InputError)) throw err;
            broken.push({ id: b.id, rule: `its measurement ${m.id}: ${err.field} ${err.rule}` });
          }
      }
    }
  }
  if (broken.length > 0)
    throw dependentsError(
      field,
      value,
      `cannot change: block${broken.length > 1 ? 's' : ''} ` +
        `${[...new Set(broken.map((b) => b.id))].join(', ')} would break (block ${broken[0]!.id}` +
        `: ${broken[0]!.rule})`,
      [...new Set(broken.map((b) => b.id))].map((id) => ({ entity: 'block', id })),
    );
}
