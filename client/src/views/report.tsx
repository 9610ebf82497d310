/**
 * The night report: conditions, time lost and why, the outcome of each block, and the
 * measurements obtained. The draft is kept in the browser until the server confirms a save; a
 * save that meets a newer stored version shows both and lets the writer choose field by field.
 */
import { useState } from 'preact/hooks';
import { ApiError, fieldMessages, getAll, api } from '../api/client.ts';
import { loadCatalogue, type Catalogue } from '../api/catalogue.ts';
import type { BlockRow, NightRow, ReportRow } from '../api/client.ts';
import { utcClock, utcText, zoneClock } from '../lib/time.ts';
import { Caution, ErrorLine, Loading, Section, useCan } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';
import { ReportConflict } from './report-conflict.tsx';
import {
  bodyOf,
  numberProblems,
  CONDITION_FIELDS,
  dropDraft,
  formOf,
  readDraft,
  writeDraft,
  type ReportForm,
} from './report-draft.ts';
import { ReportMeasurements } from './report-measurements.tsx';
import { ReplanPanel } from './replan-panel.tsx';

const STATUSES = ['obtained', 'partial', 'lost', 'withdrawn', 'planned'];

interface Loaded {
  cat: Catalogue;
  night: NightRow;
  blocks: BlockRow[];
  report: ReportRow | null;
}

async function load(nightId: number): Promise<Loaded> {
  const cat = await loadCatalogue();
  const night = await api.GET('/nights/{id}', { params: { path: { id: nightId } } });
  const [blocks, reports] = await Promise.all([
    getAll('/blocks', { nightId }),
    getAll('/night-reports', { nightId }),
  ]);
  return {
    cat,
    night,
    blocks: blocks.sort((a, b) => a.startUtc.localeCompare(b.startUtc)),
    report: reports[0] ?? null,
  };
}

