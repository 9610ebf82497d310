/** Measurements tied to the night's blocks, and a form to add one (field-level messages from the server). */
import { useState } from 'preact/hooks';
import {
  COMPONENT_TEXT,
  CORRELATION_FIELD,
  MEASUREMENT_KIND_NAMES,
  UNIT_TEXT,
  describeKind,
  type MeasuredComponent,
} from '../../../descriptors/measurement-kinds.ts';
import { fieldMessages, getAll, sendRecord } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import type { BlockRow, MeasurementRow } from '../api/client.ts';
import { utcText } from '../lib/time.ts';
import { ErrorLine, Loading, Qty, useCan } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';

type Kind = MeasurementRow['kind'];
/** The component in a table cell: its meaning without the form's aside. */
const componentWords = (c: MeasuredComponent) => COMPONENT_TEXT[c].replace(/ \(.*\)$/, '');
/** The form's inputs for a kind: its values, their uncertainties, and the correlation where it has one. */
function kindInputs(kind: Kind): { key: string; label: string }[] {
  const d = describeKind(kind);
  return [
    ...d.values.map((v) => ({ key: v.field, label: v.label })),
    ...d.values.map((v) => ({ key: v.sigma, label: `σ ${v.symbol} (${UNIT_TEXT[v.unit]})` })),
    ...(d.correlated ? [{ key: CORRELATION_FIELD, label: 'correlation (−1–1)' }] : []),
  ];
}

/** The middle of a block, the epoch a measurement takes when none is typed. */
const middleOf = (b: BlockRow) =>
  new Date((Date.parse(b.startUtc) + Date.parse(b.endUtc)) / 2).toISOString();

/**
 * The measurement to post: the kind's typed numbers, the body picked (the kind's first when it
 * does not allow that one), and the epoch typed or else the block's middle.
 */
function measurementBody(
  block: BlockRow,
  kind: Kind,
  component: MeasuredComponent,
  values: Record<string, string>,
): Record<string, unknown> {
  const components = describeKind(kind).components;
  const nums = Object.fromEntries(
    kindInputs(kind)
      .filter((f) => (values[f.key] ?? '') !== '')
      .map((f) => [f.key, Number(values[f.key])]),
  );
  return {
    targetId: block.targetId,
    blockId: block.id,
    kind,
    component: components.includes(component) ? component : components[0]!,
    epoch: values.epoch || middleOf(block),
    instrument: values.instrument ?? '',
    ...nums,
  };
}

/** One typed value of the form, with the server's message beside it. */
function MeasureField({
  name,
  label,
  type,
  value,
  message,
  onInput,
}: {
  name: string;
  label: string;
  type: 'number' | 'text';
  value: string;
  message: string | undefined;
  onInput: (v: string) => void;
}) {
  return (
    <label class={message ? 'field invalid' : 'field'}>
      <span>{label}</span>
      <input
        name={name}
        {...({ type } as object)}
        step="any"
        value={value}
        aria-invalid={!!message}
        onInput={(e) => onInput(e.currentTarget.value)}
      />
      {message && <span class="field-msg">{message}</span>}
    </label>
  );
}

function ComponentChoice({
  component,
  components,
  message,
  onComponent,
}: {
  component: MeasuredComponent;
  components: readonly MeasuredComponent[];
  message: string | undefined;
  onComponent: (c: MeasuredComponent) => void;
}) {
  return (
    <label class={message ? 'field invalid' : 'field'}>
      <span>of which body</span>
      <select
        name="component"
        value={component}
        onChange={(e) => onComponent(e.currentTarget.value as MeasuredComponent)}
      >
        {components.map((c) => (
          <option key={c} value={c}>
            {COMPONENT_TEXT[c]}
          </option>
        ))}
      </select>
      {message && <span class="field-msg">{message}</span>}
    </label>
  );
}

/** Which block, which kind of measurement and, where the kind allows several, which body. */
function MeasurementChoices({
  blocks,
  cat,
  blockId,
  kind,
  component,
  components,
  message,
  onBlock,
  onKind,
  onComponent,
}: {
  blocks: BlockRow[];
  cat: Catalogue;
  blockId: number;
  kind: Kind;
  component: MeasuredComponent;
  components: readonly MeasuredComponent[];
  message: string | undefined;
  onBlock: (id: number) => void;
  onKind: (k: Kind) => void;
  onComponent: (c: MeasuredComponent) => void;
}) {
  return (
    <>
      <label class="field">
        <span>block</span>
        <select value={blockId} onChange={(e) => onBlock(Number(e.currentTarget.value))}>
          {blocks.map((b) => (
            <option key={b.id} value={b.id}>
              {cat.target(b.targetId)?.name} {b.kind} {b.startUtc.slice(11, 16)} UTC
            </option>
          ))}
        </select>
      </label>
      <label class="field">
        <span>kind</span>
        <select value={kind} onChange={(e) => onKind(e.currentTarget.value as Kind)}>
          {MEASUREMENT_KIND_NAMES.map((k) => (
            <option key={k} value={k}>
              {describeKind(k).label}
            </option>
          ))}
        </select>
      </label>
      {components.length > 1 && (
        <ComponentChoice
          component={component}
          components={components}
          message={message}
          onComponent={onComponent}
        />
      )}
    </>
  );
}

