/** The ephemeris of a target as a table, and the same rows as a CSV file from the server. */
import { useState } from 'preact/hooks';
import { api, downloadFile, type Answer } from '../api/client.ts';
import { utcText } from '../lib/time.ts';
import { ErrorLine, Loading, Qty } from '../lib/ui.tsx';
import { RV_WHY } from '../lib/numbers.ts';
import { useLoad } from '../lib/use-load.ts';

type Range = { start: string; end: string; step: string };
type Ephemeris = Answer<'/targets/{id}/ephemeris', 'get'>;

/** The dates and step of the table, and the CSV download of the same rows. */
function RangeForm({
  form,
  setForm,
  onCompute,
  onDownload,
}: {
  form: Range;
  setForm: (r: Range) => void;
  onCompute: () => void;
  onDownload: () => void;
}) {
  return (
    <form
      class="row-form"
      onSubmit={(e) => {
        e.preventDefault();
        onCompute();
      }}
    >
      <label>
        from (UTC date){' '}
        <input
          type="date"
          value={form.start}
          onInput={(e) => setForm({ ...form, start: e.currentTarget.value })}
        />
      </label>
      <label>
        to (UTC date){' '}
        <input
          type="date"
          value={form.end}
          onInput={(e) => setForm({ ...form, end: e.currentTarget.value })}
        />
      </label>
      <label>
        step (ISO 8601, e.g. P30D, PT12H){' '}
        <input
          value={form.step}
          size={6}
          onInput={(e) => setForm({ ...form, step: e.currentTarget.value })}
        />
      </label>
      <button type="submit">Compute</button>
      <button type="button" onClick={onDownload}>
        Download CSV
      </button>
    </form>
  );
}

function PredictionRow({
  p,
  binary,
  photocentre,
}: {
  p: Ephemeris['predictions'][number];
  binary: boolean;
  photocentre: boolean;
}) {
  return (
    <tr>
      <td>{utcText(p.epoch)}</td>
      <td>
        <Qty v={p.dRaMas} unit="" digits={2} />
      </td>
      <td>
        <Qty v={p.dDecMas} unit="" digits={2} />
      </td>
      <td>
        <Qty v={p.separationMas} unit="" digits={2} />
      </td>
      <td>
        <Qty v={p.positionAngleDeg} unit="" digits={2} />
      </td>
      <td>
        <Qty v={p.radialVelocityKmS} unit="" digits={2} why={RV_WHY} />
      </td>
      {binary && (
        <>
          <td class="rv-primary">
            <Qty v={p.primaryRadialVelocityKmS} unit="" digits={2} />
          </td>
          <td class="rv-secondary">
            <Qty v={p.secondaryRadialVelocityKmS} unit="" digits={2} />
          </td>
        </>
      )}
      {photocentre && (
        <>
          <td>
            <Qty v={p.photocentreDRaMas} unit="" digits={3} />
          </td>
          <td>
            <Qty v={p.photocentreDDecMas} unit="" digits={3} />
          </td>
        </>
      )}
    </tr>
  );
}

/** One row per epoch; the component velocities and the photocentre only where the orbit has them. */
function PredictionTable({ data }: { data: Ephemeris }) {
  return (
    <div class="scroll">
      <table class="data ephemeris">
        <thead>
          <tr>
            <th>epoch (UTC)</th>
            <th>Δα* (mas)</th>
            <th>Δδ (mas)</th>
            <th>separation (mas)</th>
            <th>PA (°)</th>
            <th>v_r (km/s)</th>
            {data.orbit.binary && (
              <>
                <th>v₁ primary (km/s)</th>
                <th>v₂ secondary (km/s)</th>
              </>
            )}
            {data.orbit.binary?.lightFraction != null && (
              <>
                <th>photocentre Δα* (mas)</th>
                <th>photocentre Δδ (mas)</th>
              </>
            )}
          </tr>
        </thead>
        <tbody>
          {data.predictions.map((p) => (
            <PredictionRow
              key={p.jd}
              p={p}
              binary={!!data.orbit.binary}
              photocentre={data.orbit.binary?.lightFraction != null}
            />
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function EphemerisTable({ targetId, name }: { targetId: number; name: string }) {
  const today = new Date().toISOString().slice(0, 10);
  const nextYear = new Date(Date.now() + 365.25 * 86_400_000).toISOString().slice(0, 10);
  const [form, setForm] = useState({ start: today, end: nextYear, step: 'P30D' });
  const [query, setQuery] = useState(form);
  const [csvError, setCsvError] = useState<unknown>(null);
  const q = { start: `${query.start}T00:00:00Z`, end: `${query.end}T00:00:00Z`, step: query.step };
  const { data, error } = useLoad(
    () => api.GET('/targets/{id}/ephemeris', { params: { path: { id: targetId }, query: q } }),
    [targetId, query.start, query.end, query.step],
  );
  const download = async () => {
    setCsvError(null);
    try {
      await downloadFile(
        '/targets/{id}/ephemeris',
        { params: { path: { id: targetId }, query: { ...q, format: 'csv' } } },
        `${name.replace(/\W+/g, '-')}-ephemeris.csv`,
      );
    } catch (e) {
      setCsvError(e);
    }
  };
  return (
    <>
      <RangeForm
        form={form}
        setForm={setForm}
        onCompute={() => setQuery(form)}
        onDownload={download}
      />
      <ErrorLine error={error ?? csvError} />
      {!data ? !error && <Loading what="the ephemeris" /> : <PredictionTable data={data} />}
    </>
  );
}
