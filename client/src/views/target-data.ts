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
  // One full orbit centred on now, or longer to cover every measurement and planned epoch.
  const now = Date.now();
  const half = (periodYears * 365.25 * DAY) / 2;
  const times = [
    ...measurements.map((m) => Date.parse(m.epoch)),
    ...planned.map((b) => Date.parse(b.startUtc)),
  ];
  const t0 = Math.min(now - half, ...times);
  const t1 = Math.max(now + half, ...times);
  const track = Array.from({ length: TRACK_POINTS + 1 }, (_, i) =>
    new Date(t0 + ((t1 - t0) * i) / TRACK_POINTS).toISOString(),
  );
  const y0 = new Date(t0).getUTCFullYear() + 1;
  const y1 = new Date(t1).getUTCFullYear();
  const every = Math.max(1, Math.ceil((y1 - y0 + 1) / 16));
  const ticks: string[] = [];
  for (let y = y0; y <= y1; y += every) ticks.push(`${y}-01-01T00:00:00Z`);
  const mEpochs = measurements.map((m) => m.epoch);
  const pEpochs = planned.map((b) =>
    new Date((Date.parse(b.startUtc) + Date.parse(b.endUtc)) / 2).toISOString(),
  );
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
  const periEpochs = events.events.map((e) => e.epoch);
  const epochs = [...track, ...ticks, ...mEpochs, ...pEpochs, ...periEpochs];
  const hasRelativity = Object.values(solution.orbit.relativity ?? {}).some(Boolean);
  const [main, plain] = await Promise.all([
    api.POST('/ephemeris', { body: { orbit: solution.orbit, epochs } }),
    hasRelativity
      ? api.POST('/ephemeris', {
          body: { orbit: { ...solution.orbit, relativity: {} }, epochs: track },
        })
      : Promise.resolve(null),
  ]);
  const p = main.predictions;
  let k = 0;
  const take = (n: number) => {
    k += n;
    return p.slice(k - n, k);
  };
  const trackP = take(track.length);
  const tickP = take(ticks.length);
  const mP = take(mEpochs.length);
  const plP = take(pEpochs.length);
  const periP = take(periEpochs.length);
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
