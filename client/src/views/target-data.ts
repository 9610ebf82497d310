/**
 * Everything the target view plots, from one ephemeris request: one orbit of track, yearly date
 * ticks, the predictions at each measurement's epoch (for residuals) and at each planned block,
 * and the radial velocity with and without the relativistic terms.
 */
import { getAll, api } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import type { BlockRow, MeasurementRow, Prediction, SolutionRow } from '../api/client.ts';
import { yearOf } from '../plots/rv-curve.tsx';

const DAY = 86_400_000;
const TRACK_POINTS = 360;

export interface TargetData {
  solution: SolutionRow | undefined;
  measurements: MeasurementRow[];
  planned: BlockRow[];
  track: Prediction[];
  ticks: Prediction[];
  atMeasurement: Map<number, Prediction>;
  atPlanned: Prediction[];
  /** Periapsis passages inside the plotted span (from the events endpoint, not the closest sampled point). */
  periapses: Prediction[];
  rvPlain: Prediction[] | null;
  periodYears: number | null;
}

/**
 * The plotted span, ms since 1970: one full orbit (period in years, > 0) centred on `now`, or
 * longer to cover every measurement and planned epoch in `times`.
 */
function plotSpan(periodYears: number, now: number, times: number[]): { t0: number; t1: number } {
  const half = (periodYears * 365.25 * DAY) / 2;
  return { t0: Math.min(now - half, ...times), t1: Math.max(now + half, ...times) };
}

/** The track's epochs: TRACK_POINTS equal steps from t0 to t1 (ms), both ends included. */
const trackEpochs = (t0: number, t1: number) =>
  Array.from({ length: TRACK_POINTS + 1 }, (_, i) =>
    new Date(t0 + ((t1 - t0) * i) / TRACK_POINTS).toISOString(),
  );

/** New Year's Days inside t0..t1 (ms), thinned to at most about 16 ticks. */
function yearTicks(t0: number, t1: number): string[] {
  const y0 = new Date(t0).getUTCFullYear() + 1;
  const y1 = new Date(t1).getUTCFullYear();
  const every = Math.max(1, Math.ceil((y1 - y0 + 1) / 16));
  const ticks: string[] = [];
  for (let y = y0; y <= y1; y += every) ticks.push(`${y}-01-01T00:00:00Z`);
  return ticks;
}

/** Cut one batch of predictions back into the runs of epochs it was asked for, in order. */
function splitRuns(p: Prediction[], lengths: number[]): Prediction[][] {
  const runs: Prediction[][] = [];
  let k = 0;
  for (const n of lengths) {
    runs.push(p.slice(k, k + n));
    k += n;
  }
  return runs;
}

async function periapsisEpochs(targetId: number, t0: number, t1: number): Promise<string[]> {
  const events = await api.GET('/targets/{id}/events', {
    params: {
      path: { id: targetId },
      query: {
        start: new Date(t0).toISOString(),
        end: new Date(t1).toISOString(),
        kinds: 'periapsis',
      },
    },
  });
  return events.events.map((e) => e.epoch);
}

export async function loadTargetData(cat: Catalogue, targetId: number): Promise<TargetData> {
  const solution = cat.currentSolution(targetId);
  const [measurements, blocks] = await Promise.all([
    getAll('/measurements', { targetId }),
    getAll('/blocks', { targetId, start: new Date().toISOString() }),
  ]);
  const planned = blocks.filter((b) => b.status === 'planned');
  const empty = {
    solution,
    measurements,
    planned,
    track: [],
    ticks: [],
    atMeasurement: new Map(),
    atPlanned: [],
    periapses: [],
    rvPlain: null,
    periodYears: null,
  };
  if (!solution) return empty;
  const periodYears = Number(solution.orbit.elements.periodYears);
  if (!Number.isFinite(periodYears) || periodYears <= 0) return empty;
  const { t0, t1 } = plotSpan(periodYears, Date.now(), [
    ...measurements.map((m) => Date.parse(m.epoch)),
    ...planned.map((b) => Date.parse(b.startUtc)),
  ]);
  const track = trackEpochs(t0, t1);
  const ticks = yearTicks(t0, t1);
  const mEpochs = measurements.map((m) => m.epoch);
  const pEpochs = planned.map((b) =>
    new Date((Date.parse(b.startUtc) + Date.parse(b.endUtc)) / 2).toISOString(),
  );
  const periEpochs = await periapsisEpochs(targetId, t0, t1);
  const runs = [track, ticks, mEpochs, pEpochs, periEpochs];
  const hasRelativity = Object.values(solution.orbit.relativity ?? {}).some(Boolean);
  const [main, plain] = await Promise.all([
    api.POST('/ephemeris', { body: { orbit: solution.orbit, epochs: runs.flat() } }),
    hasRelativity
      ? api.POST('/ephemeris', {
          body: { orbit: { ...solution.orbit, relativity: {} }, epochs: track },
        })
      : Promise.resolve(null),
  ]);
  const [trackP, tickP, mP, plP, periP] = splitRuns(
    main.predictions,
    runs.map((r) => r.length),
  ) as [Prediction[], Prediction[], Prediction[], Prediction[], Prediction[]];
  return {
    solution,
    measurements,
    planned,
    track: trackP,
    ticks: tickP,
    atMeasurement: new Map(measurements.map((m, i) => [m.id, mP[i]!])),
    atPlanned: plP,
    periapses: periP,
    rvPlain: plain?.predictions ?? null,
    periodYears,
  };
}

/** Residual of an astrometric measurement, measured minus predicted, mas. */
export function astrometricResidual(
  m: MeasurementRow,
  p: Prediction | undefined,
): { dRa: number; dDec: number } | null {
  if (!p) return null;
  if (m.kind === 'offsets' && m.dRaMas != null && m.dDecMas != null)
    return { dRa: m.dRaMas - p.dRaMas, dDec: m.dDecMas - p.dDecMas };
  if (m.kind === 'separation' && m.separationMas != null && m.positionAngleDeg != null) {
    const t = (m.positionAngleDeg * Math.PI) / 180;
    return {
      dRa: m.separationMas * Math.sin(t) - p.dRaMas,
      dDec: m.separationMas * Math.cos(t) - p.dDecMas,
    };
  }
  return null;
}

export const rvSeries = (ps: Prediction[]) =>
  ps.flatMap((p) =>
    p.radialVelocityKmS !== null && Number.isFinite(p.radialVelocityKmS)
      ? [{ t: yearOf(p.epoch), v: p.radialVelocityKmS }]
      : [],
  );
