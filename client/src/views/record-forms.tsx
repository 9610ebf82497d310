/**
 * Leads add systems, sites and campaigns here. Each form posts one record; the server's 400/422
 * details are shown beside the field they name, the typed values stay for correcting, and nothing
 * is stored unless the whole record is accepted.
 */
import type { ComponentChildren } from 'preact';
import { useState } from 'preact/hooks';
import { fieldMessages, sendRecord } from '../api/client.ts';
import { invalidateCatalogue, type Catalogue } from '../api/catalogue.ts';
import type { HorizonPoint } from '../api/client.ts';
import { ErrorLine } from '../lib/ui.tsx';
import { SolutionForm } from './solution-form.tsx';
import { fieldWords } from '../lib/field-words.ts';
import { type FieldSpec, formFields } from './record-fields.ts';

type Value = string | boolean | number[];

/** "az alt, az alt, …" (degrees) → mask points, or the rule a pair breaks when it is not two numbers. */
export function parseMask(text: string): { points: HorizonPoint[] } | { rule: string } {
  const pairs = text
    .split(/[,;\n]/)
    .map((p) => p.trim())
    .filter(Boolean);
  const points: HorizonPoint[] = [];
  for (const [i, p] of pairs.entries()) {
    const nums = p.split(/\s+/).map(Number);
    if (nums.length !== 2 || nums.some((n) => !Number.isFinite(n)))
      return { rule: `pair ${i + 1} "${p}" must be two numbers: azimuth then altitude, degrees` };
    points.push({ azimuthDeg: nums[0]!, altitudeDeg: nums[1]! });
  }
  return { points };
}

/** Set a dotted path in a plain object, creating the objects on the way. */
function setPath(body: Record<string, unknown>, path: string, v: unknown): void {
  const keys = path.split('.');
  let o = body;
  for (const k of keys.slice(0, -1)) {
    o[k] ??= {};
    o = o[k] as Record<string, unknown>;
  }
  o[keys[keys.length - 1]!] = v;
}

/** The request body from the form's values, or the first field the client itself cannot read. */
export function bodyOf(
  fields: FieldSpec[],
  values: Record<string, Value>,
): { body: Record<string, unknown> } | { field: string; rule: string } {
  const body: Record<string, unknown> = {};
  for (const f of fields) {
    const v = values[f.key];
    if (f.kind === 'boolean' || f.kind === 'ids') setPath(body, f.key, v);
    else if (f.kind === 'mask') {
      const m = parseMask(String(v ?? ''));
      if ('rule' in m) return { field: f.key, rule: m.rule };
      if (m.points.length) setPath(body, f.key, m.points);
    } else {
      const s = String(v ?? '').trim();
      if (s === '' && f.optional) continue;
      if (f.kind === 'number') {
        const n = s === '' ? NaN : Number(s);
        if (!Number.isFinite(n))
          return { field: f.key, rule: `${JSON.stringify(s)} must be a number` };
        setPath(body, f.key, n);
      } else setPath(body, f.key, f.toValue ? f.toValue(s) : s);
    }
  }
  return { body };
}

/** Server messages keyed by the form field whose path prefixes theirs (horizonMask.2.altitudeDeg → horizonMask). */
export function messagesByField(
  fields: FieldSpec[],
  raw: Record<string, string>,
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [path, msg] of Object.entries(raw)) {
    const f = fields.find((x) => path === x.key || path.startsWith(`${x.key}.`));
    const key = f?.key ?? '(form)';
    const text = f && path !== f.key ? `${fieldWords(path)}: ${msg}` : msg;
    out[key] = out[key] ? `${out[key]}; ${text}` : text;
  }
  return out;
}

const initialOf = (fields: FieldSpec[]) =>
  Object.fromEntries(
    fields.map((f) => [
      f.key,
      f.initial ?? (f.kind === 'boolean' ? false : f.kind === 'ids' ? [] : ''),
    ]),
  ) as Record<string, Value>;

/** The checkboxes of an `ids` field: one per stored record it may name. */
function IdChoices({
  f,
  chosen,
  set,
}: {
  f: FieldSpec;
  chosen: number[];
  set: (k: string, v: Value) => void;
}) {
  return (
    // biome-ignore lint/a11y/useSemanticElements: an inline group inside the form's grid row; a fieldset would break the row
    <span class="id-choices" role="group" aria-label={f.label}>
      {(f.options ?? []).map((o) => {
        const id = Number(o.value);
        return (
          <label key={id} class="inline">
            <input
              type="checkbox"
              checked={chosen.includes(id)}
              onChange={(e) =>
                set(
                  f.key,
                  e.currentTarget.checked ? [...chosen, id] : chosen.filter((x) => x !== id),
                )
              }
            />{' '}
            {o.label}
          </label>
        );
      })}
    </span>
  );
}

