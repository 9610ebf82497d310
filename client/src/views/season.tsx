/**
 * The season at each of the campaign's sites: observable hours per night for every target across
 * a year, with periapsis dates and the nights already planned on the same chart.
 */
import { useState } from 'preact/hooks';
import { getAll, send } from '../api/client.ts';
import { loadCatalogue, skySite, skyTarget, type Catalogue } from '../api/catalogue.ts';
import type { BlockRow, CampaignRow, NightRow, Season } from '../api/types.ts';
import { SeasonChart, type SeasonRow } from '../plots/season-chart.tsx';
import { Caution, ErrorLine, Loading, Section } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';
import { SeasonPlanPanel, type SeasonPlanPreview } from './season-plan.tsx';

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
      send<Season>('POST', '/sky/season', {
        site: skySite(site),
        year,
        targets: targets.map((x) => x.t),
        limits: limitsOf(campaign),
      }),
    [siteId, year, campaign.id],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what={`the season at ${site.name}`} />;
  const nightDate = new Map(nights.filter((n) => n.siteId === siteId).map((n) => [n.id, n.date]));
  const rows: SeasonRow[] = data.targets.map((t, i) => {
    const tid = targets[i]!.id;
    const planned = [
      ...new Set(
        blocks
          .filter((b) => b.targetId === tid && nightDate.has(b.nightId))
          .map((b) => nightDate.get(b.nightId)!),
      ),
    ].filter((d) => d.startsWith(String(year)));
    return {
      name: t.name,
      hoursPerNight: t.hoursPerNight,
      periapsisDates: t.periapses
        .map((p) => (p.epoch ?? p.date ?? '').slice(0, 10))
        .filter(Boolean),
      plannedDates: planned,
      proposedDates: [
        ...new Set(
          (proposal?.plan.epochs ?? [])
            .filter(
              (e) => e.site === site.name && e.target === t.name && e.date.startsWith(String(year)),
            )
            .map((e) => e.date),
        ),
      ],
      seasonText: t.season
        ? `${t.season.start.slice(5)} → ${t.season.end.slice(5)} · ${t.season.usableNights} nights`
        : 'not observable',
    };
  });
  return (
    <Section title={`${site.name} (${site.timeZone})`} id={`season-site-${siteId}`}>
      <SeasonChart year={year} rows={rows} darkHours={data.nights.map((n) => n.darkHours)} />
      <p class="legend">
        Bars: hours per night the target meets the campaign’s limits (darkness{' '}
        {campaign.limits.darkness ?? 'astronomical'}, airmass ≤{' '}
        {campaign.limits.highestAirmass ?? 2}, Moon ≥ {campaign.limits.leastMoonDistanceDeg ?? 30}°
        away) · faint line: hours of darkness · ◆ periapsis · ticks under a strip: nights already
        planned
        {proposal ? ' · hollow circles: the proposed season plan' : ''}.
      </p>
      {(data.cautions ?? []).map((c) => (
        <Caution key={c}>{c}</Caution>
      ))}
      {data.targets.flatMap((t) =>
        t.periapses
          .filter((p) => p.inSeason === false)
          .map((p) => (
            <p class="notice" key={`${t.name}${p.epoch}`}>
              {t.name} passes periapsis on {(p.epoch ?? '').slice(0, 10)} while it cannot be
              observed from {site.name}.
            </p>
          )),
      )}
    </Section>
  );
}

export function SeasonView() {
  const [tick, setTick] = useState(0);
  const { data, error } = useLoad(async () => {
    const cat = await loadCatalogue();
    const [nights, blocks] = await Promise.all([
      getAll<NightRow>('/nights'),
      getAll<BlockRow>('/blocks'),
    ]);
    return { cat, nights, blocks };
  }, [tick]);
  const [campaignId, setCampaignId] = useState<number | null>(null);
  const [year, setYear] = useState<number | null>(null);
  const [proposal, setProposal] = useState<SeasonPlanPreview | null>(null);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the season" />;
  const { cat } = data;
  const campaign = cat.campaigns.find((c) => c.id === campaignId) ?? cat.campaigns[0];
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
          <label class="inline">
            Campaign{' '}
            <select
              value={campaign.id}
              onChange={(e) => setCampaignId(Number(e.currentTarget.value))}
            >
              {cat.campaigns.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </select>
          </label>
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
