/**
 * A semester's time request, print-ready: the hours per site split by target and kind, the weather
 * allowance from the sites' learned clear chances, one figure (each site's request as a bar: the
 * blocks solid, the allowance hatched), and a paragraph per target with its expected result with
 * and without the time; the Markdown to paste into a proposal. Server: POST
 * /campaigns/{id}/time-request.
 */
import { useState } from 'preact/hooks';
import { api, getAll, type CampaignRow, type Schemas } from '../api/client.ts';
import { ErrorLine, Loading, Section } from '../lib/ui.tsx';
import { plural } from '../lib/words.ts';
import { useAction } from '../lib/use-action.ts';
import { useLoad } from '../lib/use-load.ts';
import { useChosenCampaign } from '../lib/campaign.tsx';

type Request = Schemas['TimeRequest'];
const h1 = (x: number) => x.toFixed(1);

function SiteBars({ r }: { r: Request }) {
  const w = 520,
    row = 30,
    left = 130;
  const top = Math.max(1e-9, ...r.sites.map((s) => s.requestHours));
  const x = (v: number) => (v / top) * (w - left - 60);
  return (
    <svg
      class="request-bars"
      viewBox={`0 0 ${w} ${r.sites.length * row + 10}`}
      role="img"
      aria-labelledby="request-bars-title"
    >
      <title id="request-bars-title">
        Hours requested per site: planned blocks and weather allowance
      </title>
      <defs>
        <pattern
          id="allowance-hatch"
          width="6"
          height="6"
          patternUnits="userSpaceOnUse"
          patternTransform="rotate(45)"
        >
          <line x1="0" y1="0" x2="0" y2="6" class="hatch" />
        </pattern>
      </defs>
      {r.sites.map((s, i) => (
        <g key={s.site} data-site={s.site} transform={`translate(0 ${i * row + 5})`}>
          <text class="label" x={left - 8} y={row / 2}>
            {s.site}
          </text>
          <rect class="blocks" x={left} y={4} width={x(s.hours)} height={row - 10} />
          <rect
            class="allowance"
            x={left + x(s.hours)}
            y={4}
            width={x(s.allowanceHours)}
            height={row - 10}
            fill="url(#allowance-hatch)"
          />
          <text class="value" x={left + x(s.requestHours) + 6} y={row / 2}>
            {h1(s.requestHours)} h
          </text>
        </g>
      ))}
    </svg>
  );
}

type RequestForm = { name: string; startDate: string; endDate: string };

export function TimeRequestView() {
  const { data: campaigns, error: loadError } = useLoad(() => getAll('/campaigns'), []);
  const [form, setForm] = useState<RequestForm>({ name: '', startDate: '', endDate: '' });
  // The campaign chosen on any campaign view, and chosen here for the others.
  const [campaign, choose] = useChosenCampaign(campaigns);
  const [result, setResult] = useState<Request | null>(null);
  const { busy, error, run } = useAction();
  if (loadError) return <ErrorLine error={loadError} />;
  if (!campaigns) return <Loading what="the campaigns" />;
  return (
    <div class="view time-request">
      <Section title="Semester time request" id="time-request-form">
        <form
          class="row-form no-print"
          onSubmit={(e) => {
            e.preventDefault();
            if (!campaign) return;
            void run(async () => {
              setResult(
                await api.POST('/campaigns/{id}/time-request', {
                  params: { path: { id: campaign.id } },
                  body: {
                    name: form.name,
                    startDate: form.startDate || campaign.startDate,
                    endDate: form.endDate || campaign.endDate,
                  },
                }),
              );
            });
          }}
        >
          <RequestFields
            campaigns={campaigns}
            campaign={campaign}
            onCampaign={(id) => {
              // A request written for another campaign no longer answers the form.
              setResult(null);
              choose(id);
            }}
            form={form}
            onForm={setForm}
          />
          <button type="submit" class="primary" disabled={busy}>
            Write the request
          </button>
          {result && (
            <button type="button" onClick={() => window.print()}>
              Print
            </button>
          )}
          {busy && <span class="loading">planning the semester…</span>}
        </form>
        <ErrorLine error={error} />
      </Section>
      {result && <RequestSheet result={result} />}
    </div>
  );
}

