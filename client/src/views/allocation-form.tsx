/**
 * A campaign's nights in bulk: from a pattern (a site, a date range, weekdays or every N nights,
 * a semester label), a CSV file (site, date, semester) or the telescope's schedule as an
 * iCalendar file. Preview first (drawn on the calendar, each refusal with its reason), then a
 * lead stores every new night at once, or none when any is refused.
 */
import { useState } from 'preact/hooks';
import { api, type CampaignRow, type Schemas } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import { plural } from '../lib/words.ts';
import { useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';
import { problemLines } from '../lib/problems.ts';

type Preview = Schemas['AllocationPreview'];
type Request = Schemas['AllocationRequest'];
type Source = Request['source'];
const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

export function AllocationForm(p: {
  campaign: CampaignRow;
  cat: Catalogue;
  preview: Preview | null;
  onPreview: (x: Preview | null) => void;
  onStored: () => void;
}) {
  const lead = useCan('lead');
  const { campaign, cat } = p;
  const [source, setSource] = useState<Source>('pattern');
  const [siteId, setSiteId] = useState(campaign.siteIds[0] ?? 0);
  const [start, setStart] = useState(campaign.startDate);
  const [end, setEnd] = useState(campaign.endDate);
  const [repeat, setRepeat] = useState<'weekdays' | 'every'>('weekdays');
  const [weekdays, setWeekdays] = useState<number[]>([1, 2, 3, 4, 5, 6, 7]);
  const [every, setEvery] = useState('1');
  const [semester, setSemester] = useState('');
  const [text, setText] = useState('');
  const [match, setMatch] = useState('');
  const [stored, setStored] = useState('');
  const { busy, error, run } = useAction();
  const request = (): Request => {
    const label = semester.trim() ? { semester: semester.trim() } : {};
    if (source === 'csv') return { source, text };
    if (source === 'calendar')
      return { source, siteId, text, ...(match.trim() ? { match: match.trim() } : {}), ...label };
    return {
      source,
      siteId,
      start,
      end,
      ...(repeat === 'weekdays' ? { weekdays } : { step: `P${Number(every)}D` }),
      ...label,
    };
  };
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
      setStored(
        `Stored ${plural(r.created.length, 'new night')}${r.counts.allocated ? `; ${plural(r.counts.allocated, 'night was', 'nights were')} already allocated` : ''}.`,
      );
      p.onStored();
    });
  const readFile = async (f: File | undefined) => f && setText(await f.text());
  const sites = campaign.siteIds.map((id) => cat.site(id)).filter((s) => s !== undefined);
  const siteChoice = (
    <label class="field">
      <span>site</span>
      <select
        name="allocation-site"
        value={siteId}
        onChange={(e) => setSiteId(Number(e.currentTarget.value))}
      >
        {sites.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </select>
    </label>
  );
  const semesterField = (
    <label class="field">
      <span>semester label (optional)</span>
      <input
        name="semester"
        value={semester}
        placeholder="2027A"
        maxLength={40}
        onInput={(e) => setSemester(e.currentTarget.value)}
      />
    </label>
  );
  const fileFields = (accept: string, hint: string) => (
    <>
      <label class="field">
        <span>file</span>
        <input
          type="file"
          name="allocation-file"
          accept={accept}
          onChange={(e) => readFile(e.currentTarget.files?.[0])}
        />
      </label>
      <label class="field wide">
        <span>or paste its text</span>
        <textarea
          name="allocation-text"
          rows={5}
          value={text}
          onInput={(e) => setText(e.currentTarget.value)}
        />
        <span class="muted hint">{hint}</span>
      </label>
    </>
  );
  const counts = p.preview?.counts;
  const listed = (p.preview?.nights ?? []).filter((n) => n.state !== 'allocated');
  return (
    <div class="allocation-form">
      <fieldset class="source-choice">
        <legend>nights from</legend>
        {(
          [
            ['pattern', 'a pattern of dates'],
            ['csv', 'a CSV file'],
            ['calendar', 'the telescope’s calendar (iCalendar file)'],
          ] as const
        ).map(([v, label]) => (
          <label key={v} class="inline">
            <input
              type="radio"
              name="allocation-source"
              value={v}
              checked={source === v}
              onChange={() => {
                setSource(v);
                p.onPreview(null);
              }}
            />{' '}
            {label}
          </label>
        ))}
      </fieldset>
      <div class="field-grid">
        {source === 'pattern' && (
          <>
            {siteChoice}
            <label class="field">
              <span>first night</span>
              <input
                type="date"
                name="start"
                value={start}
                onInput={(e) => setStart(e.currentTarget.value)}
              />
            </label>
            <label class="field">
              <span>last night (included)</span>
              <input
                type="date"
                name="end"
                value={end}
                onInput={(e) => setEnd(e.currentTarget.value)}
              />
            </label>
            {semesterField}
            <div class="field wide">
              <span>
                <label class="inline">
                  <input
                    type="radio"
                    name="repeat"
                    checked={repeat === 'weekdays'}
                    onChange={() => setRepeat('weekdays')}
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
                        setWeekdays(
                          e.currentTarget.checked
                            ? [...weekdays, i + 1].sort()
                            : weekdays.filter((x) => x !== i + 1),
                        )
                      }
                    />
                    {w}
                  </label>
                ))}
              </span>
              <span>
                <label class="inline">
                  <input
                    type="radio"
                    name="repeat"
                    checked={repeat === 'every'}
                    onChange={() => setRepeat('every')}
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
                  onInput={(e) => setEvery(e.currentTarget.value)}
                />{' '}
                nights from the first
              </span>
            </div>
          </>
        )}
        {source === 'csv' &&
          fileFields(
            '.csv,text/csv',
            'Header row first: site (a site’s name or id), date (YYYY-MM-DD, the evening’s local date), semester (optional).',
          )}
        {source === 'calendar' && (
          <>
            {siteChoice}
            {semesterField}
            <label class="field">
              <span>only events mentioning (optional)</span>
              <input
                name="match"
                value={match}
                placeholder="the programme’s name"
                onInput={(e) => setMatch(e.currentTarget.value)}
              />
            </label>
            {fileFields(
              '.ics,text/calendar',
              'An event covers the nights of the local evenings it overlaps; an all-day event, each of its dates; repeating events are expanded to the campaign’s end; cancelled ones are left out.',
            )}
          </>
        )}
      </div>
      <div class="toolbar">
        <button type="button" disabled={busy} onClick={preview}>
          Preview
        </button>
        {lead && p.preview && counts && (
          <button
            type="button"
            class="primary"
            disabled={busy || counts.refused > 0 || counts.new === 0}
            onClick={store}
          >
            Store {plural(counts.new, 'new night')}
          </button>
        )}
        {!lead && <span class="muted">Storing nights needs the lead role.</span>}
        {stored && (
          <span class="save-status" role="status">
            {stored}
          </span>
        )}
      </div>
      {error !== null && (
        <div role="alert" class="error-line">
          {problemLines(error).map((l) => (
            <p key={l}>{l}</p>
          ))}
          <p class="muted">Nothing was stored.</p>
        </div>
      )}
      {p.preview && counts && (
        <div class="allocation-preview" role="status">
          <p>
            {plural(counts.new, 'new night')}, {plural(counts.allocated, 'night')} already
            allocated, {plural(counts.refused, 'refused', 'refused')}
            {counts.refused > 0
              ? ': nothing can be stored until each refused night is mended or left out of the source.'
              : counts.new > 0
                ? '. Nothing is stored until you store it.'
                : '.'}
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
      )}
    </div>
  );
}
