/**
 * The detection forecast of a target's relativistic terms: for the redshift and the precession
 * factor, the expected significance now and after the planned blocks, the date each reaches 3σ and
 * 5σ, and the planned epochs that add most (server: GET /targets/{id}/forecast).
 */
import { api } from '../api/client.ts';
import type { DetectionForecast, FactorForecast } from '../api/client.ts';
import { dateText } from '../lib/time.ts';
import { Blank, ErrorLine, Loading, Qty } from '../lib/ui.tsx';
import { factorSigmaText as sigmaText } from '../lib/numbers.ts';
import { useLoad } from '../lib/use-load.ts';

const LABEL: Record<FactorForecast['name'], string> = {
  redshiftFactor: 'redshift factor (gravitational redshift + transverse Doppler)',
  precessionFactor: 'precession factor (Schwarzschild)',
};

function reached(f: FactorForecast, sigma: number): string {
  const r = f.reaches.find((x) => x.sigma === sigma);
  if (!r) return '–';
  if (r.already) return 'already';
  return r.epoch ? `after ${dateText(r.epoch)}` : 'not with this plan';
}

export function ForecastPanel({ targetId }: { targetId: number }) {
  const { data, error } = useLoad(
    () => api.GET('/targets/{id}/forecast', { params: { path: { id: targetId } } }),
    [targetId],
  );
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the forecast" />;
  return (
    <div class="forecast">
      <ForecastSummary forecast={data} />
      <ForecastTable
        forecast={data}
        caption={`${data.plannedEpochs} planned epochs from now; ${data.precision.text} (${data.precision.source}).`}
      />
      <p class="muted">{data.assumptions}. Dates are observed times (light-time included).</p>
    </div>
  );
}

/** The forecast's one line per factor. */
export function ForecastSummary({ forecast }: { forecast: DetectionForecast }) {
  return (
    <ul class="forecast-summary">
      {forecast.summary.map((s) => (
        <li key={s}>{s}</li>
      ))}
    </ul>
  );
}

/** A row per factor: 1σ and significance now and after the plan, 3σ and 5σ dates, the epochs that add most. */
export function ForecastTable({
  forecast,
  caption,
}: {
  forecast: DetectionForecast;
  caption: string;
}) {
  return (
    <table class="data forecast-table">
      <caption>
        {caption} Significance is the factor over its 1σ, assuming general relativity (factor 1).
      </caption>
      <thead>
        <tr>
          <th>factor</th>
          <th>1σ now</th>
          <th>1σ after the plan</th>
          <th>significance now</th>
          <th>after the plan</th>
          <th>3σ</th>
          <th>5σ</th>
          <th>epochs that add most (share of the information)</th>
        </tr>
      </thead>
      <tbody>
        {forecast.factors.map((f) => (
          <tr key={f.name} data-factor={f.name}>
            <td>{LABEL[f.name]}</td>
            <td>{f.sigmaNow === null ? 'not determined' : sigmaText(f.sigmaNow)}</td>
            <td class="sigma-after">
              {f.sigmaAfter === null ? 'not determined' : sigmaText(f.sigmaAfter)}
            </td>
            <td>
              <Qty v={f.significanceNow} unit="σ" />
            </td>
            <td>
              <Qty v={f.significanceAfter} unit="σ" />
            </td>
            <td>{reached(f, 3)}</td>
            <td>{reached(f, 5)}</td>
            <td>
              {f.topEpochs.length ? (
                f.topEpochs
                  .slice(0, 3)
                  .map((e) => `${dateText(e.epoch)} ${e.kind} ${(100 * e.share).toFixed(0)} %`)
                  .join(' · ')
              ) : (
                <Blank why="no planned epoch of this star adds to this factor" />
              )}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
