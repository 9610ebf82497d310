/**
 * The campaign at a glance: periapsis passages ahead (soonest first, with their ± days, lead-time
 * band and whether each site can see the star then), the next nights at each site, and the latest
 * night reports.
 */
import { useState } from 'preact/hooks';
import { get, getAll, send } from '../api/client.ts';
import { loadCatalogue, skySite, skyTarget, type Catalogue } from '../api/catalogue.ts';
import type { BlockRow, NightRow, OrbitEvent, ReportRow, Season } from '../api/types.ts';
import { daysFromNow, todayIn, utcText } from '../lib/time.ts';
import { ErrorLine, Loading, Qty, Section } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';

export interface Passage { targetId: number; name: string; epoch: string; sigmaDays: number | undefined; sites: { site: string; inSeason: boolean | null; hours: number | null }[] }

/** Lead-time bands: what a planner can still do about a passage. */
export function leadBand(days: number): { label: string; cls: string } {
  if (days < 0) return { label: 'passed', cls: 'band-past' };
  if (days <= 90) return { label: 'within 3 months: book time now', cls: 'band-urgent' };
  if (days <= 365) return { label: 'within a year: plan this season', cls: 'band-soon' };
  return { label: 'more than a year ahead', cls: 'band-later' };
}

async function passages(cat: Catalogue, targetIds: number[], siteIds: number[], aheadYears: number): Promise<Passage[]> {
  const now = new Date();
  const end = new Date(now.getTime() + aheadYears * 365.25 * 86_400_000);
  const found: Passage[] = [];
  await Promise.all(
    targetIds.filter((id) => cat.currentSolution(id)).map(async (id) => {
      const r = await get<{ events: OrbitEvent[] }>(`/targets/${id}/events`, { start: now.toISOString(), end: end.toISOString(), kinds: 'periapsis' });
      for (const e of r.events) found.push({ targetId: id, name: cat.target(id)?.name ?? `#${id}`, epoch: e.epoch, sigmaDays: e.sigmaDays, sites: [] });
    }),
  );
  // One season map per site and year answers "can this site see the star around periapsis?".
  const years = [...new Set(found.map((p) => Number(p.epoch.slice(0, 4))))];
  for (const siteId of siteIds) {
    const site = cat.site(siteId);
    if (!site) continue;
    for (const year of years) {
      const here = found.filter((p) => p.epoch.startsWith(String(year)));
      const targets = [...new Set(here.map((p) => p.targetId))].map((id) => skyTarget(cat, id)).filter((t) => t !== null);
      const season = await send<Season>('POST', '/sky/season', { site: skySite(site), year, targets });
      for (const p of here) {
        const t = season.targets.find((s) => s.name === p.name);
        const hit = t?.periapses.find((q) => q.epoch && Math.abs(Date.parse(q.epoch) - Date.parse(p.epoch)) < 3 * 86_400_000) as { inSeason?: boolean; hours?: number } | undefined;
        p.sites.push({ site: site.name, inSeason: hit?.inSeason ?? null, hours: hit?.hours ?? null });
      }
    }
  }
  return found.sort((a, b) => a.epoch.localeCompare(b.epoch));
}

