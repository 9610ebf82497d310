/**
 * Systems, targets, orbit solutions and sites: everyone reads them; leads change a record in
 * place, add systems, sites and campaigns, and import CSV files, with every bad row listed and
 * nothing written when any row fails.
 */
import { useState } from 'preact/hooks';
import { ApiError, fieldMessages, api, sendRecord, type Answer } from '../api/client.ts';
import {
  type Catalogue,
  elementText,
  invalidateCatalogue,
  loadCatalogue,
  semiMajorAxisText,
} from '../api/catalogue.ts';
import { Caution, ErrorLine, Loading, Section, useCan } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';
import { CreateRecords } from './record-forms.tsx';
import { OrbitExport } from './orbit-export.tsx';
import { RecordExports } from './record-exports.tsx';
import { RELATIVITY_WORDS } from '../lib/numbers.ts';
import { type Column, tableColumns } from './record-fields.ts';
import { plural } from '../lib/words.ts';

type Row = Record<string, unknown> & { id: number };
const plainNumber = (v: number) => String(Number(v.toPrecision(8)));

/** The form text each editable column starts from when a row is opened for editing. */
function editValues(cols: Column[], r: Row): Record<string, string | boolean> {
  return Object.fromEntries(
    cols
      .filter((c) => c.editable)
      .map((c) => [
        c.key,
        c.editable === 'boolean'
          ? Boolean(r[c.key])
          : c.editable === 'angle' && typeof r[c.key] === 'number'
            ? c.format!(r[c.key] as number)
            : r[c.key] === null || r[c.key] === undefined
              ? ''
              : String(r[c.key]),
      ]),
  );
}

/** Only the fields the user changed: angles go as typed, empty numbers as null. */
function changedFields(
  cols: Column[],
  values: Record<string, string | boolean>,
  r: Row,
): Record<string, unknown> {
  const patch: Record<string, unknown> = {};
  for (const c of cols.filter((x) => x.editable)) {
    const v = values[c.key];
    if (c.editable === 'angle') {
      const text = String(v).trim();
      if (text !== c.format!(r[c.key] as number)) patch[c.key] = text;
      continue;
    }
    const next = c.editable === 'number' ? (v === '' ? null : Number(v)) : v;
    if (next !== r[c.key]) patch[c.key] = next;
  }
  return patch;
}

function shownValue(c: Column, v: unknown): string {
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'number') return (c.format ?? plainNumber)(v);
  return String(v ?? c.empty ?? 'not given');
}

function EditField({
  col: c,
  value,
  message,
  onChange,
}: {
  col: Column;
  value: string | boolean | undefined;
  message: string | undefined;
  onChange: (v: string | boolean) => void;
}) {
  return (
    <>
      {c.editable === 'boolean' ? (
        <input
          type="checkbox"
          aria-label={c.label}
          checked={Boolean(value)}
          onChange={(e) => onChange(e.currentTarget.checked)}
        />
      ) : (
        <input
          aria-label={c.label}
          name={c.key}
          {...({ type: c.editable === 'number' ? 'number' : 'text' } as object)}
          step="any"
          value={String(value ?? '')}
          aria-invalid={!!message}
          onInput={(e) => onChange(e.currentTarget.value)}
        />
      )}
      {message && <span class="field-msg">{message}</span>}
    </>
  );
}

function RowActions({
  editing,
  onEdit,
  onSave,
  onCancel,
}: {
  editing: boolean;
  onEdit: () => void;
  onSave: () => void;
  onCancel: () => void;
}) {
  return (
    <td class="actions">
      {editing ? (
        <>
          <button type="button" class="primary" onClick={onSave}>
            Save
          </button>
          <button type="button" onClick={onCancel}>
            Cancel
          </button>
        </>
      ) : (
        <button type="button" onClick={onEdit}>
          Edit
        </button>
      )}
    </td>
  );
}

