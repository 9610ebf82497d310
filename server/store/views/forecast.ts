/**
 * The detection forecast of a stored target: its current orbit solution, its measurements, and its
 * blocks still planned after `at` (each at its midpoint, of its kind), at the precision given or,
 * by default, the median σ of the target's own measurements of each kind (the planner's defaults
 * when it has none). The forecast itself is the planning science's.
 */
import { and, eq, gte } from 'drizzle-orm';
import { blocks, measurements } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import {
  forecastDetection,
  type DetectionForecast,
  type Precision,
} from '../../science/plan/index.ts';
import { parseEpoch, jdToIso } from '../../science/time/index.ts';
import type { DbOrTx } from '../database.ts';
import { toInput } from '../fits.ts';
import { currentOrbit } from '../repos/orbits.ts';

export interface TargetForecastOptions {
  /** The moment the plan counts from, JD. */
  atJd: number;
  precision?: Partial<Precision>;
}

export interface TargetForecast extends DetectionForecast {
  solution: { id: number; version: number };
  at: string;
  /** The precision used and where it came from. */
  precision: Precision & { source: string };
  /** The planned blocks counted (ids), soonest first. */
  blockIds: number[];
}

/** Planner defaults when neither the request nor the target's measurements give a precision. */
const DEFAULT_PRECISION: Precision = { astrometryMas: 1, spectroscopyKmS: 5 };

function median(xs: number[]): number | null {
  if (xs.length === 0) return null;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** @throws NotFoundError without a current solution; InputError when it has no distance */
export async function targetForecast(
  db: DbOrTx,
  targetId: number,
  options: TargetForecastOptions,
): Promise<TargetForecast> {
  const { solution, orbit } = await currentOrbit(db, targetId);
  if (orbit.distancePc === null)
    throw new InputError(
      'orbit.distancePc',
      null,
      `target ${targetId}'s current solution has no distance; a forecast of the relativistic terms needs one`,
    );
  const rows = await db.select().from(measurements).where(eq(measurements.targetId, targetId));
  const planned = await db
    .select()
    .from(blocks)
    .where(
      and(
        eq(blocks.targetId, targetId),
        eq(blocks.status, 'planned'),
        gte(blocks.startUtc, jdToIso(options.atJd)),
      ),
    )
    .orderBy(blocks.startUtc);
  const ast = median(
    rows.flatMap((r) => (r.kind === 'offsets' ? [r.sigmaDRaMas!, r.sigmaDDecMas!] : [])),
  );
  const rv = median(
    rows.flatMap((r) => (r.kind === 'radial-velocity' ? [r.sigmaRadialVelocityKmS!] : [])),
  );
  const given = options.precision ?? {};
  const precision = {
    astrometryMas: given.astrometryMas ?? ast ?? DEFAULT_PRECISION.astrometryMas,
    spectroscopyKmS: given.spectroscopyKmS ?? rv ?? DEFAULT_PRECISION.spectroscopyKmS,
    source:
      given.astrometryMas !== undefined && given.spectroscopyKmS !== undefined
        ? 'the request'
        : "the request where given, else the median σ of the target's measurements of each kind, else the planner's defaults (1 mas, 5 km/s)",
  };
  const forecast = forecastDetection({
    orbit,
    measurements: rows.map(toInput),
    plan: planned.map((b) => ({
      jd: (parseEpoch(b.startUtc) + parseEpoch(b.endUtc)) / 2,
      kind: b.kind,
    })),
    precision,
  });
  return {
    ...forecast,
    solution: { id: solution.id, version: solution.version },
    at: jdToIso(options.atJd),
    precision,
    blockIds: planned.map((b) => b.id),
  };
}