function Passages({ cat, campaignId }: { cat: Catalogue; campaignId: number }) {
  const c = cat.campaigns.find((x) => x.id === campaignId)!;
  const { data, error } = useLoad(() => passages(cat, c.targetIds, c.siteIds, 3), [campaignId]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="periapsis passages" />;
  if (!data.length) return <p>No periapsis passage in the next three years.</p>;
  return (
    <ol class="flag-list">
      {data.map((p) => {
        const d = daysFromNow(p.epoch);
        const band = leadBand(d);
        return (
          <li key={`${p.targetId}-${p.epoch}`} class={`flag periapsis-flag ${band.cls}`}>
            <div class="flag-head">
              <span class="flag-kind">periapsis ahead</span>
              <a href={`/targets/${p.targetId}`}>{p.name}</a>
              <span class="flag-when">{utcText(p.epoch)} UTC {p.sigmaDays !== undefined ? <>± <Qty v={p.sigmaDays} unit="d" /></> : <span class="muted">(no covariance: date uncertainty unknown)</span>}</span>
            </div>
            <div class="flag-body">
              <span class="lead-band">in {Math.round(d)} days · {band.label}</span>
              {p.sites.map((s) => (
                <span key={s.site} class={`site-chip ${s.inSeason ? 'seen' : 'unseen'}`}>
                  {s.site}: {s.inSeason === null ? 'unknown' : s.inSeason ? <>observable (<Qty v={s.hours} unit="h" /> that night)</> : 'not observable (out of season)'}
                </span>
              ))}
            </div>
          </li>
        );
      })}
    </ol>
  );
}

function NextNights({ cat, campaignId }: { cat: Catalogue; campaignId: number }) {
  const c = cat.campaigns.find((x) => x.id === campaignId)!;
  const { data, error } = useLoad(async () => {
    const nights = await getAll<NightRow>('/nights', { campaignId });
    const blocks = await getAll<BlockRow>('/blocks', { campaignId, from: new Date().toISOString() });
    return { nights, blocks };
  }, [campaignId]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="nights" />;
  return (
    <div class="site-columns">
      {c.siteIds.map((sid) => {
        const site = cat.site(sid);
        if (!site) return null;
        const today = todayIn(site.timeZone);
        const next = data.nights.filter((n) => n.siteId === sid && n.date >= today).sort((a, b) => a.date.localeCompare(b.date)).slice(0, 4);
        return (
          <div key={sid} class="site-column">
            <h3>{site.name} <span class="muted">({site.timeZone})</span></h3>
            {next.length === 0 ? <p class="muted">No nights planned.</p> : (
              <ul class="night-list">
                {next.map((n) => {
                  const bs = data.blocks.filter((b) => b.nightId === n.id);
                  return (
                    <li key={n.id}>
                      <a href={`/nights/${n.id}`}>night of {n.date}</a> · {bs.length} block{bs.length === 1 ? '' : 's'}
                      {bs.some((b) => b.laserGuideStar) && <span class="tag lgs-tag" title="uses a laser guide star">laser</span>}
                    </li>
                  );
                })}
              </ul>
            )}
          </div>
        );
      })}
    </div>
  );
}

function LatestReports({ cat, campaignId }: { cat: Catalogue; campaignId: number }) {
  const { data, error } = useLoad(async () => {
    const [reports, nights] = await Promise.all([getAll<ReportRow>('/night-reports', { campaignId }), getAll<NightRow>('/nights', { campaignId })]);
    const night = new Map(nights.map((n) => [n.id, n]));
    return reports.map((r) => ({ r, n: night.get(r.nightId)! })).filter((x) => x.n).sort((a, b) => b.n.date.localeCompare(a.n.date)).slice(0, 6);
  }, [campaignId]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="night reports" />;
  if (!data.length) return <p class="muted">No night reports yet.</p>;
  return (
    <table class="data">
      <thead><tr><th>night</th><th>site</th><th>seeing (″)</th><th>Strehl</th><th>clouds (%)</th><th>lost (h)</th><th>blocks obtained</th></tr></thead>
      <tbody>
        {data.map(({ r, n }) => (
          <tr key={r.id}>
            <td><a href={`/nights/${n.id}/report`}>{n.date}</a></td>
            <td>{cat.site(n.siteId)?.name}</td>
            <td><Qty v={r.seeingArcsec} unit="" digits={2} /></td>
            <td><Qty v={r.strehlRatio} unit="" digits={2} /></td>
            <td><Qty v={r.cloudCoverPct} unit="" digits={0} /></td>
            <td><Qty v={r.timeLostHours} unit="" /> {r.timeLostReason && <span class="muted">{r.timeLostReason}</span>}</td>
            <td>{r.outcomes.filter((o) => o.status === 'obtained').length} / {r.outcomes.length}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function OverviewView() {
  const { data: cat, error } = useLoad(loadCatalogue, []);
  const [campaignId, setCampaignId] = useState<number | null>(null);
  if (error) return <ErrorLine error={error} />;
  if (!cat) return <Loading what="the campaign" />;
  if (!cat.campaigns.length) return <p class="panel">No campaign yet. A lead can add one through the API or the CLI; see <a href="/records">Records</a>.</p>;
  const id = campaignId ?? cat.campaigns[0]!.id;
  const c = cat.campaigns.find((x) => x.id === id)!;
  return (
    <div class="view overview">
      <div class="view-head">
        <h1>{c.name}</h1>
        <label class="inline">Campaign{' '}
          <select value={id} onChange={(e) => setCampaignId(Number(e.currentTarget.value))}>
            {cat.campaigns.map((x) => <option key={x.id} value={x.id}>{x.name}</option>)}
          </select>
        </label>
        <p class="muted">{c.startDate} to {c.endDate} · targets: {c.targetIds.map((t) => cat.target(t)?.name).join(', ')} · {c.notes}</p>
      </div>
      <Section title="Flags: periapsis passages ahead" id="flags"><Passages cat={cat} campaignId={id} /></Section>
      <Section title="Next nights" id="next-nights"><NextNights cat={cat} campaignId={id} /></Section>
      <Section title="Latest night reports" id="latest-reports"><LatestReports cat={cat} campaignId={id} /></Section>
    </div>
  );
}