function AddMeasurement({
  blocks,
  cat,
  onAdded,
}: {
  blocks: BlockRow[];
  cat: Catalogue;
  onAdded: () => void;
}) {
  const first = blocks[0]!;
  const [blockId, setBlockId] = useState(first.id);
  const [kind, setKind] = useState<Kind>(
    MEASUREMENT_KIND_NAMES.find((k) => describeKind(k).blockKind === first.kind) ?? 'offsets',
  );
  const [component, setComponent] = useState<MeasuredComponent>('relative');
  const [values, setValues] = useState<Record<string, string>>({ instrument: '' });
  const components = describeKind(kind).components;
  const [error, setError] = useState<unknown>(null);
  const msgs = fieldMessages(error);
  const block = blocks.find((b) => b.id === blockId) ?? first;
  const mid = middleOf(block);
  const submit = async (e: Event) => {
    e.preventDefault();
    setError(null);
    try {
      await sendRecord('POST', '/measurements', measurementBody(block, kind, component, values));
      setValues({ instrument: values.instrument ?? '' });
      onAdded();
    } catch (err) {
      setError(err);
    }
  };
  const field = (key: string, label: string, type: 'number' | 'text' = 'number') => (
    <MeasureField
      key={key}
      name={key}
      label={label}
      type={type}
      value={values[key] ?? ''}
      message={msgs[key]}
      onInput={(v) => setValues({ ...values, [key]: v })}
    />
  );
  return (
    <form class="measurement-form" onSubmit={submit} noValidate>
      <div class="field-grid">
        <MeasurementChoices
          blocks={blocks}
          cat={cat}
          blockId={blockId}
          kind={kind}
          component={component}
          components={components}
          message={msgs.component}
          onBlock={setBlockId}
          onKind={setKind}
          onComponent={setComponent}
        />
        {field(
          'epoch',
          `epoch (ISO 8601 with its zone or offset, JD, MJD, or a decimal year; empty: the block’s ` +
            `middle, ${mid.slice(11, 16)} UTC)`,
          'text',
        )}
        {kindInputs(kind).map((f) => field(f.key, f.label))}
        {field('instrument', 'instrument', 'text')}
      </div>
      <button type="submit">Add measurement</button>
      <ErrorLine error={error} />
    </form>
  );
}

export function ReportMeasurements({
  blocks,
  cat,
  tick,
}: {
  blocks: BlockRow[];
  cat: Catalogue;
  tick: number;
}) {
  const canWrite = useCan('observer');
  const [added, setAdded] = useState(0);
  const { data, error } = useLoad(
    async () =>
      (await Promise.all(blocks.map((b) => getAll('/measurements', { blockId: b.id })))).flat(),
    [blocks.map((b) => b.id).join(), tick, added],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="measurements" />;
  // Each quantity with its 1σ, in the kind's own units.
  const value = (m: MeasurementRow) =>
    describeKind(m.kind).values.map((v, i) => (
      <span key={v.field}>
        {i > 0 && ', '}
        {v.symbol}{' '}
        <Qty
          v={m[v.field as keyof MeasurementRow] as number | null}
          unit={UNIT_TEXT[v.unit]}
          digits={2}
        />{' '}
        ±{' '}
        <Qty
          v={m[v.sigma as keyof MeasurementRow] as number | null}
          unit={UNIT_TEXT[v.unit]}
          digits={2}
        />
      </span>
    ));
  return (
    <>
      {data.length === 0 ? (
        <p class="muted">No measurements linked to this night’s blocks yet.</p>
      ) : (
        <table class="data">
          <thead>
            <tr>
              <th>target</th>
              <th>epoch (UTC)</th>
              <th>kind</th>
              <th>of</th>
              <th>value</th>
              <th>instrument</th>
            </tr>
          </thead>
          <tbody>
            {data.map((m) => (
              <tr key={m.id}>
                <td>
                  <a href={`/targets/${m.targetId}`}>{cat.target(m.targetId)?.name}</a>
                </td>
                <td>{utcText(m.epoch)}</td>
                <td>{describeKind(m.kind).label}</td>
                <td>{componentWords(m.component)}</td>
                <td>{value(m)}</td>
                <td>{m.instrument}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canWrite && blocks.length > 0 && (
        <AddMeasurement blocks={blocks} cat={cat} onAdded={() => setAdded(added + 1)} />
      )}
    </>
  );
}
