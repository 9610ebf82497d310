/**
 * A site's page: what its log has learned per calendar month (share of time lost, the clear chance a
 * plan uses, seeing, Strehl ratio, reasons, each with the nights it rests on), a month ribbon
 * drawing the same, the precision its measurements reached, and the clear-night prior (a lead
 * edits it, typed or from CSV). Server: GET /sites/{id}/statistics, GET and PUT /sites/{id}/clear-prior.
 */
import { Info } from 'luxon';
import { useState } from 'preact/hooks';
import { api, fieldMessages, type Schemas } from '../api/client.ts';
import { Blank, ErrorLine, Loading, Qty, Section, useCan } from '../lib/ui.tsx';
import { fieldWords } from '../lib/field-words.ts';
import { FileOrPaste } from '../lib/file-or-paste.tsx';
import { useAction } from '../lib/use-action.ts';
import { PrecisionSection } from './site-precision.tsx';
import { useLoad } from '../lib/use-load.ts';

type Stats = Schemas['SiteStatistics'];
type Month = Stats['months'][number];
const MONTHS = 'Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec'.split(' ');
const MONTH_NAMES = Info.months('long', { locale: 'en' });
const pct = (x: number | null | undefined) =>
  x === null || x === undefined ? '–' : `${(100 * x).toFixed(0)} %`;
/** A month's empty cell: no night logged, or none of its reports gave the quantity. */
const blankWhy = (nights: number, what: string) => (
  <Blank
    why={nights ? `none of the month’s reports gave ${what}` : 'no night logged in this month'}
  />
);

/**
 * Twelve month tiles: the tile's lower part filled to the clear chance, a tick at the log's own
 * clear share where there is one, the ±1σ of the estimate as a bracket, and the nights below.
 */
function MonthRibbon({ months }: { months: Month[] }) {
  const w = 44,
    h = 90,
    gap = 6;
  const y = (clear: number) => 8 + (1 - clear) * (h - 16);
  return (
    <svg
      class="month-ribbon"
      viewBox={`0 0 ${12 * (w + gap)} ${h + 34}`}
      role="img"
      aria-labelledby="month-ribbon-title"
    >
      <title id="month-ribbon-title">
        Chance a night is clear per month, with its ±1σ and the nights logged
      </title>
      {months.map((m, i) => {
        const x = i * (w + gap);
        const c = m.clearProbability;
        const lo = Math.max(0, c - m.loss.sigma),
          hi = Math.min(1, c + m.loss.sigma);
        const logged = m.loggedLossFraction === null ? null : 1 - m.loggedLossFraction;
        return (
          <g key={m.month} data-month={m.month}>
            <rect class="tile" x={x} y={8} width={w} height={h - 16} rx={3} />
            <rect
              class={`clear ${m.loss.nights === 0 ? 'prior-only' : ''}`}
              x={x}
              y={y(c)}
              width={w}
              height={h - 8 - y(c)}
              rx={3}
            />
            <path class="sigma" d={`M${x + w - 8} ${y(hi)}h6V${y(lo)}h-6`} />
            {logged !== null && <path class="logged" d={`M${x + 4} ${y(logged)}h${w - 14}`} />}
            <text class="pct" x={x + w / 2} y={y(c) - 2 < 16 ? 20 : y(c) - 3}>
              {(100 * c).toFixed(0)}
            </text>
            <text class="month" x={x + w / 2} y={h + 8}>
              {MONTHS[m.month - 1]}
            </text>
            <text class="n" x={x + w / 2} y={h + 24}>
              {m.nights} n
            </text>
          </g>
        );
      })}
    </svg>
  );
}

/** The months given a clear share, each worth `strengthNights`; an empty field is no prior. */
function priorMonths(values: string[], strengthNights: number) {
  return values.flatMap((v, i) =>
    v.trim() === '' ? [] : [{ month: i + 1, clearFraction: Number(v), strengthNights }],
  );
}

/** One clear-share field per month. */
function PriorMonthInputs(p: { values: string[]; onValues: (next: string[]) => void }) {
  return (
    <div class="prior-months">
      {p.values.map((v, i) => (
        <label key={MONTHS[i]}>
          {MONTHS[i]}
          <input
            name={`clear-${i + 1}`}
            inputMode="decimal"
            size={4}
            value={v}
            onInput={(e) => {
              const next = [...p.values];
              next[i] = e.currentTarget.value;
              p.onValues(next);
            }}
          />
        </label>
      ))}
    </div>
  );
}

