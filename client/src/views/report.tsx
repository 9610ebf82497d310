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
  type Draft,
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

type Base = Draft['base'];
type Edit = (f: (d: ReportForm) => void) => void;
type Messages = Record<string, string>;

/** The form for a stored report (or none), each block's outcome starting from its logged status. */
function formMaker(blocks: BlockRow[]) {
  const logged = Object.fromEntries(blocks.map((b) => [b.id, b.status]));
  return (r: ReportRow | null) =>
    formOf(
      r,
      blocks.map((b) => b.id),
      logged,
    );
}

/** Sends the form: a first report for the night, or a new version of the one it started from. */
function sendReport(nightId: number, f: ReportForm, b: Base) {
  const body = bodyOf(f);
  return b
    ? api.PATCH('/night-reports/{id}', {
        params: { path: { id: b.id } },
        body: { ...body, version: b.version },
      })
    : api.POST('/night-reports', { body: { nightId, ...body } });
}

/** After a refused save: the newer stored report when the refusal was a version conflict. */
async function newerReport(e: unknown, nightId: number): Promise<ReportRow | null> {
  if (!(e instanceof ApiError && e.status === 409)) return null;
  return (await getAll('/night-reports', { nightId }))[0] ?? null;
}

/** A first base: the restored draft's, else the stored report's version, else none yet. */
const initialBase = (stored: Draft | null, report: ReportRow | null): Base =>
  stored ? stored.base : report ? { id: report.id, version: report.version } : null;

// The draft is written by the edit itself, never by an effect: an effect scheduled before a save
// could run after the save had dropped the draft and leave a stale one behind.
const keepDraft = (nightId: number, f: ReportForm, b: Base) =>
  writeDraft({ nightId, base: b, form: f, savedAt: new Date().toISOString() });

/** Where a save's outcome goes in the editor. */
interface SaveSteps {
  nightId: number;
  adopt: (row: ReportRow, words: string) => void;
  setStatus: (s: string) => void;
  setUnread: (m: Messages) => void;
  setTheirs: (r: ReportRow | null) => void;
  setError: (e: unknown) => void;
  onSaved: () => void;
}

/**
 * Saves the form as a new version of base (or a first report). Whatever keeps it from the server,
 * the draft stays in the browser; a version conflict shows the newer stored report beside it.
 */
async function saveReport(s: SaveSteps, f: ReportForm, b: Base) {
  s.setError(null);
  // A number the client cannot read is named here, never sent as empty: "1,5" must not vanish.
  const bad = numberProblems(f);
  s.setUnread(bad);
  if (Object.keys(bad).length) {
    keepDraft(s.nightId, f, b);
    s.setStatus('Not saved: correct the marked field; your draft is kept in this browser.');
    return;
  }
  s.setStatus('Saving…');
  try {
    const saved = await sendReport(s.nightId, f, b);
    s.setTheirs(null);
    s.adopt(
      saved,
      `Saved as version ${saved.version} at ${utcClock(new Date().toISOString())} UTC.`,
    );
    s.onSaved();
  } catch (e) {
    keepDraft(s.nightId, f, b);
    s.setStatus('Not saved: your draft is still kept in this browser.');
    const now = await newerReport(e, s.nightId);
    if (now) return s.setTheirs(now);
    s.setError(e);
  }
}

function Editor({ data, onSaved }: { data: Loaded; onSaved: () => void }) {
  const { night } = data;
  const formFor = formMaker(data.blocks);
  const stored = readDraft(night.id);
  const [restored] = useState(stored);
  const [base, setBase] = useState<Base>(initialBase(stored, data.report));
  const [form, setForm] = useState<ReportForm>(stored?.form ?? formFor(data.report));
  // The stored version this editor last read or wrote: what "Discard draft" returns to.
  const [storedRow, setStoredRow] = useState<ReportRow | null>(data.report);
  const [dirty, setDirty] = useState(!!stored);
  const [status, setStatus] = useState<string>('');
  const [error, setError] = useState<unknown>(null);
  const [theirs, setTheirs] = useState<ReportRow | null>(null);
  const [unread, setUnread] = useState<Messages>({});
  const edit: Edit = (f) => {
    const next = structuredClone(form);
    f(next);
    keepDraft(night.id, next, base);
    setForm(next);
    setDirty(true);
    setStatus('Draft kept in this browser; not saved yet.');
  };
  // Show a stored version (saved, taken from the server or returned to) with no draft left.
  const adopt = (row: ReportRow, words: string) => {
    dropDraft(night.id);
    setDirty(false);
    setBase({ id: row.id, version: row.version });
    setStoredRow(row);
    setForm(formFor(row));
    setStatus(words);
  };
  const steps = { nightId: night.id, adopt, setStatus, setUnread, setTheirs, setError, onSaved };
  const save = (f: ReportForm, b: Base) => saveReport(steps, f, b);
  return (
    <>
      {restored && <RestoredNotice restored={restored} />}
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
            setTheirs(null);
            adopt(
              theirs,
              `Took version ${theirs.version} from the server; your draft was discarded.`,
            );
          }}
        />
      )}
      <EditorForm
        data={data}
        form={form}
        messages={{ ...fieldMessages(error), ...unread }}
        edit={edit}
        status={status}
        base={base}
        error={error}
        onSave={() => save(form, base)}
        onDiscard={
          dirty && storedRow
            ? () => adopt(storedRow, 'Draft discarded; showing the stored version.')
            : null
        }
      />
    </>
  );
}

