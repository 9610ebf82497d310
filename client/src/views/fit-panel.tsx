/**
 * Feed the measurements back into the orbit: fit the target's stored measurements (a preview,
 * nothing stored), compare the fitted track with the current one on the sky plane, and as a lead
 * store the fit as the target's new current solution version (earlier versions stay).
 */
import { plural } from '../lib/words.ts';
import { useState } from 'preact/hooks';
import { api, type Answer } from '../api/client.ts';
import { invalidateCatalogue } from '../api/catalogue.ts';
import type { Prediction } from '../api/client.ts';
import { isoOfJd, utcText } from '../lib/time.ts';
import { fieldWords } from '../lib/field-words.ts';
import { valueText } from '../lib/numbers.ts';
import { Blank, ErrorLine, Qty, useCan } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';

type FitPreview = Answer<'/targets/{id}/fit', 'post'>;

/**
 * The element T is the passage at the star (emitted time); the next periapsis is when its light
 * reaches us (observed time), earlier or later by the light-travel time across the orbit when the
 * orbit includes it. The labels say which is which.
 */
const parameterWords = (name: string) =>
  name.endsWith('.periapsisDays') || name === 'periapsisDays'
    ? `${fieldWords(name)}, periapsis at the star (emitted time)`
    : fieldWords(name);

/** Hours from T (plus whole periods) to the next periapsis as observed: the Rømer delay there. */
function lightTimeHours(r: FitPreview['result']): number | null {
  const star = r.stars[0];
  const at = (key: string) =>
    r.parameters.find((p) => p.name === `${star?.name}.${key}` || p.name === key)?.value;
  const [t, period] = [at('periapsisDays'), at('periodYears')];
  if (!star || t === undefined || period === undefined) return null;
  const next = Date.parse(star.nextPeriapsis) / 86_400_000 + 2440587.5;
  const p = period * 365.25;
  return (next - (t + Math.round((next - t) / p) * p)) * 24;
}

/** Fit, store and discard, and what the last store did. */
function FitActions({
  fitted,
  lead,
  busy,
  status,
  onPreview,
  onAccept,
  onDiscard,
}: {
  fitted: boolean;
  lead: boolean;
  busy: boolean;
  status: string;
  onPreview: () => void;
  onAccept: () => void;
  onDiscard: () => void;
}) {
  return (
    <div class="toolbar">
      <button type="button" disabled={busy} onClick={onPreview}>
        {fitted ? 'Fit again' : 'Fit the stored measurements'}
      </button>
      {fitted && lead && (
        <button type="button" class="primary" disabled={busy} onClick={onAccept}>
          Store as the current solution
        </button>
      )}
      {fitted && (
        <button type="button" disabled={busy} onClick={onDiscard}>
          Discard fit
        </button>
      )}
      {busy && <span class="loading">fitting…</span>}
      {status && (
        <span class="save-status" role="status">
          {status}
        </span>
      )}
    </div>
  );
}

/** Each fitted parameter to the digits its σ supports; an epoch as its UTC date, σ in days. */
function ParameterTable({ parameters }: { parameters: FitPreview['result']['parameters'] }) {
  return (
    <table class="data fit-parameters">
      <thead>
        <tr>
          <th>parameter</th>
          <th>value</th>
          <th>1σ</th>
          <th>unit</th>
        </tr>
      </thead>
      <tbody>
        {parameters.map((p) => (
          <tr key={p.name}>
            <td>{parameterWords(p.name)}</td>
            <td>
              {p.unit.startsWith('JD')
                ? `${utcText(isoOfJd(p.value))} UTC (JD ${p.value.toFixed(2)})`
                : valueText(p.value, p.sigma).split(' ± ')[0]}
            </td>
            <td>{valueText(p.sigma, null, 2)}</td>
            <td>
              {p.unit.startsWith('JD')
                ? 'date; σ in days'
                : p.unit || <Blank why="a pure number: no unit" />}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** How well the fit went, the light-time note where it applies, and the fitted parameters. */
function FitResult({ fit }: { fit: FitPreview }) {
  const r = fit.result;
  const lightTime = lightTimeHours(r);
  return (
    <>
      <p>
        {plural(fit.targets[0]?.measurementIds.length ?? 0, 'measurement')} · χ²{' '}
        <Qty v={r.chi2} unit="" digits={2} /> for {r.dof} degrees of freedom (reduced{' '}
        <Qty v={r.reducedChi2} unit="" digits={2} />) ·{' '}
        {r.converged ? `converged in ${plural(r.iterations, 'iteration')}` : 'did not converge'} ·{' '}
        {plural(r.outliers, 'outlier')}
        {r.stars[0]?.nextPeriapsis && (
          <> · next periapsis {utcText(r.stars[0].nextPeriapsis)} UTC as observed</>
        )}
        . The fitted track is drawn dashed on the sky plane.
      </p>
      {r.stars[0]?.orbit.relativity?.romer && lightTime !== null && (
        <p class="muted">
          T is when the star passes periapsis; the next periapsis is when that passage is seen from
          Earth, {Math.abs(lightTime).toFixed(1)} h {lightTime < 0 ? 'earlier' : 'later'} than T
          plus whole periods: the light-travel time across the orbit (Rømer delay).
        </p>
      )}
      <ParameterTable parameters={r.parameters} />
      <p class="muted">{r.method}</p>
    </>
  );
}

export function FitPanel({
  targetId,
  trackEpochs,
  onFittedTrack,
  onStored,
}: {
  targetId: number;
  trackEpochs: string[];
  onFittedTrack: (t: Prediction[] | null) => void;
  onStored: () => void;
}) {
  const lead = useCan('lead');
  const [fit, setFit] = useState<FitPreview | null>(null);
  const { busy, error, run } = useAction();
  const [status, setStatus] = useState('');
  const preview = () =>
    run(async () => {
      setStatus('');
      const f = await api.POST('/targets/{id}/fit', {
        params: { path: { id: targetId } },
        body: {},
      });
      setFit(f);
      const orbit = f.result.stars[0]?.orbit;
      if (orbit && trackEpochs.length)
        onFittedTrack(
          (await api.POST('/ephemeris', { body: { orbit, epochs: trackEpochs } })).predictions,
        );
    });
  const accept = () =>
    run(async () => {
      const r = await api.POST('/targets/{id}/fit/accept', {
        params: { path: { id: targetId } },
        body: { notes: 'fitted from the light client' },
      });
      setStatus(`Stored as version ${r.solutions.map((s) => s.version).join(', ')}, now current.`);
      setFit(null);
      onFittedTrack(null);
      invalidateCatalogue();
      onStored();
    });
  return (
    <div class="fit-panel">
      <FitActions
        fitted={fit !== null}
        lead={lead}
        busy={busy}
        status={status}
        onPreview={preview}
        onAccept={accept}
        onDiscard={() => {
          setFit(null);
          onFittedTrack(null);
        }}
      />
      <ErrorLine error={error} />
      {fit && <FitResult fit={fit} />}
    </div>
  );
}