function PriorForm({
  siteId,
  stats,
  onSaved,
}: {
  siteId: number;
  stats: Stats;
  onSaved: () => void;
}) {
  const [values, setValues] = useState(() =>
    stats.priors.map((p) => (p ? String(p.clearFraction) : '')),
  );
  const [strength, setStrength] = useState(
    String(stats.priors.find((p) => p !== null)?.strengthNights ?? 10),
  );
  const { busy, error, run } = useAction();
  const messages = fieldMessages(error);
  // What was sent: a refusal's "months.0" is the first month sent, not January.
  const [sent, setSent] = useState<{ month: number }[]>([]);
  return (
    <form
      class="prior-form"
      onSubmit={(e) => {
        e.preventDefault();
        void run(async () => {
          const months = priorMonths(values, Number(strength));
          setSent(months);
          await api.PUT('/sites/{id}/clear-prior', {
            params: { path: { id: siteId } },
            body: { months },
          });
          onSaved();
        });
      }}
    >
      <p class="muted">
        The share of night time you expect to be clear in each month (0 to 1; leave a month empty
        for none), and how many nights of log that belief is worth.
      </p>
      <PriorMonthInputs values={values} onValues={setValues} />
      <label>
        worth (nights){' '}
        <input
          name="strength"
          inputMode="decimal"
          size={4}
          value={strength}
          onInput={(e) => setStrength(e.currentTarget.value)}
        />
      </label>{' '}
      <button type="submit" disabled={busy}>
        Save the prior
      </button>
      {Object.entries(messages).map(([field, text]) => (
        <p class="error-line" key={field}>
          {fieldWords(field, { months: (i) => MONTH_NAMES[(sent[i]?.month ?? 0) - 1] })}: {text}
        </p>
      ))}
      {Object.keys(messages).length === 0 && <ErrorLine error={error} />}
    </form>
  );
}

/**
 * The prior from a CSV file or pasted text (columns month, clear_fraction, optional
 * strength_nights), sent as it is: the server reads it by the same rule as the CLI's --set-prior and
 * refuses a bad row by its line and column, storing nothing.
 */
function PriorCsvForm({ siteId, onSaved }: { siteId: number; onSaved: () => void }) {
  const [text, setText] = useState('');
  const [strength, setStrength] = useState('10');
  const { busy, error, run } = useAction();
  return (
    <form
      class="prior-csv-form"
      onSubmit={(e) => {
        e.preventDefault();
        void run(async () => {
          await api.PUT('/sites/{id}/clear-prior', {
            params: { path: { id: siteId } },
            body: { csv: text, strengthNights: Number(strength) },
          });
          onSaved();
        });
      }}
    >
      <p class="muted">
        Or from a CSV file: a header <code>month,clear_fraction</code> (and optionally{' '}
        <code>strength_nights</code>), one row per month (1–12) that has a prior; months left out
        have none. It replaces the whole prior.
      </p>
      <FileOrPaste
        fileName="prior-file"
        textName="prior-csv"
        accept=".csv,text/csv"
        rows={4}
        text={text}
        onText={setText}
      />
      <label>
        rows without <code>strength_nights</code> are worth (nights){' '}
        <input
          name="prior-csv-strength"
          inputMode="decimal"
          size={4}
          value={strength}
          onInput={(e) => setStrength(e.currentTarget.value)}
        />
      </label>{' '}
      <button type="submit" disabled={busy || text.trim() === ''}>
        Replace the prior from the CSV
      </button>
      <ErrorLine error={error} />
    </form>
  );
}

type Prior = Stats['priors'][number];

function MonthTable({ months, priors }: { months: Month[]; priors: Prior[] }) {
  return (
    <table class="data site-months">
      <thead>
        <tr>
          <th>month</th>
          <th>nights</th>
          <th>dark</th>
          <th>lost</th>
          <th>lost (log)</th>
          <th>loss (estimate ± 1σ)</th>
          <th>prior</th>
          <th>seeing (median, quartiles)</th>
          <th>Strehl ratio</th>
          <th>time lost to</th>
        </tr>
      </thead>
      <tbody>
        {months.map((m) => (
          <MonthLine key={m.month} m={m} prior={priors[m.month - 1] ?? null} />
        ))}
      </tbody>
    </table>
  );
}

