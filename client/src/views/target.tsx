/**
 * One target: the orbit on the sky (north up, east left) with measurements, residuals and planned
 * epochs; the radial-velocity curve with the relativistic terms switchable; the events; the orbit
 * solution versions with their provenance; and the ephemeris table with its CSV.
 */
import { useState } from 'preact/hooks';
import { api } from '../api/client.ts';
import {
  invalidateCatalogue,
  loadCatalogue,
  elementText,
  semiMajorAxisText,
  type Catalogue,
} from '../api/catalogue.ts';
import { measurementPoint, SkyPlanePlot, type SkyMeasurement } from '../plots/sky-plane.tsx';
import { RvCurvePlot, yearOf } from '../plots/rv-curve.tsx';
import { utcText } from '../lib/time.ts';
import { Blank, ErrorLine, Loading, Qty, Section, useCan } from '../lib/ui.tsx';
import { plural } from '../lib/words.ts';
import { useLoad } from '../lib/use-load.ts';
import { EVENT_WORDS, RV_WHY } from '../lib/numbers.ts';
import { EphemerisTable } from './ephemeris-table.tsx';
import { astrometricResidual, loadTargetData, rvSeries, type TargetData } from './target-data.ts';
import { FitPanel } from './fit-panel.tsx';
import { ForecastPanel } from './forecast-panel.tsx';
import type { MeasurementRow, Prediction } from '../api/client.ts';

function SkyPanel({ d, fitted }: { d: TargetData; fitted: Prediction[] | null }) {
  const ms: SkyMeasurement[] = [];
  // The plot is the relative orbit: the photocentre's positions (about the barycentre) are not on it.
  const relative = d.measurements.filter((m) => m.component !== 'photocentre');
  const photocentre = d.measurements.length - relative.length;
  for (const m of relative) {
    const p = measurementPoint(m);
    const pred = d.atMeasurement.get(m.id);
    if (p)
      ms.push({
        ...p,
        ...(pred ? { predicted: { dRaMas: pred.dRaMas, dDecMas: pred.dDecMas } } : {}),
      });
  }
  // The passage nearest to now when the plotted span holds more than one.
  const peri = [...d.periapses].sort(
    (a, b) =>
      Math.abs(Date.parse(a.epoch) - Date.now()) - Math.abs(Date.parse(b.epoch) - Date.now()),
  )[0];
  const astro = relative
    .map((m) => ({ m, r: astrometricResidual(m, d.atMeasurement.get(m.id)) }))
    .filter((x) => x.r);
  const rms = astro.length
    ? Math.sqrt(astro.reduce((s, x) => s + x.r!.dRa ** 2 + x.r!.dDec ** 2, 0) / astro.length)
    : null;
  return (
    <>
      <SkyPlanePlot
        track={d.track}
        compareTrack={fitted ?? undefined}
        dateTicks={d.ticks}
        periapsis={peri}
        measurements={ms}
        planned={d.atPlanned}
        title="predicted track and measurements on the sky, north up, east left"
      />
      <p class="legend">
        <span class="key key-track" /> predicted track (current solution) ·{' '}
        <span class="key key-meas" /> measurement with 1σ error ellipse ·{' '}
        <span class="key key-resid" /> residual (predicted → measured) ·{' '}
        <span class="key key-plan" /> planned epoch · ◆ periapsis (true anomaly 0)
        {fitted && (
          <>
            {' '}
            · <span class="key key-fit" /> fitted track (not stored)
          </>
        )}
        {rms !== null && (
          <>
            {' '}
            · RMS astrometric residual <Qty v={rms} unit="mas" digits={2} /> over {astro.length}{' '}
            measurements
          </>
        )}
        {photocentre > 0 &&
          ` · ${photocentre} photocentre position${photocentre === 1 ? '' : 's'} not drawn: they lie on ` +
            `the light centre's orbit about the barycentre, not on the relative orbit`}
      </p>
    </>
  );
}