function RecordTable({
  path,
  rows,
  cols,
  onSaved,
}: {
  path: string;
  rows: Row[];
  cols: Column[];
  onSaved: () => void;
}) {
  const lead = useCan('lead');
  const [editing, setEditing] = useState<number | null>(null);
  const [values, setValues] = useState<Record<string, string | boolean>>({});
  const [error, setError] = useState<unknown>(null);
  const msgs = fieldMessages(error);
  const start = (r: Row) => {
    setEditing(r.id);
    setError(null);
    setValues(editValues(cols, r));
  };
  const save = async (r: Row) => {
    const patch = changedFields(cols, values, r);
    try {
      if (Object.keys(patch).length) await sendRecord('PATCH', `${path}/${r.id}`, patch);
      setEditing(null);
      invalidateCatalogue();
      onSaved();
    } catch (e) {
      setError(e);
    }
  };
  return (
    <table class="data records">
      <thead>
        <tr>
          {cols.map((c) => (
            <th key={c.key}>{c.label}</th>
          ))}
          {lead && <th>change</th>}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id} data-id={r.id}>
            {cols.map((c) => (
              <td key={c.key}>
                {editing === r.id && c.editable ? (
                  <EditField
                    col={c}
                    value={values[c.key]}
                    message={msgs[c.key]}
                    onChange={(v) => setValues({ ...values, [c.key]: v })}
                  />
                ) : (
                  shownValue(c, r[c.key])
                )}
              </td>
            ))}
            {lead && (
              <RowActions
                editing={editing === r.id}
                onEdit={() => start(r)}
                onSave={() => save(r)}
                onCancel={() => setEditing(null)}
              />
            )}
          </tr>
        ))}
      </tbody>
      {error !== null && !Object.keys(msgs).length ? (
        <caption>
          <ErrorLine error={error} />
        </caption>
      ) : null}
    </table>
  );
}

type ImportReport = Answer<'/imports/{kind}', 'post'>;

function CsvImport({ onDone }: { onDone: () => void }) {
  const [kind, setKind] = useState<ImportReport['kind']>('measurements');
  const [text, setText] = useState('');
  const [report, setReport] = useState<ImportReport | null>(null);
  const [error, setError] = useState<unknown>(null);
  const run = async (dryRun: boolean) => {
    setError(null);
    setReport(null);
    try {
      setReport(
        await api.POST('/imports/{kind}', {
          params: { path: { kind }, query: { dryRun: dryRun ? 'true' : 'false' } },
          body: text,
          contentType: 'text/csv',
        }),
      );
      if (!dryRun) {
        invalidateCatalogue();
        onDone();
      }
    } catch (e) {
      if (e instanceof ApiError && (e.details as ImportReport | undefined)?.problems)
        setReport(e.details as ImportReport);
      else setError(e);
    }
  };
  const readFile = async (f: File | undefined) => f && setText(await f.text());
  return (
    <div class="csv-import">
      <div class="toolbar">
        <label class="inline">
          kind{' '}
          <select
            value={kind}
            onChange={(e) => setKind(e.currentTarget.value as ImportReport['kind'])}
          >
            <option value="targets">targets</option>
            <option value="orbits">orbit solutions</option>
            <option value="measurements">measurements</option>
          </select>
        </label>
        <label class="inline">
          file{' '}
          <input
            type="file"
            accept=".csv,text/csv"
            onChange={(e) => readFile(e.currentTarget.files?.[0])}
          />
        </label>
      </div>
      <label class="field wide">
        <span>CSV text (header row first)</span>
        <textarea rows={6} value={text} onInput={(e) => setText(e.currentTarget.value)} />
      </label>
      <div class="toolbar">
        <button type="button" onClick={() => run(true)}>
          Check only
        </button>
        <button type="button" class="primary" onClick={() => run(false)}>
          Import all rows
        </button>
      </div>
      <ErrorLine error={error} />
      {report && <ImportResult report={report} />}
    </div>
  );
}

