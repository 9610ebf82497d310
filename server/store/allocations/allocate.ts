/**
 * A campaign's allocated nights in bulk: read the request's source into site-nights
 * (sources.ts), say for each whether it is new, already the campaign's, or refused and why
 * (preview, written nowhere), then store every new one in one transaction, or none when any
 * is refused.
 */
import { inArray } from 'drizzle-orm';
import { campaigns, nights, sites } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import type { Actor } from '../audit.ts';
import type { StoreContext } from '../context.ts';
import type { DbOrTx } from '../database.ts';
import { getById } from '../crud.ts';
import { campaignEntity, campaignMembers } from '../repos/campaigns.ts';
import type { NightRow } from '../repos/nights.ts';
import { siteEntity } from '../repos/sites.ts';
import {
  calendarNights,
  csvNights,
  patternNights,
  type AllocationLine,
  type NightPattern,
} from './sources.ts';

export type AllocationRequest =
  | ({ source: 'pattern' } & NightPattern)
  | { source: 'csv'; text: string }
  | {
      source: 'calendar';
      siteId: number;
      text: string;
      match?: string | undefined;
      semester?: string | undefined;
    };

export type AllocationState = 'new' | 'allocated' | 'refused';

export interface AllocationNight {
  siteId: number;
  site: string;
  date: string;
  semester: string;
  foundIn: string;
  state: AllocationState;
  /** Why a night is refused, or which stored night it already is; null for a new night. */
  reason: string | null;
  nightId: number | null;
}

export interface AllocationPreview {
  campaignId: number;
  nights: AllocationNight[];
  counts: Record<AllocationState, number>;
}

async function linesOf(
  tx: DbOrTx,
  campaign: typeof campaigns.$inferSelect,
  r: AllocationRequest,
): Promise<AllocationLine[]> {
  if (r.source === 'pattern') return patternNights(r);
  if (r.source === 'csv') {
    return csvNights(r.text, await tx.select({ id: sites.id, name: sites.name }).from(sites));
  }
  const site = await getById(tx, siteEntity, r.siteId);
  return calendarNights(r.text, { ...r, timeZone: site.timeZone, until: campaign.endDate });
}

async function prepare(
  tx: DbOrTx,
  campaignId: number,
  r: AllocationRequest,
): Promise<AllocationPreview> {
  const campaign = await getById(tx, campaignEntity, campaignId);
  const member = new Set((await campaignMembers(tx, campaignId)).siteIds);
  const lines = await linesOf(tx, campaign, r);
  const siteIds = [...new Set(lines.map((l) => l.siteId))];
  const siteRows = siteIds.length
    ? await tx.select().from(sites).where(inArray(sites.id, siteIds))
    : [];
  const siteName = new Map(siteRows.map((s) => [s.id, s.name]));
  const stored = siteIds.length
    ? await tx.select().from(nights).where(inArray(nights.siteId, siteIds))
    : [];
  const byKey = new Map(stored.map((n) => [`${n.siteId}/${n.date}`, n]));
  const campaignName = new Map(
    (await tx.select({ id: campaigns.id, name: campaigns.name }).from(campaigns)).map((c) => [
      c.id,
      c.name,
    ]),
  );
  const seen = new Map<string, AllocationNight>();
  const out: AllocationNight[] = [];
  for (const l of lines) {
    const key = `${l.siteId}/${l.date}`;
    const twin = seen.get(key);
    if (twin) {
      if (twin.semester !== l.semester && twin.state !== 'refused') {
        twin.state = 'refused';
        twin.reason =
          `asked for twice with different semester labels (“${twin.semester}” from ` +
          `${twin.foundIn}, “${l.semester}” from ${l.foundIn})`;
      }
      continue;
    }
    const n: AllocationNight = {
      siteId: l.siteId,
      site: siteName.get(l.siteId) ?? `site ${l.siteId}`,
      date: l.date,
      semester: l.semester,
      foundIn: l.foundIn,
      state: 'new',
      reason: null,
      nightId: null,
    };
    const have = byKey.get(key);
    if (!siteName.has(l.siteId)) refuse(n, `no stored site has id ${l.siteId}`);
    else if (!member.has(l.siteId)) refuse(n, `${n.site} is not one of the campaign’s sites`);
    else if (l.date < campaign.startDate || l.date > campaign.endDate)
      refuse(n, `lies outside the campaign’s dates ${campaign.startDate} to ${campaign.endDate}`);
    else if (have && have.campaignId === campaignId) {
      n.state = 'allocated';
      n.nightId = have.id;
      n.reason = 'already allocated to this campaign';
    } else if (have)
      refuse(
        n,
        have.campaignId === null
          ? 'is already stored at this site without a campaign'
          : `is already allocated to “${campaignName.get(have.campaignId) ?? have.campaignId}”`,
      );
    seen.set(key, n);
    out.push(n);
  }
  out.sort((a, b) => a.date.localeCompare(b.date) || a.site.localeCompare(b.site));
  const counts = { new: 0, allocated: 0, refused: 0 };
  for (const n of out) counts[n.state]++;
  return { campaignId, nights: out, counts };
}

function refuse(n: AllocationNight, reason: string): void {
  n.state = 'refused';
  n.reason = reason;
}

/** What a request would allocate, night by night, written nowhere. */
export function previewAllocations(
  ctx: StoreContext,
  campaignId: number,
  r: AllocationRequest,
): Promise<AllocationPreview> {
  return prepare(ctx.db, campaignId, r);
}

/** Store every new night of a request in one transaction; nothing when any night is refused. */
export function acceptAllocations(
  ctx: StoreContext,
  actor: Actor,
  campaignId: number,
  r: AllocationRequest,
): Promise<AllocationPreview & { created: NightRow[] }> {
  return ctx.db.transaction(async (tx) => {
    const preview = await prepare(tx, campaignId, r);
    const refused = preview.nights.filter((n) => n.state === 'refused');
    if (refused.length) {
      const problems = refused.map((n) => ({
        field: `nights.${n.site}.${n.date}`,
        value: n.date,
        rule: `${n.site}, night of ${n.date} (${n.foundIn}): ${n.reason}`,
      }));
      const [p] = problems;
      throw new InputError(
        p!.field,
        p!.value,
        `${p!.rule}${refused.length > 1 ? ` (and ${refused.length - 1} more refused)` : ''}; nothing was stored`,
        problems,
      );
    }
    const created: NightRow[] = [];
    for (const n of preview.nights.filter((x) => x.state === 'new')) {
      const row = await ctx.nights.createIn(tx, actor, {
        siteId: n.siteId,
        campaignId,
        date: n.date,
        semester: n.semester,
      });
      n.nightId = row.id;
      created.push(row);
    }
    return { ...preview, created };
  });
}
