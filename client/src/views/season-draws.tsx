/**
 * The season drawn many times under the sites' learned weather (POST
 * /campaigns/{id}/season-plan/draws): per target, the spread of the final σ of the coming passage's
 * date, of the mass and of each relativity factor, and of the passage's coverage, each as a band
 * (5–95 % thin, 16–84 % thick, the median as a notch) on its own scale, with the numbers beside it.
 */
import { api, type Schemas } from '../api/client.ts';
import { ErrorLine } from '../lib/ui.tsx';
import { plural } from '../lib/words.ts';
import { useAction } from '../lib/use-action.ts';
import { useState } from 'preact/hooks';

type Draws = Schemas['SeasonDraws'];
type Dist = NonNullable<Schemas['DrawDistribution']>;
type TargetDraws = Draws['draws']['targets'][number];

const FACTOR: Record<string, string> = {
  redshiftFactor: 'σ of the redshift factor',
  precessionFactor: 'σ of the precession factor',
};
/** A factor (about 1 under general relativity) with a σ beyond this is not measured at all. */
const UNDETERMINED = 100;
const num = (x: number) =>
  Math.abs(x) >= 100
    ? x.toFixed(0)
    : Math.abs(x) >= 10
      ? x.toFixed(1)
      : Math.abs(x) >= 1
        ? x.toFixed(2)
        : x.toPrecision(2);

/** One band on a linear scale from 0 to the 95th percentile (or 1 for shares). */
function Band({
  d,
  scale,
  unit,
  label,
  share = false,
}: {
  d: Dist;
  scale: number;
  unit: string;
  label: string;
  /** A share in % drawn on 0–100 %; other quantities on 0 to their own 95th percentile. */
  share?: boolean;
}) {
  const w = 260,
    h = 22;
  const q = d.percentiles.map((p) => p.value * scale);
  const top = share ? 100 : Math.max(q[4]!, 1e-12) * 1.05;
  const x = (v: number) => 4 + (Math.min(v, top) / top) * (w - 8);
  return (
    <tr class="draw-row">
      <td>{label}</td>
      <td>
        <svg
          class="draw-band"
          viewBox={`0 0 ${w} ${h}`}
          role="img"
          aria-label={`${label}: median ${num(q[2]!)} ${unit}`}
        >
          <line class="axis" x1={4} x2={w - 4} y1={h - 3} y2={h - 3} />
          <line class="p90" x1={x(q[0]!)} x2={x(q[4]!)} y1={h / 2} y2={h / 2} />
          <rect
            class="p68"
            x={x(q[1]!)}
            y={h / 2 - 5}
            width={Math.max(1, x(q[3]!) - x(q[1]!))}
            height={10}
            rx={2}
          />
          <path class="median" d={`M${x(q[2]!)} ${h / 2 - 8}v16`} />
        </svg>
      </td>
      {q.map((v, k) => (
        <td key={d.percentiles[k]!.p} class="num">
          {num(v)}
        </td>
      ))}
      <td class="muted">{unit}</td>
    </tr>
  );
}

export function SeasonDrawsPanel({
  campaignId,
  request,
}: {
  campaignId: number;
  request: {
    startDate: string;
    endDate: string;
    nights: 'allocated' | 'all';
    weather: 'aware' | 'blind';
  };
}) {
  const [draws, setDraws] = useState<Draws | null>(null);
  const [count, setCount] = useState('1000');
  const { busy, error, run } = useAction();
  return (
    <div class="season-draws">
      <form
        class="row-form"
        onSubmit={(e) => {
          e.preventDefault();
          void run(async () => {
            setDraws(
              await api.POST('/campaigns/{id}/season-plan/draws', {
                params: { path: { id: campaignId } },
                body: { ...request, draws: Number(count), seed: 1 },
              }),
            );
          });
        }}
      >
        <label>
          seasons to draw{' '}
          <input
            name="draws"
            inputMode="numeric"
            size={6}
            value={count}
            onInput={(e) => setCount(e.currentTarget.value)}
          />
        </label>
        <button type="submit" disabled={busy}>
          Draw this season under the learned weather
        </button>
        {busy && <span class="loading">drawing…</span>}
      </form>
      <ErrorLine error={error} />
      {draws && <DrawsResult draws={draws} />}
    </div>
  );
}