/** What an import or check found: a one-line verdict, then every bad cell. */
function ImportResult({ report }: { report: ImportReport }) {
  return (
    <div class={report.problems.length ? 'import-report bad' : 'import-report good'} role="status">
      {report.problems.length ? (
        <p>
          {plural(report.problems.length, 'problem')} in {plural(report.rows, 'row')}; nothing was
          written.
        </p>
      ) : (
        <p>
          {plural(report.rows, 'row')}{' '}
          {report.dryRun
            ? 'checked, all good; nothing written yet'
            : `imported (${report.written} written)`}
          .
        </p>
      )}
      {report.problems.length > 0 && (
        <table class="data">
          <thead>
            <tr>
              <th>line</th>
              <th>column</th>
              <th>value</th>
              <th>rule</th>
            </tr>
          </thead>
          <tbody>
            {report.problems.map((p, i) => (
              <tr key={i}>
                <td>{p.line}</td>
                <td>{p.column}</td>
                <td>{JSON.stringify(p.value)}</td>
                <td>{p.rule}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

/** Every orbit solution of every target, the current one of each marked. */
function SolutionTable({ cat }: { cat: Catalogue }) {
  return (
    <table class="data">
      <thead>
        <tr>
          <th>target</th>
          <th>version</th>
          <th>provenance</th>
          <th>reference</th>
          <th>P (yr)</th>
          <th>e</th>
          <th>a (″)</th>
          <th>relativistic terms</th>
        </tr>
      </thead>
      <tbody>
        {cat.solutions.map((s) => (
          <tr key={s.id} class={s.current ? 'current' : ''}>
            <td>
              <a href={`/targets/${s.targetId}`}>{cat.target(s.targetId)?.name}</a>
            </td>
            <td>
              v{s.version}
              {s.current && <span class="tag">current</span>}
            </td>
            <td>{s.provenance}</td>
            <td>{s.reference || <span class="muted">none given</span>}</td>
            <td>{elementText(s, 'periodYears')}</td>
            <td>{elementText(s, 'eccentricity')}</td>
            <td>{semiMajorAxisText(s)}</td>
            <td>
              {Object.entries(s.orbit.relativity ?? {})
                .filter(([, v]) => v)
                .map(([k]) => RELATIVITY_WORDS[k] ?? k)
                .join(', ') || 'none'}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function RecordsView() {
  const lead = useCan('lead');
  const [tick, setTick] = useState(0);
  const { data: cat, error } = useLoad(loadCatalogue, [tick]);
  if (error) return <ErrorLine error={error} />;
  if (!cat) return <Loading what="the records" />;
  const reload = () => setTick(tick + 1);
  const targets: Row[] = cat.targets.map((t) => ({
    ...t,
    systemName: cat.system(t.systemId)?.name,
  }));
  return (
    <div class="view records">
      <div class="view-head">
        <h1>Records</h1>
        <p class="muted">
          {lead
            ? 'You are a lead: you can change and add records and import CSV files.'
            : 'Read only: changing records needs the lead role.'}
        </p>
      </div>
      <Section title="Systems" id="systems">
        <RecordTable
          path="/systems"
          rows={cat.systems}
          cols={tableColumns('systems')}
          onSaved={reload}
        />
      </Section>
      <Section title="Targets" id="targets">
        <RecordTable
          path="/targets"
          rows={targets}
          cols={tableColumns('targets')}
          onSaved={reload}
        />
        <p>
          {cat.targets.map((t) => (
            <a key={t.id} class="chip" href={`/targets/${t.id}`}>
              {t.name} →
            </a>
          ))}
        </p>
      </Section>
      <Section title="Orbit solutions" id="orbit-solutions">
        <SolutionTable cat={cat} />
        <p class="muted">
          New versions come from a fit on a target’s page, the form below or a CSV import (σ columns
          and a correlations cell carry the covariance); a target’s page switches the current one.
        </p>
        <OrbitExport />
      </Section>
      <Section title="Sites" id="sites">
        <RecordTable path="/sites" rows={cat.sites} cols={tableColumns('sites')} onSaved={reload} />
        {cat.sites.some((s) => s.laserGuideStar) && (
          <Caution>
            Sites marked “laser guide star”: aircraft and satellite avoidance follow the site’s
            laser-traffic rules and the local aviation authority, not this tool.
          </Caution>
        )}
      </Section>
      <Section title="Export and back up" id="exports">
        <RecordExports cat={cat} />
      </Section>
      {lead && (
        <Section title="Add a record" id="create">
          <CreateRecords cat={cat} onCreated={reload} />
        </Section>
      )}
      {lead && (
        <Section title="Import a CSV file" id="import">
          <CsvImport onDone={reload} />
        </Section>
      )}
    </div>
  );
}
