/** Measurements tied to the night's blocks, and a form to add one (field-level messages from the server). */
import { useState } from 'preact/hooks';
import { fieldMessages, getAll, sendRecord } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import type { BlockRow, MeasurementRow } from '../api/client.ts';
import { utcText } from '../lib/time.ts';
import { ErrorLine, Loading, Qty, useCan } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';

type Kind = MeasurementRow['kind'];
const KIND_FIELDS: Record<Kind, { key: string; label: string }[]> = {
  offsets: [
    { key: 'dRaMas', label: 'Δα* (mas, east +)' },
    { key: 'dDecMas', label: 'Δδ (mas, north +)' },
    { key: 'sigmaDRaMas', label: 'σ Δα* (mas)' },
    { key: 'sigmaDDecMas', label: 'σ Δδ (mas)' },
    { key: 'correlation', label: 'correlation (−1–1)' },
  ],
  separation: [
    { key: 'separationMas', label: 'separation (mas)' },
    { key: 'positionAngleDeg', label: 'position angle (°, N through E)' },
    { key: 'sigmaSeparationMas', label: 'σ separation (mas)' },
    { key: 'sigmaPositionAngleDeg', label: 'σ position angle (°)' },
  ],
  'radial-velocity': [
    { key: 'radialVelocityKmS', label: 'v_r (km/s, receding +)' },
    { key: 'sigmaRadialVelocityKmS', label: 'σ v_r (km/s)' },
  ],
};

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
    first.kind === 'spectroscopy' ? 'radial-velocity' : 'offsets',
  );
  const [values, setValues] = useState<Record<string, string>>({ instrument: '' });
  const [error, setError] = useState<unknown>(null);
  const msgs = fieldMessages(error);
  const block = blocks.find((b) => b.id === blockId) ?? first;
  const mid = new Date((Date.parse(block.startUtc) + Date.parse(block.endUtc)) / 2).toISOString();
  const submit = async (e: Event) => {
    e.preventDefault();
    setError(null);
    const nums = Object.fromEntries(
      KIND_FIELDS[kind]
        .filter((f) => (values[f.key] ?? '') !== '')
        .map((f) => [f.key, Number(values[f.key])]),
    );
    try {
      await sendRecord('POST', '/measurements', {
        targetId: block.targetId,
        blockId: block.id,
        kind,
        epoch: values.epoch || mid,
        instrument: values.instrument ?? '',
        ...nums,
      });
      setValues({ instrument: values.instrument ?? '' });
      onAdded();
    } catch (err) {
      setError(err);
    }
  };
  const field = (key: string, label: string, type: 'number' | 'text' = 'number') => (
    <label key={key} class={msgs[key] ? 'field invalid' : 'field'}>
      <span>{label}</span>
      <input
        name={key}
        {...({ type } as object)}
        step="any"
        value={values[key] ?? ''}
        aria-invalid={!!msgs[key]}
        onInput={(e) => setValues({ ...values, [key]: e.currentTarget.value })}
      />
      {msgs[key] && <span class="field-msg">{msgs[key]}</span>}
    </label>
  );
  return (
    <form class="measurement-form" onSubmit={submit} noValidate>
      <div class="field-grid">
        <label class="field">
          <span>block</span>
          <select value={blockId} onChange={(e) => setBlockId(Number(e.currentTarget.value))}>
            {blocks.map((b) => (
              <option key={b.id} value={b.id}>
                {cat.target(b.targetId)?.name} {b.kind} {b.startUtc.slice(11, 16)} UTC
              </option>
            ))}
          </select>
        </label>
        <label class="field">
          <span>kind</span>
          <select value={kind} onChange={(e) => setKind(e.currentTarget.value as Kind)}>
            <option value="offsets">offsets Δα*, Δδ</option>
            <option value="separation">separation and position angle</option>
            <option value="radial-velocity">radial velocity</option>
          </select>
        </label>
        {field('epoch', `epoch (ISO 8601 UTC; empty: block middle ${mid.slice(11, 16)})`, 'text')}
        {KIND_FIELDS[kind].map((f) => field(f.key, f.label))}
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
  const value = (m: MeasurementRow) =>
    m.kind === 'offsets' ? (
      <>
        Δα* <Qty v={m.dRaMas} unit="mas" digits={2} />, Δδ{' '}
        <Qty v={m.dDecMas} unit="mas" digits={2} /> (σ <Qty v={m.sigmaDRaMas} unit="" digits={2} />,{' '}
        <Qty v={m.sigmaDDecMas} unit="mas" digits={2} />)
      </>
    ) : m.kind === 'separation' ? (
      <>
        <Qty v={m.separationMas} unit="mas" digits={2} /> at{' '}
        <Qty v={m.positionAngleDeg} unit="°" digits={2} />
      </>
    ) : (
      <>
        <Qty v={m.radialVelocityKmS} unit="km/s" digits={1} /> ±{' '}
        <Qty v={m.sigmaRadialVelocityKmS} unit="km/s" digits={1} />
      </>
    );
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
                <td>{m.kind}</td>
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