/** Whose velocity the curve shows: a binary of comparable masses has three. */
type RvBody = 'both' | 'primary' | 'secondary' | 'relative';
const RV_BODY_TEXT: Record<RvBody, string> = {
  both: 'both bodies about the barycentre',
  primary: 'the primary about the barycentre',
  secondary: 'the secondary about the barycentre',
  relative: 'the secondary relative to the primary',
};

/** The predicted velocity of `component` in a prediction (null where the solution cannot say). */
function bodyVelocity(p: Prediction, component: MeasurementRow['component']): number | null {
  if (component === 'primary') return p.primaryRadialVelocityKmS;
  if (component === 'secondary') return p.secondaryRadialVelocityKmS;
  return p.radialVelocityKmS;
}

function RvPanel({ d }: { d: TargetData }) {
  const [withRel, setWithRel] = useState(true);
  const binary = d.solution?.orbit.massRatio !== undefined;
  const [body, setBody] = useState<RvBody>(binary ? 'both' : 'relative');
  const rel = rvSeries(d.track);
  if (!rel.length)
    return (
      <p class="muted">
        No radial velocity: the current solution has no distance or systemic velocity.
      </p>
    );
  const shown: readonly MeasurementRow['component'][] =
    body === 'both' ? ['primary', 'secondary'] : [body];
  const velocities = d.measurements.filter(
    (m) => m.kind === 'radial-velocity' && m.radialVelocityKmS !== null,
  );
  const hidden = velocities.filter((m) => !shown.includes(m.component)).length;
  const meas = rvPoints(
    d,
    velocities.filter((m) => shown.includes(m.component)),
  );
  const plain = d.rvPlain && body === 'relative' ? rvSeries(d.rvPlain) : null;
  const ofBody = (c: MeasurementRow['component']) =>
    rvSeries(d.track.map((p) => ({ ...p, radialVelocityKmS: bodyVelocity(p, c) })));
  const curve =
    body === 'relative'
      ? withRel || !plain
        ? rel
        : plain
      : ofBody(body === 'secondary' ? 'secondary' : 'primary');
  const compare =
    body === 'both' ? ofBody('secondary') : plain ? (withRel ? plain : rel) : undefined;
  return (
    <>
      {binary && (
        <label class="field">
          velocity of{' '}
          <select
            name="rv-body"
            value={body}
            onChange={(e) => setBody(e.currentTarget.value as RvBody)}
          >
            {(Object.keys(RV_BODY_TEXT) as RvBody[]).map((b) => (
              <option key={b} value={b}>
                {RV_BODY_TEXT[b]}
              </option>
            ))}
          </select>
        </label>
      )}
      {plain && (
        <label class="switch">
          <input
            type="checkbox"
            checked={withRel}
            onChange={(e) => setWithRel(e.currentTarget.checked)}
          />{' '}
          include the relativistic terms (gravitational redshift, transverse Doppler, Rømer delay,
          precession) in the curve
        </label>
      )}
      <RvCurvePlot
        curve={curve}
        compare={compare}
        measurements={meas}
        nowYear={yearOf(new Date().toISOString())}
      />
      <RvLegend
        d={d}
        body={body}
        binary={binary}
        plain={plain !== null}
        withRel={withRel}
        hidden={hidden}
      />
    </>
  );
}

/** The drawn velocities with their 1σ and, where the solution predicts the body, the residual. */
function rvPoints(d: TargetData, velocities: MeasurementRow[]) {
  return velocities.map((m) => {
    const p = d.atMeasurement.get(m.id);
    const predicted = p ? bodyVelocity(p, m.component) : null;
    return {
      id: m.id,
      t: yearOf(m.epoch),
      v: m.radialVelocityKmS!,
      sigma: m.sigmaRadialVelocityKmS ?? 0,
      label: m.component === 'relative' ? '' : `${m.component} `,
      ...(predicted !== null ? { residual: m.radialVelocityKmS! - predicted } : {}),
    };
  });
}

