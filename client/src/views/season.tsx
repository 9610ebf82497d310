/**
 * The season at each of the campaign's sites: observable hours per night for every sky position
 * across a year as heat strips, each star's periapsis ± 1σ (from its current solution's events)
 * and the nights already planned or proposed on the same axis.
 */
import { DateTime } from 'luxon';
import { useState } from 'preact/hooks';
import { ApiError, getAll, api } from '../api/client.ts';
import { loadCatalogue, skySite, skyTarget, type Catalogue } from '../api/catalogue.ts';
import type { Answer, BlockRow, CampaignRow, NightRow, OrbitEvent } from '../api/client.ts';
import { SeasonChart, type SeasonRow } from '../plots/season-chart.tsx';
import { Caution, ErrorLine, Loading, Section } from '../lib/ui.tsx';
import { plural } from '../lib/words.ts';
import { useLoad } from '../lib/use-load.ts';
import { CampaignChoice, useChosenCampaign } from '../lib/campaign.tsx';
import { SeasonPlanPanel, type SeasonPlanPreview } from './season-plan.tsx';

/** "Feb 18" for a YYYY-MM-DD date. */
const monthDay = (date: string) => DateTime.fromISO(date, { zone: 'utc' }).toFormat('LLL dd');

function limitsOf(c: CampaignRow) {
  const k = c.limits;
  return {
    ...(k.highestAirmass ? { highestAirmass: k.highestAirmass } : {}),
    ...(k.leastMoonDistanceDeg !== undefined
      ? { leastMoonDistanceDeg: k.leastMoonDistanceDeg }
      : {}),
    ...(k.darkness ? { darkness: k.darkness } : {}),
  };
}