/** The report's fields and, for an observer, the save and discard controls. */
function EditorForm(p: {
  data: Loaded;
  form: ReportForm;
  messages: Messages;
  edit: Edit;
  status: string;
  base: Base;
  error: unknown;
  onSave: () => void;
  onDiscard: (() => void) | null;
}) {
  const canWrite = useCan('observer');
  const fields = { form: p.form, messages: p.messages, canWrite, edit: p.edit };
  return (
    <form
      class="report-form"
      onSubmit={(e) => {
        e.preventDefault();
        p.onSave();
      }}
      noValidate
    >
      <ConditionFields {...fields} />
      <OutcomeFields data={p.data} {...fields} />
      {canWrite && <EditorToolbar status={p.status} base={p.base} onDiscard={p.onDiscard} />}
      <ErrorLine error={p.error} />
    </form>
  );
}

function RestoredNotice({ restored }: { restored: Draft }) {
  return (
    <p class="notice" role="status">
      Restored an unsaved draft from {utcText(restored.savedAt)} UTC
      {restored.base ? `, started from version ${restored.base.version}` : ''}. Save it, or reload
      the stored version below.
    </p>
  );
}

type FieldsProps = { form: ReportForm; messages: Messages; canWrite: boolean; edit: Edit };

function ConditionFields({ form, messages, canWrite, edit }: FieldsProps) {
  return (
    <fieldset>
      <legend>Conditions</legend>
      <div class="field-grid">
        {CONDITION_FIELDS.map((k) => (
          <ConditionField
            key={k.key}
            k={k}
            form={form}
            messages={messages}
            canWrite={canWrite}
            edit={edit}
          />
        ))}
      </div>
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
  );
}

/** One condition, typed as text so a number the client cannot read stays visible and is named. */
function ConditionField({
  k,
  form,
  messages,
  canWrite,
  edit,
}: FieldsProps & { k: (typeof CONDITION_FIELDS)[number] }) {
  return (
    <label class={messages[k.key] ? 'field invalid' : 'field'}>
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
}

function OutcomeFields(p: FieldsProps & { data: Loaded }) {
  const { night, blocks } = p.data;
  return (
    <fieldset>
      <legend>Outcome of each block</legend>
      {blocks.length === 0 && (
        <p class="muted">
          No blocks are stored for this night.{' '}
          <a href={`/nights/${night.id}#add-block`}>Record the blocks that ran</a> on the night’s
          page first.
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
          {blocks.map((b, i) => (
            <OutcomeRow key={b.id} {...p} b={b} i={i} />
          ))}
        </tbody>
      </table>
    </fieldset>
  );
}

/** A block's outcome, exposure and notes; a message for its status or exposure shows beside it. */
function OutcomeRow({
  data,
  form,
  messages,
  canWrite,
  edit,
  b,
  i,
}: FieldsProps & { data: Loaded; b: BlockRow; i: number }) {
  const o = form.outcomes[b.id] ?? { status: '', exposureMinutes: '', notes: '' };
  const msg = messages[`outcomes.${i}.status`] ?? messages[`outcomes.${i}.exposureMinutes`];
  const set = (patch: Partial<typeof o>) =>
    edit((d) => {
      d.outcomes[b.id] = { ...(d.outcomes[b.id] ?? o), ...patch };
    });
  return (
    <tr data-block={b.id}>
      <BlockCells data={data} b={b} />
      <td>
        <select
          name={`outcome-${b.id}`}
          aria-label={`outcome of block ${b.id}`}
          value={o.status}
          disabled={!canWrite}
          onChange={(e) => set({ status: e.currentTarget.value })}
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
          onInput={(e) => set({ exposureMinutes: e.currentTarget.value })}
        />
        {msg && <span class="field-msg">{msg}</span>}
      </td>
      <td>
        <input
          aria-label={`notes on block ${b.id}`}
          value={o.notes}
          disabled={!canWrite}
          onInput={(e) => set({ notes: e.currentTarget.value })}
        />
      </td>
    </tr>
  );
}

/** Which block, and its times in UTC and the site's own zone. */
function BlockCells({ data, b }: { data: Loaded; b: BlockRow }) {
  const zone = data.cat.site(data.night.siteId)?.timeZone ?? 'UTC';
  return (
    <>
      <td>
        {data.cat.target(b.targetId)?.name} {b.kind}
        {b.laserGuideStar && <span class="tag lgs-tag">laser</span>}
      </td>
      <td>
        {utcClock(b.startUtc)}–{utcClock(b.endUtc)}
      </td>
      <td>
        {zoneClock(b.startUtc, zone)}–{zoneClock(b.endUtc, zone)}
      </td>
    </>
  );
}

function EditorToolbar(p: { status: string; base: Base; onDiscard: (() => void) | null }) {
  return (
    <div class="toolbar">
      <button type="submit" class="primary">
        Save report
      </button>
      {p.onDiscard && (
        <button type="button" onClick={p.onDiscard}>
          Discard draft
        </button>
      )}
      <span class="save-status" role="status">
        {p.status ||
          (p.base ? `Stored version ${p.base.version}.` : 'No report stored for this night yet.')}
      </span>
    </div>
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