/** What the curve, the comparison and the points are, and which velocities are not drawn. */
function RvLegend(p: {
  d: TargetData;
  body: RvBody;
  binary: boolean;
  /** Whether a curve without the relativistic terms exists to compare with. */
  plain: boolean;
  withRel: boolean;
  hidden: number;
}) {
  const { d, body, binary, plain, withRel, hidden } = p;
  return (
    <p class="legend">
      <span class="key key-track" />{' '}
      {body === 'both'
        ? 'the primary'
        : body !== 'relative'
          ? RV_BODY_TEXT[body]
          : !plain
            ? 'predicted (this solution has no relativistic terms switched on)'
            : withRel
              ? 'with relativistic terms'
              : 'without relativistic terms'}
      {body === 'both' && (
        <>
          {' '}
          · <span class="key key-compare" /> the secondary (mass ratio q ={' '}
          <Qty v={d.solution!.orbit.massRatio!} unit="" digits={3} />)
        </>
      )}
      {plain && (
        <>
          {' '}
          · <span class="key key-compare" /> {withRel ? 'without' : 'with'} them, for comparison
        </>
      )}{' '}
      · measurements with 1σ bars
      {!withRel && plain ? ' (residuals in the tooltips are always against the full model)' : ''}
      {hidden > 0 &&
        (binary
          ? ` · ${hidden} velocit${hidden === 1 ? 'y' : 'ies'} of another body not drawn (choose it above)`
          : ` · ${hidden} velocit${hidden === 1 ? 'y' : 'ies'} of the primary or the secondary about the ` +
            `barycentre not drawn: this solution has no mass ratio (a fit of them stores one)`)}
    </p>
  );
}

