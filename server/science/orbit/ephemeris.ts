/**
 * Ephemerides and event lists with their uncertainties: what the HTTP API and the CLI serve.
 * Linear 1σ whenever the orbit carries a covariance; Monte Carlo percentiles on request.
 */
import { InputError } from '../errors.ts';
import { jdToIso } from '../time/index.ts';
import {
  findEventLoci,
  eventFromLocus,
  relocateEvent,
  type EventOptions,
  type OrbitEvent,
} from './events.ts';
import { predictBatch, rowOf, type Prediction, type PredictionColumns } from './predict.ts';
import type { Orbit } from './types.ts';
import {
  anglePercentiles,
  drawOrbits,
  linearSigma,
  percentiles,
  validateMonteCarlo,
  type MonteCarloOptions,
} from './uncertainty.ts';

/** Quantities that carry an uncertainty in an ephemeris. */
export const UNCERTAIN_FIELDS = [
  'dRaMas',
  'dDecMas',
  'separationMas',
  'positionAngleDeg',
  'radialVelocityKmS',
  'primaryRadialVelocityKmS',
  'secondaryRadialVelocityKmS',
  'photocentreDRaMas',
  'photocentreDDecMas',
] as const;
export type UncertainField = (typeof UNCERTAIN_FIELDS)[number];

export interface UncertaintyOptions {
  monteCarlo?: MonteCarloOptions;
}

export interface EphemerisRow extends Prediction {
  /** Linear 1σ per quantity (same unit); absent without a covariance. */
  sigma?: Partial<Record<UncertainField, number>>;
  /** Monte Carlo percentiles (PERCENTILES) per quantity; only when asked for. */
  percentiles?: Partial<Record<UncertainField, number[]>>;
}

/** Most draws × epochs per request (memory bound). */
const MAX_MC_WORK = 4_000_000;

/**
 * The uncertain quantities this orbit predicts (velocities need a distance; bodies need q; the
 * photocentre q and β).
 */
function fieldsFor(orbit: Orbit): UncertainField[] {
  const hasD = orbit.distancePc !== null,
    hasQ = orbit.massRatio !== null;
  return UNCERTAIN_FIELDS.filter((f) => {
    if (f === 'radialVelocityKmS') return hasD;
    if (f === 'primaryRadialVelocityKmS' || f === 'secondaryRadialVelocityKmS') return hasD && hasQ;
    if (f === 'photocentreDRaMas' || f === 'photocentreDDecMas')
      return hasQ && orbit.lightFraction !== null;
    return true;
  });
}

/** Predictions at the epochs (JD), with uncertainties as the orbit and options allow. */
export function ephemeris(
  orbit: Orbit,
  jd: Float64Array,
  options: UncertaintyOptions = {},
): EphemerisRow[] {
  const cols = predictBatch(orbit, jd);
  const rows: EphemerisRow[] = Array.from({ length: jd.length }, (_, i) =>
    rowOf(cols, i, orbit.relativity.romer),
  );
  if (!orbit.covariance) {
    if (options.monteCarlo)
      throw new InputError('orbit.covariance', null, 'is needed for Monte Carlo percentiles');
    return rows;
  }
  const fields = fieldsFor(orbit);
  const n = jd.length;
  const angle = new Set<number>();
  const pa = fields.indexOf('positionAngleDeg');
  for (let i = 0; i < n; i++) angle.add(pa * n + i);
  const flatten = (c: PredictionColumns) => {
    const v = new Float64Array(fields.length * n);
    fields.forEach((f, k) => {
      v.set(c[f], k * n);
    });
    return v;
  };
  const sigma = linearSigma(orbit, (o) => flatten(predictBatch(o, jd)), angle);
  rows.forEach((r, i) => {
    r.sigma = Object.fromEntries(fields.map((f, k) => [f, sigma[k * n + i]!]));
  });
  if (options.monteCarlo) {
    const mc = validateMonteCarlo(options.monteCarlo);
    if (mc.draws * n > MAX_MC_WORK)
      throw new InputError(
        'monteCarlo.draws',
        mc.draws,
        `× ${n} epochs exceeds ${MAX_MC_WORK} predictions per request`,
      );
    const samples = fields.map(() => Array.from({ length: n }, () => new Float64Array(mc.draws)));
    drawOrbits(orbit, mc).forEach((o, d) => {
      const c = predictBatch(o, jd);
      fields.forEach((f, k) => {
        for (let i = 0; i < n; i++) samples[k]![i]![d] = c[f][i]!;
      });
    });
    rows.forEach((r, i) => {
      r.percentiles = Object.fromEntries(
        fields.map((f, k) => [
          f,
          f === 'positionAngleDeg'
            ? anglePercentiles(samples[k]![i]!, r.positionAngleDeg)
            : percentiles(samples[k]![i]!),
        ]),
      );
    });
  }
  return rows;
}

export interface EventWithUncertainty extends OrbitEvent {
  /** Linear 1σ of the event's date, days; absent without a covariance. */
  sigmaDays?: number;
  /** Monte Carlo percentiles (PERCENTILES) of the date, ISO 8601; only when asked for. */
  percentileEpochs?: string[];
  /** Draws in which this event had no counterpart (e.g. a separation extremum that vanished). */
  missingDraws?: number;
}

/** Events in [startJd, endJd] with the uncertainty of each date. */
export function eventsWithUncertainty(
  orbit: Orbit,
  startJd: number,
  endJd: number,
  options: EventOptions & UncertaintyOptions = {},
): EventWithUncertainty[] {
  const { sampler, loci } = findEventLoci(orbit, startJd, endJd, options);
  const events: EventWithUncertainty[] = loci.map((l) => eventFromLocus(sampler, l));
  if (!orbit.covariance) {
    if (options.monteCarlo)
      throw new InputError('orbit.covariance', null, 'is needed for Monte Carlo percentiles');
    return events;
  }
  const times = (o: Orbit) => loci.map((l) => relocateEvent(o, l) ?? Number.NaN);
  const sigma = linearSigma(orbit, times);
  events.forEach((e, i) => {
    e.sigmaDays = sigma[i]!;
  });
  if (options.monteCarlo) {
    const mc = validateMonteCarlo(options.monteCarlo);
    if (mc.draws * loci.length > MAX_MC_WORK / 100)
      throw new InputError(
        'monteCarlo.draws',
        mc.draws,
        `× ${loci.length} events exceeds ${MAX_MC_WORK / 100} event searches per request`,
      );
    const samples = loci.map(() => [] as number[]);
    for (const o of drawOrbits(orbit, mc)) {
      times(o).forEach((t, i) => {
        if (!Number.isNaN(t)) samples[i]!.push(t);
      });
    }
    events.forEach((e, i) => {
      const s = samples[i]!;
      e.missingDraws = mc.draws - s.length;
      if (s.length > 0) e.percentileEpochs = percentiles(s).map(jdToIso);
    });
  }
  return events;
}
