/**
 * The campaign at a glance: the planning flags soonest first (periapsis ahead with its ± days,
 * lead-time band and each site's hours around it; periapsis while unobservable; planned epochs the
 * relativity forecast depends on; blend risks; stale predictions), the next nights at each site,
 * and the latest night reports.
 */
import { getAll, api, type Schemas } from '../api/client.ts';
import { loadCatalogue, type Catalogue } from '../api/catalogue.ts';
import { dateText, todayIn, utcText } from '../lib/time.ts';
import { ErrorLine, Loading, Qty, Section } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';
import { CampaignChoice, useChosenCampaign } from '../lib/campaign.tsx';
import { plural } from '../lib/words.ts';

export type Flag = Schemas['Flag'];

const KIND_WORDS: Record<string, string> = {
  'periapsis-ahead': 'periapsis ahead',
  'periapsis-unobservable': 'periapsis unobservable',
  'relativity-epoch': 'relativity epoch coming',
  'blend-risk': 'blend risk',
  'stale-prediction': 'prediction stale',
};

/** Urgency class from days ahead: it sets the border style (width and dash), not only its colour. */
export function urgency(days: number): string {
  return days <= 30 ? 'band-urgent' : days <= 365 ? 'band-soon' : 'band-later';
}

function FlagItem({ f, targetId }: { f: Flag; targetId: number | undefined }) {
  const name = targetId ? <a href={`/targets/${targetId}`}>{f.target}</a> : <span>{f.target}</span>;
  const p = f.periapsis;
  return (
    <li class={`flag flag-${f.kind} ${p ? `periapsis-flag ${urgency(f.daysAhead)}` : 'band-note'}`}>
      <div class="flag-head">
        <span class="flag-kind">{KIND_WORDS[f.kind] ?? f.kind}</span>
        {name}
        {p ? (
          <span class="flag-when">
            {utcText(f.date)} UTC{' '}
            {p.sigmaDays !== null ? (
              <>
                ± <Qty v={p.sigmaDays} unit="d" />
              </>
            ) : (
              <span class="muted">(no covariance: uncertainty unknown)</span>
            )}{' '}
            · in {plural(Math.round(f.daysAhead), 'day')} · {p.band}
          </span>
        ) : f.stale ? (
          <span class="flag-when">
            {f.stale.observableFrom
              ? `from the night of ${f.stale.observableFrom.night} at ${f.stale.observableFrom.site} ` +
                `(${utcText(f.date)} UTC)`
              : 'now'}
          </span>
        ) : f.relativity ? (
          <span class="flag-when">
            {utcText(f.date)} UTC · in {plural(Math.round(f.daysAhead), 'day')}
          </span>
        ) : f.blend ? (
          <span class="flag-when">
            {dateText(f.blend.start)} to {dateText(f.blend.end)} with {f.blend.other}, closest{' '}
            <Qty v={f.blend.closestMas} unit="mas" digits={1} />
          </span>
        ) : null}
      </div>
      {p && (
        <div class="flag-body">
          {p.sites.map((s) => (
            <span key={s.site} class={`site-chip ${s.maxHours > 0 ? 'seen' : 'unseen'}`}>
              {s.site}:{' '}
              {s.maxHours > 0 ? (
                <>
                  observable <Qty v={s.minHours} unit="" />–<Qty v={s.maxHours} unit="h" /> per
                  night of the ± window
                  {s.blocked && <> (not on the periapsis night: {s.blocked})</>}
                </>
              ) : (
                <>not observable in the ± window ({s.blocked ?? 'no window'})</>
              )}
            </span>
          ))}
          {p.samplingDays !== null && (
            <span>
              sample at least every <Qty v={p.samplingDays * 24} unit="h" />
            </span>
          )}
        </div>
      )}
      <p class="flag-reason">{f.reason}</p>
    </li>
  );
}