function Events({ targetId, periodYears }: { targetId: number; periodYears: number | null }) {
  const span = Math.min(Math.max(periodYears ?? 5, 2), 30);
  const start = new Date(Date.now() - 365.25 * 86_400_000).toISOString();
  const end = new Date(Date.now() + span * 365.25 * 86_400_000).toISOString();
  const { data, error } = useLoad(
    () =>
      api.GET('/targets/{id}/events', {
        params: { path: { id: targetId }, query: { start, end } },
      }),
    [targetId],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="events" />;
  const lightTime = data.events.some((e) => e.lightTimeIncluded);
  return (
    <table class="data events">
      <caption>
        From one year ago to {span.toFixed(0)} years ahead; uncertainty from the solution’s
        covariance where it has one.
        {lightTime
          ? ' Observed times include the light-time across the orbit (Rømer delay); emitted times are when the ' +
            'light left the star.'
          : ' This solution has the Rømer delay off: observed and emitted times are one clock.'}
      </caption>
      <thead>
        <tr>
          <th>event</th>
          <th>{lightTime ? 'observed (UTC, light-time included)' : 'epoch (UTC)'}</th>
          {lightTime && <th>emitted at the star (UTC)</th>}
          <th>± (d)</th>
          <th>separation (mas)</th>
          <th>PA (°)</th>
          <th>v_r (km/s)</th>
        </tr>
      </thead>
      <tbody>
        {data.events.map((e) => (
          <tr key={`${e.kind}${e.jd}`} class={e.kind === 'periapsis' ? 'row-periapsis' : ''}>
            <td>{EVENT_WORDS[e.kind] ?? e.kind.replaceAll('-', ' ')}</td>
            <td>{utcText(e.epoch)}</td>
            {lightTime && <td>{utcText(e.emissionEpoch)}</td>}
            <td>
              {e.sigmaDays === null || e.sigmaDays === undefined ? (
                <span class="muted">no covariance</span>
              ) : (
                <Qty v={e.sigmaDays} unit="" />
              )}
            </td>
            <td>
              <Qty v={e.state?.separationMas} unit="" digits={2} />
            </td>
            <td>
              <Qty v={e.state?.positionAngleDeg} unit="" />
            </td>
            <td>
              <Qty v={e.state?.radialVelocityKmS} unit="" why={RV_WHY} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Solutions({
  cat,
  targetId,
  onChange,
}: {
  cat: Catalogue;
  targetId: number;
  onChange: () => void;
}) {
  const lead = useCan('lead');
  const [error, setError] = useState<unknown>(null);
  const rows = cat.solutions
    .filter((s) => s.targetId === targetId)
    .sort((a, b) => b.version - a.version);
  const makeCurrent = async (id: number) => {
    try {
      await api.POST('/orbit-solutions/{id}/current', { params: { path: { id } } });
      invalidateCatalogue();
      onChange();
    } catch (e) {
      setError(e);
    }
  };
  return (
    <>
      <table class="data solutions">
        <thead>
          <tr>
            <th>version</th>
            <th>provenance</th>
            <th>reference</th>
            <th>P (yr)</th>
            <th>e</th>
            <th>a (″)</th>
            <th>stored</th>
            <th></th>
          </tr>
        </thead>
        <tbody>
          {rows.map((s) => (
            <tr key={s.id} class={s.current ? 'current' : ''}>
              <td>
                v{s.version}
                {s.current && <span class="tag">current</span>}
              </td>
              <td>
                {s.provenance}
                {s.fittedFrom ? ` from ${plural(s.fittedFrom.length, 'measurement')}` : ''}
              </td>
              <td>{s.reference || <span class="muted">none given</span>}</td>
              <td>{elementText(s, 'periodYears')}</td>
              <td>{elementText(s, 'eccentricity')}</td>
              <td>{semiMajorAxisText(s)}</td>
              <td>{utcText(s.createdAt)}</td>
              <td>
                {s.current ? (
                  <Blank why="the current solution: the predictions on this page use it" />
                ) : lead ? (
                  <button type="button" onClick={() => makeCurrent(s.id)}>
                    Make current
                  </button>
                ) : (
                  <Blank why="a lead can make an earlier version current" />
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <ErrorLine error={error} />
    </>
  );
}

export function TargetView({ id }: { id: number }) {
  const [tick, setTick] = useState(0);
  const [fitted, setFitted] = useState<Prediction[] | null>(null);
  const { data, error } = useLoad(async () => {
    const cat = await loadCatalogue();
    return { cat, d: await loadTargetData(cat, id) };
  }, [id, tick]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the target" />;
  const { cat, d } = data;
  const t = cat.target(id);
  const sys = t && cat.system(t.systemId);
  if (!t) return <p class="panel">No target {id}.</p>;
  return (
    <div class="view target">
      <div class="view-head">
        <h1>
          {t.name} <span class="muted">in {sys?.name}</span>
        </h1>
        <p class="muted">
          {t.magnitude !== null ? `${t.magnitude} mag (${t.band ?? 'band?'})` : ''} · current
          solution {d.solution ? `v${d.solution.version} (${d.solution.provenance})` : 'none'} ·{' '}
          {d.measurements.length} measurements · {d.planned.length} planned blocks
        </p>
      </div>
      {!d.solution ? (
        <p class="panel">This target has no orbit solution yet.</p>
      ) : (
        <div class="two-col">
          <Section title="On the sky" id="sky-plane">
            <SkyPanel d={d} fitted={fitted} />
          </Section>
          <Section title="Radial velocity" id="rv">
            <RvPanel d={d} />
          </Section>
        </div>
      )}
      {d.solution?.orbit.distancePc !== undefined && (
        <Section title="Relativity forecast" id="forecast">
          {d.solution.orbit.massRatio === undefined ? (
            <ForecastPanel key={d.solution.id} targetId={id} />
          ) : (
            // A binary of comparable masses is fitted Newtonian: nothing relativistic to forecast.
            <p class="muted">
              No forecast: this solution is a binary of comparable masses (it has a mass ratio),
              whose orbit is fitted without relativistic terms.
            </p>
          )}
        </Section>
      )}
      <Section title="Events" id="events">
        <Events key={d.solution?.id} targetId={id} periodYears={d.periodYears} />
      </Section>
      <Section title="Orbit solutions" id="solutions">
        <Solutions cat={cat} targetId={id} onChange={() => setTick(tick + 1)} />
        {d.measurements.length > 0 && (
          <FitPanel
            targetId={id}
            trackEpochs={d.track.map((p) => p.epoch)}
            onFittedTrack={setFitted}
            onStored={() => setTick(tick + 1)}
          />
        )}
      </Section>
      {d.solution && (
        <Section title="Ephemeris" id="ephemeris">
          <EphemerisTable key={d.solution.id} targetId={id} name={t.name} />
        </Section>
      )}
    </div>
  );
}
