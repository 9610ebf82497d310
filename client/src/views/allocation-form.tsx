/**
 * A campaign's nights in bulk: from a pattern (a site, a date range, weekdays or every N nights,
 * a semester label), a CSV file (site, date, semester) or the telescope's schedule as an
 * iCalendar file. Preview first (drawn on the calendar, each refusal with its reason), then a
 * lead stores every new night at once, or none when any is refused.
 */
import type { ComponentChildren } from 'preact';
import { useState } from 'preact/hooks';
import { api, type CampaignRow, type Schemas } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import { plural } from '../lib/words.ts';
import { useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';
import { problemLines } from '../lib/problems.ts';
import { FileOrPaste } from '../lib/file-or-paste.tsx';

type Preview = Schemas['AllocationPreview'];
type Request = Schemas['AllocationRequest'];
type Source = Request['source'];
const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

/** The dates of a pattern source: a range and either chosen weekdays or a step in nights. */
type Pattern = {
  start: string;
  end: string;
  repeat: 'weekdays' | 'every';
  weekdays: number[];
  every: string;
};
type PatternPatch = (patch: Partial<Pattern>) => void;

const SOURCES = [
  ['pattern', 'a pattern of dates'],
  ['csv', 'a CSV file'],
  ['calendar', 'the telescope’s calendar (iCalendar file)'],
] as const;
const CSV_HINT =
  'Header row first: site (a site’s name or id), date (YYYY-MM-DD, the evening’s local date), ' +
  'semester (optional).';
const CALENDAR_HINT =
  'An event covers the nights of the local evenings it overlaps; an all-day event, each of its ' +
  'dates; repeating events are expanded to the campaign’s end; cancelled ones are left out.';

/** The request the server previews and stores; one builder so both see the same nights. */
function allocationRequest(
  source: Source,
  f: { siteId: number; text: string; match: string; semester: string; pattern: Pattern },
): Request {
  const label = f.semester.trim() ? { semester: f.semester.trim() } : {};
  if (source === 'csv') return { source, text: f.text };
  if (source === 'calendar')
    return {
      source,
      siteId: f.siteId,
      text: f.text,
      ...(f.match.trim() ? { match: f.match.trim() } : {}),
      ...label,
    };
  const { start, end, repeat, weekdays, every } = f.pattern;
  return {
    source,
    siteId: f.siteId,
    start,
    end,
    ...(repeat === 'weekdays' ? { weekdays } : { step: `P${Number(every)}D` }),
    ...label,
  };
}

export function AllocationForm(p: {
  campaign: CampaignRow;
  cat: Catalogue;
  preview: Preview | null;
  onPreview: (x: Preview | null) => void;
  onStored: () => void;
}) {
  const { campaign, cat } = p;
  const [source, setSource] = useState<Source>('pattern');
  const [siteId, setSiteId] = useState(campaign.siteIds[0] ?? 0);
  const [pattern, setPattern] = useState<Pattern>({
    start: campaign.startDate,
    end: campaign.endDate,
    repeat: 'weekdays',
    weekdays: [1, 2, 3, 4, 5, 6, 7],
    every: '1',
  });
  const [semester, setSemester] = useState('');
  const [text, setText] = useState('');
  const [match, setMatch] = useState('');
  const [stored, setStored] = useState('');
  const { busy, error, run } = useAction();
  const request = () => allocationRequest(source, { siteId, text, match, semester, pattern });
  // Preview and store send the same request; the path alone says which.
  const preview = () =>
    run(async () => {
      setStored('');
      p.onPreview(
        await api.POST('/campaigns/{id}/allocations/preview', {
          params: { path: { id: campaign.id } },
          body: request(),
        }),
      );
    });
  const store = () =>
    run(async () => {
      const r = await api.POST('/campaigns/{id}/allocations', {
        params: { path: { id: campaign.id } },
        body: request(),
      });
      setStored(storedWords(r));
      p.onStored();
    });
  const sites = campaign.siteIds.map((id) => cat.site(id)).filter((s) => s !== undefined);
  return (
    <div class="allocation-form">
      <SourceChoice
        source={source}
        onSource={(v) => {
          // A preview drawn from another source no longer matches the form.
          setSource(v);
          p.onPreview(null);
        }}
      />
      <SourceFields
        source={source}
        siteChoice={<SiteChoice sites={sites} siteId={siteId} onSiteId={setSiteId} />}
        semesterField={<SemesterField semester={semester} onSemester={setSemester} />}
        pattern={pattern}
        onPatch={(patch) => setPattern({ ...pattern, ...patch })}
        match={match}
        onMatch={setMatch}
        text={text}
        onText={setText}
      />
      <AllocationToolbar
        busy={busy}
        counts={p.preview?.counts}
        stored={stored}
        onPreview={preview}
        onStore={store}
      />
      {error !== null && <NothingStored error={error} />}
      {p.preview && <AllocationPreview preview={p.preview} />}
    </div>
  );
}

/** The fields of the chosen source; the site and semester fields are shared by two sources. */
function SourceFields(p: {
  source: Source;
  siteChoice: ComponentChildren;
  semesterField: ComponentChildren;
  pattern: Pattern;
  onPatch: PatternPatch;
  match: string;
  onMatch: (v: string) => void;
  text: string;
  onText: (t: string) => void;
}) {
  return (
    <div class="field-grid">
      {p.source === 'pattern' && (
        <>
          {p.siteChoice}
          <PatternFields pattern={p.pattern} onPatch={p.onPatch} semesterField={p.semesterField} />
        </>
      )}
      {p.source === 'csv' && (
        <AllocationText accept=".csv,text/csv" hint={CSV_HINT} text={p.text} onText={p.onText} />
      )}
      {p.source === 'calendar' && (
        <>
          {p.siteChoice}
          {p.semesterField}
          <MatchField match={p.match} onMatch={p.onMatch} />
          <AllocationText
            accept=".ics,text/calendar"
            hint={CALENDAR_HINT}
            text={p.text}
            onText={p.onText}
          />
        </>
      )}
    </div>
  );
}

/** Preview, then (for a lead, once a preview has no refusals and something new) store. */
function AllocationToolbar(p: {
  busy: boolean;
  counts: Preview['counts'] | undefined;
  stored: string;
  onPreview: () => void;
  onStore: () => void;
}) {
  const lead = useCan('lead');
  const { busy, counts } = p;
  return (
    <div class="toolbar">
      <button type="button" disabled={busy} onClick={p.onPreview}>
        Preview
      </button>
      {lead && counts && (
        <button
          type="button"
          class="primary"
          disabled={busy || counts.refused > 0 || counts.new === 0}
          onClick={p.onStore}
        >
          Store {plural(counts.new, 'new night')}
        </button>
      )}
      {!lead && <span class="muted">Storing nights needs the lead role.</span>}
      {p.stored && (
        <span class="save-status" role="status">
          {p.stored}
        </span>
      )}
    </div>
  );
}

function storedWords(r: { created: unknown[]; counts: { allocated: number } }): string {
  const already = r.counts.allocated
    ? `; ${plural(r.counts.allocated, 'night was', 'nights were')} already allocated`
    : '';
  return `Stored ${plural(r.created.length, 'new night')}${already}.`;
}

function SourceChoice(p: { source: Source; onSource: (v: Source) => void }) {
  return (
    <fieldset class="source-choice">
      <legend>nights from</legend>
      {SOURCES.map(([v, label]) => (
        <label key={v} class="inline">
          <input
            type="radio"
            name="allocation-source"
            value={v}
            checked={p.source === v}
            onChange={() => p.onSource(v)}
          />{' '}
          {label}
        </label>
      ))}
    </fieldset>
  );
}

function SiteChoice(p: {
  sites: { id: number; name: string }[];
  siteId: number;
  onSiteId: (id: number) => void;
}) {
  return (
    <label class="field">
      <span>site</span>
      <select
        name="allocation-site"
        value={p.siteId}
        onChange={(e) => p.onSiteId(Number(e.currentTarget.value))}
      >
        {p.sites.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </select>
    </label>
  );
}

function SemesterField(p: { semester: string; onSemester: (v: string) => void }) {
  return (
    <label class="field">
      <span>semester label (optional)</span>
      <input
        name="semester"
        value={p.semester}
        placeholder="2027A"
        maxLength={40}
        onInput={(e) => p.onSemester(e.currentTarget.value)}
      />
    </label>
  );
}

function MatchField(p: { match: string; onMatch: (v: string) => void }) {
  return (
    <label class="field">
      <span>only events mentioning (optional)</span>
      <input
        name="match"
        value={p.match}
        placeholder="the programme’s name"
        onInput={(e) => p.onMatch(e.currentTarget.value)}
      />
    </label>
  );
}

function AllocationText(p: {
  accept: string;
  hint: string;
  text: string;
  onText: (t: string) => void;
}) {
  return (
    <FileOrPaste
      fileName="allocation-file"
      textName="allocation-text"
      accept={p.accept}
      rows={5}
      text={p.text}
      onText={p.onText}
      hint={p.hint}
    />
  );
}

/** The date range, then the semester field between it and the repeat rule (the form's order). */
function PatternFields(p: {
  pattern: Pattern;
  onPatch: PatternPatch;
  semesterField: ComponentChildren;
}) {
  const { start, end } = p.pattern;
  return (
    <>
      <label class="field">
        <span>first night</span>
        <input
          type="date"
          name="start"
          value={start}
          onInput={(e) => p.onPatch({ start: e.currentTarget.value })}
        />
      </label>
      <label class="field">
        <span>last night (included)</span>
        <input
          type="date"
          name="end"
          value={end}
          onInput={(e) => p.onPatch({ end: e.currentTarget.value })}
        />
      </label>
      {p.semesterField}
      <div class="field wide">
        <WeekdayRule pattern={p.pattern} onPatch={p.onPatch} />
        <StepRule pattern={p.pattern} onPatch={p.onPatch} />
      </div>
    </>
  );
}

function WeekdayRule(p: { pattern: Pattern; onPatch: PatternPatch }) {
  const { repeat, weekdays } = p.pattern;
  return (
    <span>
      <label class="inline">
        <input
          type="radio"
          name="repeat"
          checked={repeat === 'weekdays'}
          onChange={() => p.onPatch({ repeat: 'weekdays' })}
        />{' '}
        evenings of these weekdays:
      </label>{' '}
      {WEEKDAYS.map((w, i) => (
        <label key={w} class="inline weekday">
          <input
            type="checkbox"
            name={`weekday-${w}`}
            disabled={repeat !== 'weekdays'}
            checked={weekdays.includes(i + 1)}
            onChange={(e) =>
              p.onPatch({
                weekdays: e.currentTarget.checked
                  ? [...weekdays, i + 1].sort()
                  : weekdays.filter((x) => x !== i + 1),
              })
            }
          />
          {w}
        </label>
      ))}
    </span>
  );
}

function StepRule(p: { pattern: Pattern; onPatch: PatternPatch }) {
  const { repeat, every } = p.pattern;
  return (
    <span>
      <label class="inline">
        <input
          type="radio"
          name="repeat"
          checked={repeat === 'every'}
          onChange={() => p.onPatch({ repeat: 'every' })}
        />{' '}
        every
      </label>{' '}
      <input
        type="number"
        name="stepNights"
        min={1}
        max={366}
        value={every}
        disabled={repeat !== 'every'}
        aria-label="every how many nights"
        onInput={(e) => p.onPatch({ every: e.currentTarget.value })}
      />{' '}
      nights from the first
    </span>
  );
}

function NothingStored({ error }: { error: unknown }) {
  return (
    <div role="alert" class="error-line">
      {problemLines(error).map((l) => (
        <p key={l}>{l}</p>
      ))}
      <p class="muted">Nothing was stored.</p>
    </div>
  );
}

function previewSummary(counts: Preview['counts']): string {
  if (counts.refused > 0)
    return ': nothing can be stored until each refused night is mended or left out of the source.';
  return counts.new > 0 ? '. Nothing is stored until you store it.' : '.';
}

/** What a preview found: the counts, then each night that is new or refused (allocated ones are left out). */
function AllocationPreview({ preview }: { preview: Preview }) {
  const { counts } = preview;
  const listed = preview.nights.filter((n) => n.state !== 'allocated');
  return (
    <div class="allocation-preview" role="status">
      <p>
        {plural(counts.new, 'new night')}, {plural(counts.allocated, 'night')} already allocated,{' '}
        {plural(counts.refused, 'refused', 'refused')}
        {previewSummary(counts)}
      </p>
      {listed.length > 0 && (
        <div class="scroll">
          <table class="data">
            <thead>
              <tr>
                <th>night</th>
                <th>site</th>
                <th>semester</th>
                <th>from</th>
                <th>outcome</th>
              </tr>
            </thead>
            <tbody>
              {listed.map((n) => (
                <tr key={`${n.siteId}/${n.date}`} class={`allocation-${n.state}`}>
                  <td>{n.date}</td>
                  <td>{n.site}</td>
                  <td>{n.semester || <span class="muted">none given</span>}</td>
                  <td>{n.foundIn}</td>
                  <td>{n.state === 'new' ? 'new' : `refused: ${n.reason}`}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