function Flags({ cat, campaignId }: { cat: Catalogue; campaignId: number }) {
  const { data, error } = useLoad(
    () => api.GET('/campaigns/{id}/flags', { params: { path: { id: campaignId } } }),
    [campaignId],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="flags" />;
  if (!data.flags.length) return <p>No flags: nothing needs attention.</p>;
  const idOf = (name: string) => cat.targets.find((t) => t.name === name)?.id;
  return (
    <ol class="flag-list">
      {data.flags.map((f) => (
        <FlagItem key={`${f.kind}${f.target}${f.date}`} f={f} targetId={idOf(f.target)} />
      ))}
    </ol>
  );
}

function NextNights({ cat, campaignId }: { cat: Catalogue; campaignId: number }) {
  const c = cat.campaigns.find((x) => x.id === campaignId)!;
  const { data, error } = useLoad(async () => {
    const nights = await getAll('/nights', { campaignId });
    const blocks = await getAll('/blocks', {
      campaignId,
      start: new Date().toISOString(),
    });
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
        const next = data.nights
          .filter((n) => n.siteId === sid && n.date >= today)
          .sort((a, b) => a.date.localeCompare(b.date))
          .slice(0, 4);
        return (
          <div key={sid} class="site-column">
            <h3>
              {site.name} <span class="muted">({site.timeZone})</span>
            </h3>
            {next.length === 0 ? (
              <p class="muted">No nights planned.</p>
            ) : (
              <ul class="night-list">
                {next.map((n) => {
                  const bs = data.blocks.filter((b) => b.nightId === n.id);
                  return (
                    <li key={n.id}>
                      <a href={`/nights/${n.id}`}>night of {n.date}</a> · {bs.length} block
                      {bs.length === 1 ? '' : 's'}
                      {bs.some((b) => b.laserGuideStar) && (
                        <span class="tag lgs-tag" title="uses a laser guide star">
                          laser
                        </span>
                      )}
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
    const [reports, nights] = await Promise.all([
      getAll('/night-reports', { campaignId }),
      getAll('/nights', { campaignId }),
    ]);
    const night = new Map(nights.map((n) => [n.id, n]));
    return reports
      .map((r) => ({ r, n: night.get(r.nightId)! }))
      .filter((x) => x.n)
      .sort((a, b) => b.n.date.localeCompare(a.n.date))
      .slice(0, 6);
  }, [campaignId]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="night reports" />;
  if (!data.length) return <p class="muted">No night reports yet.</p>;
  return (
    <table class="data">
      <thead>
        <tr>
          <th>night</th>
          <th>site</th>
          <th>seeing (″)</th>
          <th>Strehl</th>
          <th>clouds (%)</th>
          <th>lost (h)</th>
          <th>blocks obtained</th>
        </tr>
      </thead>
      <tbody>
        {data.map(({ r, n }) => (
          <tr key={r.id}>
            <td>
              <a href={`/nights/${n.id}/report`}>{n.date}</a>
            </td>
            <td>{cat.site(n.siteId)?.name}</td>
            <td>
              <Qty v={r.seeingArcsec} unit="" digits={2} />
            </td>
            <td>
              <Qty v={r.strehlRatio} unit="" digits={2} />
            </td>
            <td>
              <Qty v={r.cloudCoverPct} unit="" digits={0} />
            </td>
            <td>
              <Qty v={r.timeLostHours} unit="" />{' '}
              {r.timeLostReason && <span class="muted">{r.timeLostReason}</span>}
            </td>
            <td>
              {r.outcomes.filter((o) => o.status === 'obtained').length} / {r.outcomes.length}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function OverviewView() {
  const { data: cat, error } = useLoad(loadCatalogue, []);
  const [chosen, setCampaignId] = useChosenCampaign(cat?.campaigns);
  if (error) return <ErrorLine error={error} />;
  if (!cat) return <Loading what="the campaign" />;
  if (!cat.campaigns.length)
    return (
      <p class="panel">
        No campaign yet. A lead can add one through the API or the CLI; see{' '}
        <a href="/records">Records</a>.
      </p>
    );
  const c = chosen!;
  const id = c.id;
  return (
    <div class="view overview">
      <div class="view-head">
        <h1>{c.name}</h1>
        <CampaignChoice campaigns={cat.campaigns} value={id} onChoose={setCampaignId} />
        <p class="muted">
          {c.startDate} to {c.endDate} · targets:{' '}
          {c.targetIds.map((t) => cat.target(t)?.name).join(', ')} · {c.notes}
        </p>
      </div>
      <Section title="Flags, soonest first" id="flags">
        <Flags cat={cat} campaignId={id} />
      </Section>
      <Section title="Next nights" id="next-nights">
        <NextNights cat={cat} campaignId={id} />
      </Section>
      <Section title="Latest night reports" id="latest-reports">
        <LatestReports cat={cat} campaignId={id} />
      </Section>
    </div>
  );
}