function SiteSeason({
  cat,
  campaign,
  siteId,
  year,
  nights,
  blocks,
  proposal,
}: {
  cat: Catalogue;
  campaign: CampaignRow;
  siteId: number;
  year: number;
  nights: NightRow[];
  blocks: BlockRow[];
  proposal: SeasonPlanPreview | null;
}) {
  const site = cat.site(siteId)!;
  const targets = campaign.targetIds
    .map((id) => ({ id, t: skyTarget(cat, id) }))
    .filter((x) => x.t !== null);
  const { data, error } = useLoad(
    () =>
      Promise.all([
        api.POST('/sky/season', {
          body: {
            site: skySite(site),
            year,
            targets: targets.flatMap((x) => (x.t ? [x.t] : [])),
            limits: limitsOf(campaign),
          },
        }),
        Promise.all(targets.map((x) => periapsesAround(x.id, year))),
      ]),
    [siteId, year, campaign.id],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what={`the season at ${site.name}`} />;
  const [season, events] = data;
  const rows = seasonRows({
    cat,
    season,
    events,
    targetIds: targets.map((x) => x.id),
    siteId,
    siteName: site.name,
    year,
    nights,
    blocks,
    proposal,
  });
  return (
    <Section title={`${site.name} (${site.timeZone})`} id={`season-site-${siteId}`}>
      <SeasonChart
        year={year}
        zone={site.timeZone}
        rows={rows}
        darkHours={season.nights.map((n) => n.darkHours)}
        nowMs={Date.now()}
      />
      <SeasonNotes campaign={campaign} season={season} siteName={site.name} />
    </Section>
  );
}

type SeasonAnswer = Answer<'/sky/season', 'post'>;

/** One chart row per target: its hours, periapses, and the nights planned and proposed for it. */
function seasonRows(p: {
  cat: Catalogue;
  season: SeasonAnswer;
  events: OrbitEvent[][];
  targetIds: number[];
  siteId: number;
  siteName: string;
  year: number;
  nights: NightRow[];
  blocks: BlockRow[];
  proposal: SeasonPlanPreview | null;
}): SeasonRow[] {
  const { cat, season, events, year, blocks, proposal } = p;
  const nightDate = new Map(
    p.nights.filter((n) => n.siteId === p.siteId).map((n) => [n.id, n.date]),
  );
  return season.targets.map((t, i) => {
    const tid = p.targetIds[i]!;
    const planned = [
      ...new Set(
        blocks
          .filter((b) => b.targetId === tid && nightDate.has(b.nightId))
          .map((b) => nightDate.get(b.nightId)!),
      ),
    ].filter((d) => d.startsWith(String(year)));
    const system = cat.system(cat.target(tid)?.systemId ?? -1)?.name;
    return {
      name: t.name,
      ...(system ? { system } : {}),
      hoursPerNight: t.hoursPerNight,
      periapses: events[i]!.map((e) => {
        const inSeason = t.periapses.find(
          (q) => q.epoch && Math.abs(Date.parse(q.epoch) - Date.parse(e.epoch)) < 86_400_000,
        )?.inSeason;
        return {
          epoch: e.epoch,
          ...(e.sigmaDays !== undefined ? { sigmaDays: e.sigmaDays } : {}),
          ...(inSeason !== undefined ? { inSeason } : {}),
        };
      }),
      plannedDates: planned,
      proposedDates: [
        ...new Set(
          (proposal?.plan.epochs ?? [])
            .filter(
              (e) =>
                e.site === p.siteName && e.target === t.name && e.date.startsWith(String(year)),
            )
            .map((e) => e.date),
        ),
      ],
      seasonText:
        t.season.start !== null && t.season.end !== null
          ? `${monthDay(t.season.start)} → ${monthDay(t.season.end)} · ${plural(t.season.usableNights, 'night')}`
          : 'not observable',
    };
  });
}

/** What the cells mean, the season's cautions, and each periapsis that falls out of season. */
function SeasonNotes(p: { campaign: CampaignRow; season: SeasonAnswer; siteName: string }) {
  return (
    <>
      <p class="legend">
        Cells: hours per night a star meets the campaign’s limits (darkness{' '}
        {p.campaign.limits.darkness ?? 'astronomical'}, airmass ≤{' '}
        {p.campaign.limits.highestAirmass ?? 2}, Moon ≥{' '}
        {p.campaign.limits.leastMoonDistanceDeg ?? 30}° away); the top strip is the hours of
        darkness on the same scale. Stars at one sky position share a strip and keep a track each.
      </p>
      {(p.season.cautions ?? []).map((c) => (
        <Caution key={c}>{c}</Caution>
      ))}
      {p.season.targets.flatMap((t) =>
        t.periapses
          .filter((q) => q.inSeason === false)
          .map((q) => (
            <p class="notice" key={`${t.name}${q.epoch}`}>
              {t.name} passes periapsis on {(q.epoch ?? '').slice(0, 10)} while it cannot be
              observed from {p.siteName}.
            </p>
          )),
      )}
    </>
  );
}

export function SeasonView() {
  const [tick, setTick] = useState(0);
  const { data, error } = useLoad(async () => {
    const cat = await loadCatalogue();
    const [nights, blocks] = await Promise.all([getAll('/nights'), getAll('/blocks')]);
    return { cat, nights, blocks };
  }, [tick]);
  const [chosen, setCampaignId] = useChosenCampaign(data?.cat.campaigns);
  const [year, setYear] = useState<number | null>(null);
  const [proposal, setProposal] = useState<SeasonPlanPreview | null>(null);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the season" />;
  const { cat } = data;
  const campaign = chosen;
  if (!campaign) return <p class="panel">No campaign yet.</p>;
  const y =
    year ??
    Math.max(
      Number(campaign.startDate.slice(0, 4)),
      Math.min(new Date().getUTCFullYear() + 1, Number(campaign.endDate.slice(0, 4))),
    );
  return (
    <div class="view season">
      <div class="view-head">
        <h1>Season {y}</h1>
        <div class="toolbar">
          <CampaignChoice campaigns={cat.campaigns} value={campaign.id} onChoose={setCampaignId} />
          <label class="inline">
            Year{' '}
            <input
              type="number"
              min={1900}
              max={2200}
              value={y}
              onChange={(e) => setYear(Number(e.currentTarget.value))}
            />
          </label>
        </div>
      </div>
      {/* keyed by campaign too: a site's season of the previous campaign must not render with this one's targets */}
      {campaign.siteIds.map((sid) => (
        <SiteSeason
          key={`${campaign.id}-${sid}-${y}`}
          cat={cat}
          campaign={campaign}
          siteId={sid}
          year={y}
          nights={data.nights}
          blocks={data.blocks}
          proposal={proposal}
        />
      ))}
      <SeasonPlanPanel
        key={`${campaign.id}-${y}`}
        campaign={campaign}
        year={y}
        onProposal={setProposal}
        onAccepted={() => setTick(tick + 1)}
      />
    </div>
  );
}

/**
 * A target's periapsis passages from half a year before to half a year after `year`, with their
 * 1σ (so a span reaching into the year is drawn); none without an orbit solution.
 */
async function periapsesAround(targetId: number, year: number): Promise<OrbitEvent[]> {
  try {
    const r = await api.GET('/targets/{id}/events', {
      params: {
        path: { id: targetId },
        query: { kinds: 'periapsis', start: `${year - 1}-07-01`, end: `${year + 1}-07-01` },
      },
    });
    return r.events;
  } catch (e) {
    if (e instanceof ApiError && e.status === 404) return [];
    throw e;
  }
}