/** One month's row: nights, hours, loss, prior, seeing, Strehl ratio and reasons. */
function MonthLine({ m, prior }: { m: Month; prior: Prior }) {
  return (
    <tr>
      <td>{MONTHS[m.month - 1]}</td>
      <td>{m.nights}</td>
      <td>
        <Qty v={m.darkHours} unit="h" />
      </td>
      <td>
        <Qty v={m.lostHours} unit="h" />
      </td>
      <td>
        {m.loggedLossFraction === null ? (
          <Blank why="no night logged in this month" />
        ) : (
          pct(m.loggedLossFraction)
        )}
      </td>
      <td>
        {pct(m.loss.mean)} ± {pct(m.loss.sigma)}
      </td>
      <td>
        {m.loss.prior === 'user'
          ? `clear ${pct(prior?.clearFraction)}, worth ${prior?.strengthNights} nights`
          : 'flat'}
      </td>
      <td>
        {m.seeingArcsec
          ? `${m.seeingArcsec.median.toFixed(2)}″ ` +
            `(${m.seeingArcsec.q25.toFixed(2)}–${m.seeingArcsec.q75.toFixed(2)}, ${m.seeingArcsec.n} n)`
          : blankWhy(m.nights, 'seeing')}
      </td>
      <td>
        {m.strehlRatio
          ? `${m.strehlRatio.median.toFixed(2)} (${m.strehlRatio.n} n)`
          : blankWhy(m.nights, 'a Strehl ratio')}
      </td>
      <td>
        {m.reasons.map((r) => `${r.reason}: ${r.hours.toFixed(1)} h, ${r.nights} n`).join('; ') ||
          (m.nights ? (
            <Blank why="no time lost on the nights logged" />
          ) : (
            <Blank why="no night logged in this month" />
          ))}
      </td>
    </tr>
  );
}

/** The clear-night prior: a lead edits it by month or from CSV; others read it. */
function PriorSection(p: { id: number; stats: Stats; lead: boolean; onSaved: () => void }) {
  const { stats } = p;
  return (
    <Section title="Clear-night prior" id="site-prior">
      {p.lead ? (
        <>
          {/* Keyed by the stored prior: a prior saved from CSV refills the month fields. */}
          <PriorForm
            key={JSON.stringify(stats.priors)}
            siteId={p.id}
            stats={stats}
            onSaved={p.onSaved}
          />
          <PriorCsvForm siteId={p.id} onSaved={p.onSaved} />
        </>
      ) : (
        <p class="muted">
          {stats.priors.some((x) => x !== null)
            ? stats.priors
                .map((x, i) => (x ? `${MONTHS[i]} ${pct(x.clearFraction)}` : null))
                .filter(Boolean)
                .join(' · ')
            : 'No prior: each month starts from a flat one.'}{' '}
          A lead can change it.
        </p>
      )}
    </Section>
  );
}

export function SiteView({ id }: { id: number }) {
  const { data, error, reload } = useLoad(
    () => api.GET('/sites/{id}/statistics', { params: { path: { id } } }),
    [id],
  );
  const lead = useCan('lead');
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the site’s statistics" />;
  const y = data.year;
  return (
    <div class="site-view">
      <h1>{data.site}</h1>
      <p class="site-summary">
        {y.nights} night reports: {y.lostHours.toFixed(1)} of {y.darkHours.toFixed(1)} dark hours
        lost ({pct(y.loggedLossFraction)}); over the year a night is clear with chance{' '}
        {pct(y.clearProbability)} ± {pct(y.loss.sigma)}.
      </p>
      <Section title="Clear nights by month" id="site-months">
        <MonthRibbon months={data.months} />
        <p class="muted legend">
          Filled: the chance a night is clear (what a weather-aware plan weighs each night by); bar:
          the log’s own clear share; bracket: ±1σ; hollow tiles rest on the prior alone. Rule:{' '}
          {data.rule}.
        </p>
        <MonthTable months={data.months} priors={data.priors} />
      </Section>
      <PrecisionSection precision={data.precision} />
      <PriorSection id={id} stats={data} lead={lead} onSaved={reload} />
    </div>
  );
}

/** Every site, each linking to its page. */
export function SitesView() {
  const { data, error } = useLoad(() => api.GET('/sites', { params: { query: {} } }), []);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the sites" />;
  return (
    <Section title="Sites" id="sites">
      <ul class="site-list">
        {data.items.map((s) => (
          <li key={s.id}>
            <a href={`/sites/${s.id}`}>{s.name}</a>{' '}
            <span class="muted">
              {s.latitudeDeg.toFixed(2)}°, {s.longitudeDeg.toFixed(2)}°, {s.elevationM} m ·{' '}
              {s.timeZone}
            </span>
          </li>
        ))}
      </ul>
    </Section>
  );
}