/** The control of one field, by its kind; `msgId` names the message beside it when there is one. */
function FieldInput({
  f,
  v,
  msgId,
  set,
}: {
  f: FieldSpec;
  v: Value | undefined;
  msgId: string | undefined;
  set: (k: string, v: Value) => void;
}) {
  const common = { name: f.key, 'aria-invalid': !!msgId, 'aria-describedby': msgId };
  const text = (e: { currentTarget: { value: string } }) => set(f.key, e.currentTarget.value);
  switch (f.kind) {
    case 'boolean':
      return (
        <input
          type="checkbox"
          {...common}
          checked={Boolean(v)}
          onChange={(e) => set(f.key, e.currentTarget.checked)}
        />
      );
    case 'select':
      return (
        <select {...common} value={String(v)} onChange={text}>
          {f.options!.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      );
    case 'textarea':
    case 'mask':
      return <textarea {...common} rows={2} value={String(v)} onInput={text} />;
    case 'ids':
      return <IdChoices f={f} chosen={v as number[]} set={set} />;
    case 'number':
      return <input {...common} type="number" step="any" value={String(v)} onInput={text} />;
    case 'date':
      return <input {...common} type="date" value={String(v)} onInput={text} />;
    default:
      return <input {...common} type="text" value={String(v)} onInput={text} />;
  }
}

/** One field: its label, control, hint and the message the server or the client gave it. */
function FieldRow({
  f,
  msg,
  msgId,
  children,
}: {
  f: FieldSpec;
  msg: string | undefined;
  msgId: string;
  children: ComponentChildren;
}) {
  // A list of checkboxes holds labels of its own, so its wrapper cannot be a label.
  const Wrap = f.kind === 'ids' ? 'div' : 'label';
  const wide = f.kind === 'ids' || f.kind === 'mask' || f.kind === 'textarea';
  return (
    <Wrap class={`field${wide ? ' wide' : ''}${msg ? ' invalid' : ''}`}>
      <span>
        {f.label}
        {f.optional ? <span class="muted"> (optional)</span> : null}
      </span>
      {children}
      {f.hint && <span class="muted hint">{f.hint}</span>}
      {msg && (
        <span class="field-msg" id={msgId}>
          {msg}
        </span>
      )}
    </Wrap>
  );
}

/** The Add button and what came of the last try: the record made, or why nothing was stored. */
function FormOutcome({
  busy,
  created,
  unplaced,
  error,
  marked,
  refused,
}: {
  busy: boolean;
  created: string | null;
  unplaced: string | undefined;
  error: unknown;
  /** Some field carries a message, so the general error line is not needed. */
  marked: boolean;
  refused: boolean;
}) {
  return (
    <>
      <div class="toolbar">
        <button type="submit" class="primary" disabled={busy}>
          Add
        </button>
        {created && (
          <span class="created" role="status">
            {created}
          </span>
        )}
      </div>
      {unplaced && (
        <p class="field-msg" role="alert">
          {unplaced}
        </p>
      )}
      {error !== null && !marked ? <ErrorLine error={error} /> : null}
      {refused && <p class="muted">Nothing was stored; correct the marked fields and add again.</p>}
    </>
  );
}

export function CreateForm({
  title,
  path,
  fields,
  onCreated,
}: {
  title: string;
  path: string;
  fields: FieldSpec[];
  onCreated: () => void;
}) {
  const [values, setValues] = useState(() => initialOf(fields));
  const [error, setError] = useState<unknown>(null);
  const [local, setLocal] = useState<{ field: string; rule: string } | null>(null);
  const [created, setCreated] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const msgs = {
    ...messagesByField(fields, fieldMessages(error)),
    ...(local ? { [local.field]: local.rule } : {}),
  };
  const set = (k: string, v: Value) => setValues({ ...values, [k]: v });
  const submit = async (e: Event) => {
    e.preventDefault();
    setError(null);
    setLocal(null);
    setCreated(null);
    const b = bodyOf(fields, values);
    if ('field' in b) return setLocal(b);
    setBusy(true);
    try {
      const row = await sendRecord('POST', path, b.body);
      setValues(initialOf(fields));
      setCreated(`${row.name} added (#${row.id}).`);
      invalidateCatalogue();
      onCreated();
    } catch (err) {
      setError(err);
    } finally {
      setBusy(false);
    }
  };
  const msgIdOf = (f: FieldSpec) => `${path.slice(1)}-${f.key}-msg`;
  return (
    <form class="create-form" aria-label={title} onSubmit={submit} noValidate>
      <fieldset>
        <legend>{title}</legend>
        <div class="field-grid">
          {fields.map((f) => (
            <FieldRow key={f.key} f={f} msg={msgs[f.key]} msgId={msgIdOf(f)}>
              <FieldInput
                f={f}
                v={values[f.key]}
                msgId={msgs[f.key] ? msgIdOf(f) : undefined}
                set={set}
              />
            </FieldRow>
          ))}
        </div>
        <FormOutcome
          busy={busy}
          created={created}
          unplaced={msgs['(form)']}
          error={error}
          marked={Object.keys(msgs).length > 0}
          refused={error !== null || local !== null}
        />
      </fieldset>
    </form>
  );
}

/** The forms of the records page (leads only): systems, targets, orbit solutions, sites, campaigns. */
export function CreateRecords({ cat, onCreated }: { cat: Catalogue; onCreated: () => void }) {
  return (
    <div class="create-records">
      <CreateForm
        title="New system"
        path="/systems"
        fields={formFields('systems', cat)}
        onCreated={onCreated}
      />
      {cat.systems.length > 0 && (
        <CreateForm
          key={cat.systems.length}
          title="New target"
          path="/targets"
          fields={formFields('targets', cat)}
          onCreated={onCreated}
        />
      )}
      {cat.targets.length > 0 && <SolutionForm cat={cat} onCreated={onCreated} />}
      <CreateForm
        title="New site"
        path="/sites"
        fields={formFields('sites', cat)}
        onCreated={onCreated}
      />
      <CreateForm
        title="New campaign"
        path="/campaigns"
        fields={formFields('campaigns', cat)}
        onCreated={onCreated}
      />
    </div>
  );
}
