/**
 * The campaign's nights as a calendar: per site, one strip of day cells per month, each cell a
 * site-night (allocated, reported, another campaign's, or free), with a bulk allocation beside it
 * (a pattern, a CSV file or the telescope's iCalendar schedule) whose preview is drawn on the same
 * cells before anything is stored. A lead allocates or releases one night by choosing its cell.
 */
import { useState } from 'preact/hooks';
import { DateTime } from 'luxon';
import { api, getAll, type CampaignRow, type NightRow, type Schemas } from '../api/client.ts';
import { loadCatalogue, type Catalogue } from '../api/catalogue.ts';
import { CampaignChoice, useChosenCampaign } from '../lib/campaign.tsx';
import { plural } from '../lib/words.ts';
import { ErrorLine, Loading, Section, useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';
import { useLoad } from '../lib/use-load.ts';
import { AllocationForm } from './allocation-form.tsx';

type Preview = Schemas['AllocationPreview'];
type CellState = 'ours' | 'reported' | 'theirs' | 'free' | 'outside';
const STATE_WORDS: Record<CellState, string> = {
  ours: 'allocated',
  reported: 'allocated, report written',
  theirs: 'another campaign’s',
  free: 'not allocated',
  outside: 'outside the campaign’s dates',
};

interface Data {
  cat: Catalogue;
  nights: NightRow[];
  blocksByNight: Map<number, number>;
  reported: Set<number>;
}

async function load(campaign: CampaignRow): Promise<Data> {
  const cat = await loadCatalogue();
  const [ours, theirs, blocks, reports] = await Promise.all([
    getAll('/nights', { campaignId: campaign.id }),
    Promise.all(
      campaign.siteIds.map((siteId) =>
        getAll('/nights', { siteId, start: campaign.startDate, end: campaign.endDate }),
      ),
    ),
    getAll('/blocks', { campaignId: campaign.id }),
    getAll('/night-reports', { campaignId: campaign.id }),
  ]);
  const nights = [...new Map([...theirs.flat(), ...ours].map((n) => [n.id, n])).values()];
  const blocksByNight = new Map<number, number>();
  for (const b of blocks) blocksByNight.set(b.nightId, (blocksByNight.get(b.nightId) ?? 0) + 1);
  return { cat, nights, blocksByNight, reported: new Set(reports.map((r) => r.nightId)) };
}

/** The months a campaign spans, as the first day of each. */
function monthsOf(c: CampaignRow): DateTime[] {
  const out: DateTime[] = [];
  const end = DateTime.fromISO(c.endDate);
  for (let m = DateTime.fromISO(c.startDate).startOf('month'); m <= end; m = m.plus({ months: 1 }))
    out.push(m);
  return out;
}

function SiteStrips(p: {
  campaign: CampaignRow;
  siteId: number;
  data: Data;
  preview: Preview | null;
  selected: string | null;
  onSelect: (key: string) => void;
}) {
  const { campaign, siteId, data } = p;
  const site = data.cat.site(siteId);
  const byDate = new Map(data.nights.filter((n) => n.siteId === siteId).map((n) => [n.date, n]));
  const proposed = new Map(
    (p.preview?.nights ?? []).filter((n) => n.siteId === siteId).map((n) => [n.date, n]),
  );
  const stateOf = (date: string): CellState => {
    const n = byDate.get(date);
    if (n && n.campaignId === campaign.id) return data.reported.has(n.id) ? 'reported' : 'ours';
    if (n) return 'theirs';
    return date < campaign.startDate || date > campaign.endDate ? 'outside' : 'free';
  };
  const count = [...byDate.values()].filter((n) => n.campaignId === campaign.id).length;
  return (
    <div class="site-strips">
      <h3>
        {site?.name ?? `site ${siteId}`}{' '}
        <span class="muted">
          ({site?.timeZone}) · {plural(count, 'night')} allocated
        </span>
      </h3>
      <div class="month-strips">
        {monthsOf(campaign).map((m) => (
          <div class="month-strip" key={m.toISODate()}>
            <span class="month-name">{m.toFormat('yyyy LLL')}</span>
            {Array.from({ length: m.daysInMonth ?? 31 }, (_, i) => {
              const d = m.plus({ days: i });
              const date = d.toISODate()!;
              const state = stateOf(date);
              const n = byDate.get(date);
              const prop = proposed.get(date);
              const blocks = n ? (data.blocksByNight.get(n.id) ?? 0) : 0;
              const key = `${siteId}/${date}`;
              const words = [
                `${site?.name}, night of ${date} (${d.toFormat('ccc')})`,
                STATE_WORDS[state],
                n?.semester ? `semester ${n.semester}` : '',
                n && n.campaignId === campaign.id ? plural(blocks, 'block') : '',
                prop
                  ? prop.state === 'new'
                    ? 'the preview would allocate it'
                    : prop.state === 'refused'
                      ? `the preview refuses it: ${prop.reason}`
                      : ''
                  : '',
              ]
                .filter(Boolean)
                .join(' · ');
              return (
                <button
                  type="button"
                  key={date}
                  class={`night-cell cell-${state}${prop ? ` proposed-${prop.state}` : ''}${d.weekday >= 6 ? ' weekend' : ''}${p.selected === key ? ' chosen' : ''}`}
                  data-date={date}
                  data-site={siteId}
                  title={words}
                  aria-label={words}
                  aria-pressed={p.selected === key}
                  disabled={state === 'outside'}
                  onClick={() => p.onSelect(key)}
                >
                  {d.day}
                  {blocks > 0 && <span class="cell-dot" aria-hidden="true" />}
                </button>
              );
            })}
          </div>
        ))}
      </div>
    </div>
  );
}

/** The chosen cell: what it is, and (for a lead) allocate or release it. */
function CellDetail(p: {
  campaign: CampaignRow;
  data: Data;
  cellKey: string;
  onChanged: () => void;
}) {
  const lead = useCan('lead');
  const { busy, error, run } = useAction();
  const [siteText, date] = p.cellKey.split('/') as [string, string];
  const siteId = Number(siteText);
  const site = p.data.cat.site(siteId);
  const n = p.data.nights.find((x) => x.siteId === siteId && x.date === date);
  const ours = n && n.campaignId === p.campaign.id;
  const blocks = n ? (p.data.blocksByNight.get(n.id) ?? 0) : 0;
  return (
    <section class="cell-detail" aria-label="the chosen night">
      <p>
        <strong>
          {site?.name}, night of {date}
        </strong>{' '}
        · {cellWords(p.data, p.campaign, n)}
      </p>
      <div class="toolbar">
        {n && <a href={`/nights/${n.id}`}>Open the night →</a>}
        {lead && !n && (
          <AllocateCell
            busy={busy}
            run={run}
            onAllocate={(semester) =>
              api.POST('/nights', { body: { siteId, campaignId: p.campaign.id, date, semester } })
            }
            onChanged={p.onChanged}
          />
        )}
        {lead && ours && (
          <button
            type="button"
            class="danger"
            disabled={busy || blocks > 0}
            title={blocks > 0 ? 'a night with blocks cannot be released: remove them first' : ''}
            onClick={() =>
              run(async () => {
                await api.DELETE('/nights/{id}', { params: { path: { id: n.id } } });
                p.onChanged();
              })
            }
          >
            Release this night
          </button>
        )}
        {lead && ours && blocks > 0 && (
          <span class="muted">
            It has {plural(blocks, 'block')}: remove them before releasing it.
          </span>
        )}
      </div>
      <ErrorLine error={error} />
    </section>
  );
}

/** What the chosen cell holds, in words. */
function cellWords(data: Data, campaign: CampaignRow, n: NightRow | undefined): string {
  if (!n) return 'not allocated';
  if (n.campaignId !== campaign.id) {
    const other = data.cat.campaigns.find((c) => c.id === n.campaignId);
    return `stored for ${other ? `“${other.name}”` : 'no campaign'}`;
  }
  const blocks = data.blocksByNight.get(n.id) ?? 0;
  return `allocated${n.semester ? ` (${n.semester})` : ''}, ${plural(blocks, 'block')}${data.reported.has(n.id) ? ', report written' : ''}`;
}

/** A lead allocates a free cell's night, with an optional semester. */
function AllocateCell(p: {
  busy: boolean;
  run: (action: () => Promise<void>) => Promise<void>;
  onAllocate: (semester: string) => Promise<unknown>;
  onChanged: () => void;
}) {
  const [semester, setSemester] = useState('');
  return (
    <>
      <label class="inline">
        semester{' '}
        <input
          name="cell-semester"
          value={semester}
          placeholder="2027A"
          onInput={(e) => setSemester(e.currentTarget.value)}
        />
      </label>
      <button
        type="button"
        class="primary"
        disabled={p.busy}
        onClick={() =>
          p.run(async () => {
            await p.onAllocate(semester);
            p.onChanged();
          })
        }
      >
        Allocate this night
      </button>
    </>
  );
}

/** The campaign's name and dates, and the choice of campaign. */
function NightsHead(p: {
  campaign: CampaignRow;
  campaigns: readonly CampaignRow[];
  onChoose: (id: number) => void;
}) {
  const { campaign } = p;
  return (
    <div class="view-head">
      <h1>Nights of {campaign.name}</h1>
      <CampaignChoice campaigns={p.campaigns} value={campaign.id} onChoose={p.onChoose} />
      <p class="muted">
        {campaign.startDate} to {campaign.endDate}. A night is named by the local date of its
        evening. Choose a day to see or change it.
      </p>
    </div>
  );
}

/** What the calendar's cell colours and marks mean. */
function CellKey() {
  return (
    <ul class="cell-key" aria-label="what the cells show">
      <li>
        <span class="night-cell cell-ours" aria-hidden="true" /> allocated
      </li>
      <li>
        <span class="night-cell cell-reported" aria-hidden="true" /> report written
      </li>
      <li>
        <span class="night-cell cell-theirs" aria-hidden="true" /> another campaign’s
      </li>
      <li>
        <span class="night-cell proposed-new" aria-hidden="true" /> the preview would allocate
      </li>
      <li>
        <span class="night-cell proposed-refused" aria-hidden="true" /> the preview refuses
      </li>
      <li>
        <span class="night-cell cell-free" aria-hidden="true">
          <span class="cell-dot" />
        </span>{' '}
        has blocks
      </li>
    </ul>
  );
}

export function NightsView() {
  const { data: cat, error: catError } = useLoad(loadCatalogue, []);
  const [campaign, choose] = useChosenCampaign(cat?.campaigns);
  const [tick, setTick] = useState(0);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  const { data, error } = useLoad(
    async () => (campaign ? load(campaign) : undefined),
    [campaign?.id, tick],
  );
  if (catError) return <ErrorLine error={catError} />;
  if (!cat) return <Loading what="the campaigns" />;
  if (!campaign)
    return (
      <p class="panel">
        No campaign yet: a lead adds one on <a href="/records">Records</a>.
      </p>
    );
  const changed = () => {
    setPreview(null);
    setTick(tick + 1);
  };
  return (
    <div class="view nights">
      <NightsHead
        campaign={campaign}
        campaigns={cat.campaigns}
        onChoose={(id) => {
          setPreview(null);
          setSelected(null);
          choose(id);
        }}
      />
      <Section title="Calendar of site-nights" id="night-calendar">
        <CellKey />
        {error ? <ErrorLine error={error} /> : null}
        {!data ? (
          <Loading what="the nights" />
        ) : (
          <>
            {campaign.siteIds.map((sid) => (
              <SiteStrips
                key={sid}
                campaign={campaign}
                siteId={sid}
                data={data}
                preview={preview}
                selected={selected}
                onSelect={setSelected}
              />
            ))}
            {selected && (
              <CellDetail
                key={selected}
                campaign={campaign}
                data={data}
                cellKey={selected}
                onChanged={changed}
              />
            )}
          </>
        )}
      </Section>
      <Section title="Allocate in bulk" id="allocate">
        <AllocationForm
          campaign={campaign}
          cat={cat}
          preview={preview}
          onPreview={setPreview}
          onStored={changed}
        />
      </Section>
    </div>
  );
}