function Editor({ data, onSaved }: { data: Loaded; onSaved: () => void }) {
  const { night, blocks, cat } = data;
  const logged = Object.fromEntries(blocks.map((b) => [b.id, b.status]));
  const formFor = (r: ReportRow | null) =>
    formOf(
      r,
      blocks.map((b) => b.id),
      logged,
    );
  const canWrite = useCan('observer');
  const zone = cat.site(night.siteId)?.timeZone ?? 'UTC';
  const stored = readDraft(night.id);
  const [restored] = useState(stored);
  const [base, setBase] = useState(
    stored
      ? stored.base
      : data.report
        ? { id: data.report.id, version: data.report.version }
        : null,
  );
  const [form, setForm] = useState<ReportForm>(stored?.form ?? formFor(data.report));
  // The stored version this editor last read or wrote: what "Discard draft" returns to.
  const [storedRow, setStoredRow] = useState<ReportRow | null>(data.report);
  const [dirty, setDirty] = useState(!!stored);
  const [status, setStatus] = useState<string>('');
  const [error, setError] = useState<unknown>(null);
  const [theirs, setTheirs] = useState<ReportRow | null>(null);
  const [unread, setUnread] = useState<Record<string, string>>({});
  const messages = { ...fieldMessages(error), ...unread };
  // The draft is written by the edit itself, never by an effect: an effect scheduled before a save
  // could run after the save had dropped the draft and leave a stale one behind.
  const keepDraft = (f: ReportForm, b: typeof base) =>
    writeDraft({ nightId: night.id, base: b, form: f, savedAt: new Date().toISOString() });
  const edit = (f: (d: ReportForm) => void) => {
    const next = structuredClone(form);
    f(next);
    keepDraft(next, base);
    setForm(next);
    setDirty(true);
    setStatus('Draft kept in this browser; not saved yet.');
  };
  const save = async (f: ReportForm, b: typeof base) => {
    setError(null);
    // A number the client cannot read is named here, never sent as empty: "1,5" must not vanish.
    const bad = numberProblems(f);
    setUnread(bad);
    if (Object.keys(bad).length) {
      keepDraft(f, b);
      setStatus('Not saved: correct the marked field; your draft is kept in this browser.');
      return;
    }
    setStatus('Saving…');
    try {
      const body = bodyOf(f);
      const saved = b
        ? await api.PATCH('/night-reports/{id}', {
            params: { path: { id: b.id } },
            body: { ...body, version: b.version },
          })
        : await api.POST('/night-reports', { body: { nightId: night.id, ...body } });
      dropDraft(night.id);
      setDirty(false);
      setTheirs(null);
      setBase({ id: saved.id, version: saved.version });
      setStoredRow(saved);
      setForm(formFor(saved));
      setStatus(`Saved as version ${saved.version} at ${utcClock(new Date().toISOString())} UTC.`);
      onSaved();
    } catch (e) {
      keepDraft(f, b);
      setStatus('Not saved: your draft is still kept in this browser.');
      if (e instanceof ApiError && e.status === 409) {
        const now = (await getAll('/night-reports', { nightId: night.id }))[0] ?? null;
        if (now) return setTheirs(now);
      }
      setError(e);
    }
  };
  const num = (k: (typeof CONDITION_FIELDS)[number]) => (
    <label key={k.key} class={messages[k.key] ? 'field invalid' : 'field'}>
      <span>
        {k.label} ({k.unit})
      </span>
      <input
        name={k.key}
        type="text"
        inputMode="decimal"
        min={k.min}
        max={k.max}
        step={k.step}
        value={form.conditions[k.key]}
        disabled={!canWrite}
        aria-invalid={!!messages[k.key]}
        aria-describedby={messages[k.key] ? `${k.key}-msg` : undefined}
        onInput={(e) =>
          edit((d) => {
            d.conditions[k.key] = e.currentTarget.value;
          })
        }
      />
      {messages[k.key] && (
        <span class="field-msg" id={`${k.key}-msg`}>
          {messages[k.key]}
        </span>
      )}
    </label>
  );
  return (
    <>
      {restored && (
        <p class="notice" role="status">
          Restored an unsaved draft from {utcText(restored.savedAt)} UTC
          {restored.base ? `, started from version ${restored.base.version}` : ''}. Save it, or
          reload the stored version below.
        </p>
      )}
      {theirs && (
        <ReportConflict
          mine={form}
          theirs={formFor(theirs)}
          theirsVersion={theirs.version}
          onResolve={(merged) => {
            setForm(merged);
            save(merged, { id: theirs.id, version: theirs.version });
          }}
          onTakeTheirs={() => {
            dropDraft(night.id);
            setDirty(false);
            setTheirs(null);
            setBase({ id: theirs.id, version: theirs.version });
            setStoredRow(theirs);
            setForm(formFor(theirs));
            setStatus(`Took version ${theirs.version} from the server; your draft was discarded.`);
          }}
        />
      )}
      <form
        class="report-form"
        onSubmit={(e) => {
          e.preventDefault();
          save(form, base);
        }}
        noValidate
      >
        <fieldset>
          <legend>Conditions</legend>
          <div class="field-grid">{CONDITION_FIELDS.map(num)}</div>
          <label class={messages.timeLostReason ? 'field wide invalid' : 'field wide'}>
            <span>why time was lost</span>
            <input
              name="timeLostReason"
              value={form.timeLostReason}
              disabled={!canWrite}
              onInput={(e) =>
                edit((d) => {
                  d.timeLostReason = e.currentTarget.value;
                })
              }
            />
            {messages.timeLostReason && <span class="field-msg">{messages.timeLostReason}</span>}
          </label>
          <label class="field wide">
            <span>notes</span>
            <textarea
              name="notes"
              rows={3}
              value={form.notes}
              disabled={!canWrite}
              onInput={(e) =>
                edit((d) => {
                  d.notes = e.currentTarget.value;
                })
              }
            />
          </label>
        </fieldset>
        <fieldset>
          <legend>Outcome of each block</legend>
          {blocks.length === 0 && (
            <p class="muted">
              No blocks are stored for this night.{' '}
              <a href={`/nights/${night.id}#add-block`}>Record the blocks that ran</a> on the
              night’s page first.
            </p>
          )}
          <table class="data outcomes">
            <thead>
              <tr>
                <th>block</th>
                <th>UTC</th>
                <th>local</th>
                <th>outcome</th>
                <th>exposure (min)</th>
                <th>notes</th>
              </tr>
            </thead>
            <tbody>
              {blocks.map((b, i) => {
                const o = form.outcomes[b.id] ?? { status: '', exposureMinutes: '', notes: '' };
                const msg =
                  messages[`outcomes.${i}.status`] ?? messages[`outcomes.${i}.exposureMinutes`];
                const set = (f: (x: typeof o) => void) =>
                  edit((d) => {
                    const x = { ...(d.outcomes[b.id] ?? o) };
                    f(x);
                    d.outcomes[b.id] = x;
                  });
                return (
                  <tr key={b.id} data-block={b.id}>
                    <td>
                      {cat.target(b.targetId)?.name} {b.kind}
                      {b.laserGuideStar && <span class="tag lgs-tag">laser</span>}
                    </td>
                    <td>
                      {utcClock(b.startUtc)}–{utcClock(b.endUtc)}
                    </td>
                    <td>
                      {zoneClock(b.startUtc, zone)}–{zoneClock(b.endUtc, zone)}
                    </td>
                    <td>
                      <select
                        name={`outcome-${b.id}`}
                        aria-label={`outcome of block ${b.id}`}
                        value={o.status}
                        disabled={!canWrite}
                        onChange={(e) =>
                          set((x) => {
                            x.status = e.currentTarget.value;
                          })
                        }
                      >
                        <option value="">(not reported)</option>
                        {STATUSES.map((s) => (
                          <option key={s} value={s}>
                            {s}
                          </option>
                        ))}
                      </select>
                    </td>
                    <td>
                      <input
                        type="number"
                        min={0}
                        max={1440}
                        aria-label={`exposure of block ${b.id}, minutes`}
                        value={o.exposureMinutes}
                        disabled={!canWrite}
                        onInput={(e) =>
                          set((x) => {
                            x.exposureMinutes = e.currentTarget.value;
                          })
                        }
                      />
                      {msg && <span class="field-msg">{msg}</span>}
                    </td>
                    <td>
                      <input
                        aria-label={`notes on block ${b.id}`}
                        value={o.notes}
                        disabled={!canWrite}
                        onInput={(e) =>
                          set((x) => {
                            x.notes = e.currentTarget.value;
                          })
                        }
                      />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </fieldset>
        {canWrite && (
          <div class="toolbar">
            <button type="submit" class="primary">
              Save report
            </button>
            {dirty && storedRow && (
              <button
                type="button"
                onClick={() => {
                  dropDraft(night.id);
                  setDirty(false);
                  setBase({ id: storedRow.id, version: storedRow.version });
                  setForm(formFor(storedRow));
                  setStatus('Draft discarded; showing the stored version.');
                }}
              >
                Discard draft
              </button>
            )}
            <span class="save-status" role="status">
              {status ||
                (base ? `Stored version ${base.version}.` : 'No report stored for this night yet.')}
            </span>
          </div>
        )}
        <ErrorLine error={error} />
      </form>
    </>
  );
}

export function ReportView({ nightId }: { nightId: number }) {
  const [tick, setTick] = useState(0);
  // A save reloads the night too, so the blocks' logged outcomes are the ones just saved.
  const { data, error } = useLoad(() => load(nightId), [nightId, tick]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the night report" />;
  const site = data.cat.site(data.night.siteId);
  return (
    <div class="view report">
      <div class="view-head">
        <h1>
          Night report: {site?.name}, night of {data.night.date}
        </h1>
        <p>
          <a href={`/nights/${nightId}`}>← the night’s plan</a>
        </p>
      </div>
      {data.blocks.some((b) => b.laserGuideStar) && (
        <Caution>
          This night used a laser guide star: record any propagation stops ordered by the site’s
          laser-traffic system or spotters under time lost.
        </Caution>
      )}
      <Section title="Report" id="report">
        <Editor data={data} onSaved={() => setTick(tick + 1)} />
      </Section>
      <Section title="Re-plan after lost time" id="replan">
        <ReplanPanel nightId={nightId} tick={tick} />
      </Section>
      <Section title="Measurements obtained" id="measurements">
        <ReportMeasurements blocks={data.blocks} cat={data.cat} tick={tick} />
      </Section>
    </div>
  );
}