/** A site's learned clear chance and what it was learned from. */
function siteWeather(s: Draws['sites'][number]): string {
  const { mean, nightsLogged } = s.clearChance;
  const chance = mean === null ? '–' : `${(100 * mean).toFixed(0)} %`;
  return `${s.name} clear with chance ${chance} (${nightsLogged} night reports and the prior)`;
}

/** What the drawn seasons say: the plan and each site's clear chance, then a band per quantity. */
function DrawsResult({ draws }: { draws: Draws }) {
  return (
    <>
      <p class="draws-head">
        {draws.draws.draws} seasons drawn (seed {draws.draws.seed}) of the{' '}
        {draws.weather === 'aware' ? 'weather-aware' : 'weather-blind'} plan (
        {plural(draws.planned.epochs, 'epoch')}): {draws.sites.map(siteWeather).join('; ')}.
      </p>
      <table class="data draws-table">
        <thead>
          <tr>
            <th>after the season</th>
            <th>spread (5–95 %, 16–84 %, median)</th>
            <th>5 %</th>
            <th>16 %</th>
            <th>median</th>
            <th>84 %</th>
            <th>95 %</th>
            <th />
          </tr>
        </thead>
        {draws.draws.targets.map((t) => (
          <TargetBands key={t.target} t={t} />
        ))}
      </table>
      <p class="muted">{draws.draws.assumptions}.</p>
    </>
  );
}

/** One target's epochs kept and lost, then the spread of each quantity the season should sharpen. */
function TargetBands({ t }: { t: TargetDraws }) {
  return (
    <tbody data-target={t.target}>
      <tr class="draw-target">
        <th colSpan={8}>
          {t.target}: {plural(t.epochs, 'epoch')}
          {t.kept.obtained + t.kept.planned > 0 &&
            ` (${t.kept.obtained} already obtained, certain; ${t.kept.planned} kept as planned)`}
          , {t.epochsLost.toFixed(1)} lost on average
          {t.windowCovered !== null &&
            `; an epoch survives in the passage’s window in ${(100 * t.windowCovered).toFixed(1)} % of seasons`}
        </th>
      </tr>
      {t.periapsisSigmaDays && (
        <Band
          d={t.periapsisSigmaDays}
          scale={24}
          unit="h"
          label={`σ of the ${t.passage!.date.slice(0, 10)} periapsis date`}
        />
      )}
      {t.massFraction && <Band d={t.massFraction} scale={100} unit="%" label="σ of the mass" />}
      {t.factors.map((f) => f.sigma && <FactorBand key={f.name} name={f.name} sigma={f.sigma} />)}
      {t.coverage?.distribution && (
        <Band
          d={t.coverage.distribution}
          scale={100}
          unit="%"
          share
          label={`coverage of the passage within ${t.coverage.withinDays} d`}
        />
      )}
    </tbody>
  );
}

/** A relativity factor's σ as a band, or said to be undetermined when the season cannot fix it. */
function FactorBand({ name, sigma }: { name: string; sigma: Dist }) {
  if (sigma.percentiles[2]!.value < UNDETERMINED)
    return <Band d={sigma} scale={1} unit="" label={FACTOR[name]!} />;
  return (
    <tr class="draw-row">
      <td>{FACTOR[name]}</td>
      <td colSpan={7} class="muted">
        not determined by this season (median σ {num(sigma.percentiles[2]!.value)}, the factor
        itself is about 1)
      </td>
    </tr>
  );
}