/** The campaign, the semester's label and its dates (blank: the campaign's own). */
function RequestFields({
  campaigns,
  campaign,
  onCampaign,
  form,
  onForm: setForm,
}: {
  campaigns: CampaignRow[];
  campaign: CampaignRow | undefined;
  onCampaign: (id: number) => void;
  form: RequestForm;
  onForm: (f: RequestForm) => void;
}) {
  return (
    <>
      <label>
        campaign{' '}
        <select
          name="campaign"
          value={campaign ? String(campaign.id) : ''}
          onChange={(e) => onCampaign(Number(e.currentTarget.value))}
        >
          {campaigns.map((c) => (
            <option key={c.id} value={String(c.id)}>
              {c.name}
            </option>
          ))}
        </select>
      </label>
      <label>
        semester{' '}
        <input
          name="name"
          size={8}
          value={form.name}
          placeholder="2027A"
          onInput={(e) => setForm({ ...form, name: e.currentTarget.value })}
        />
      </label>
      <label>
        first night{' '}
        <input
          type="date"
          name="startDate"
          value={form.startDate}
          onInput={(e) => setForm({ ...form, startDate: e.currentTarget.value })}
        />
      </label>
      <label>
        last night{' '}
        <input
          type="date"
          name="endDate"
          value={form.endDate}
          onInput={(e) => setForm({ ...form, endDate: e.currentTarget.value })}
        />
      </label>
    </>
  );
}

/** The printable request: totals, the figure, the hours table, the reasons and the exports. */
function RequestSheet({ result }: { result: Request }) {
  return (
    <article class="request-sheet">
      <h1>
        Time request, semester {result.semester.name} ({result.semester.startDate} to{' '}
        {result.semester.endDate})
      </h1>
      <p class="request-total">
        {h1(result.totals.requestHours)} h on {result.totals.nights} site-nights:{' '}
        {h1(result.totals.hours)} h of planned blocks plus {h1(result.totals.allowanceHours)} h
        weather allowance.
      </p>
      <SiteBars r={result} />
      <RequestTable result={result} />
      <h2>Why</h2>
      {result.targets.map((t) => (
        <p key={t.target} class="request-reason">
          {t.reason}
        </p>
      ))}
      <p class="muted">Rule: {result.rule}.</p>
      <p class="muted request-method">Expected results: {result.method}.</p>
      <p class="no-print">
        <a
          class="request-csv"
          download={`time-request-${result.semester.name}.csv`}
          href={`data:text/csv;charset=utf-8,${encodeURIComponent(result.csv)}`}
        >
          Download the hours as CSV
        </a>{' '}
        <span class="muted">(per site, target and kind, with each site’s total)</span>
      </p>
      <details class="no-print">
        <summary>Markdown for the proposal</summary>
        <textarea class="request-markdown" readOnly rows={14} value={result.markdown} />
      </details>
    </article>
  );
}

/** Hours per site, one row per target and kind, then the site's total. */
function RequestTable({ result }: { result: Request }) {
  return (
    <table class="data request-table">
      <thead>
        <tr>
          <th>site</th>
          <th>target</th>
          <th>kind</th>
          <th>blocks</th>
          <th>hours</th>
          <th>weather (h)</th>
          <th>request (h)</th>
        </tr>
      </thead>
      {result.sites.map((s) => (
        <tbody key={s.site} data-site={s.site}>
          {s.byTarget.map((b) => (
            <tr key={`${b.target} ${b.kind}`}>
              <td>{s.site}</td>
              <td>{b.target}</td>
              <td>{b.kind}</td>
              <td>{b.blocks}</td>
              <td>{h1(b.hours)}</td>
              <td>{h1(b.allowanceHours)}</td>
              <td>{h1(b.hours + b.allowanceHours)}</td>
            </tr>
          ))}
          <tr class="site-total">
            <td colSpan={3}>
              {s.site}: {plural(s.nights, 'night')}, clear with chance{' '}
              {(100 * s.clearChance).toFixed(0)} %
            </td>
            <td>{s.byTarget.reduce((n, b) => n + b.blocks, 0)}</td>
            <td>{h1(s.hours)}</td>
            <td>{h1(s.allowanceHours)}</td>
            <td>{h1(s.requestHours)}</td>
          </tr>
        </tbody>
      ))}
    </table>
  );
}
