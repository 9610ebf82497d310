/**
 * The detection forecast of a stored target: its current orbit solution, its measurements, and its
 * blocks still planned after `at`, each at the precision the season planner would give it — the
 * precision model of its site (under its campaign's, and the request's, zenith values) at the
 * block's middle airmass (plan/precision.ts: precisionModel, precisionAt). A block whose middle the
 * limits close (the Moon, …) is listed as not counted. The forecast itself is the planning science's.
 */
import { and, eq, gte } from 'drizzle-orm';
import {
  blocks,
  campaigns,
  measurements,
  nights,
  sites,
  systems,
  targets,
} from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import {
  precisionAt,
  rounded,
  precisionModel,
  skyAtMoment,
  type BlockKind,
  type DetectionForecast,
  type ForecastEpoch,
  type Precision,
} from '../../science/plan/index.ts';
import { parseEpoch, jdToIso } from '../../science/time/index.ts';
import type { DbOrTx } from '../database.ts';
import { toInput } from '../fits.ts';
import { currentOrbit } from '../repos/orbits.ts';
import { placedTarget, planningSite } from './planning.ts';

export interface TargetForecastOptions {
  /** The moment the plan counts from, JD. */
  atJd: number;
  /** Zenith values over every site's and campaign's model, field by field. */
  precision?: Partial<Precision>;
}

export interface ForecastBlock {
  blockId: number;
  /** The block's middle, ISO 8601 UTC. */
  epoch: string;
  kind: BlockKind;
  site: string;
  /** The night (local evening date). */
  night: string;
}

export interface TargetForecast extends DetectionForecast {
  solution: { id: number; version: number };
  at: string;
  /** How each planned epoch's σ was set, each counted epoch with it, and the blocks not counted. */
  precision: {
    source: string;
    /** The range of σ per kind and the blocks not counted, in words (the CLI and the client show it). */
    text: string;
    epochs: (ForecastBlock & { airmass: number; sigma: number; unit: 'mas' | 'km/s' })[];
    notCounted: (ForecastBlock & { reason: string })[];
  };
  /** The planned blocks counted (ids), soonest first. */
  blockIds: number[];
}

/** @throws NotFoundError without a current solution; InputError when it has no distance */
export async function targetForecast(
  db: DbOrTx,
  targetId: number,
  options: TargetForecastOptions,
  run: Runner = inProcess,
): Promise<TargetForecast> {
  const { solution, orbit } = await currentOrbit(db, targetId);
  if (orbit.distancePc === null)
    throw new InputError(
      'orbit.distancePc',
      null,
      `target ${targetId}'s current solution has no distance; a forecast of the relativistic terms needs one`,
    );
  const rows = await db.select().from(measurements).where(eq(measurements.targetId, targetId));
  const planned = await plannedBlocks(db, targetId, options.atJd);
  const [placed] = await db
    .select({ t: targets, s: systems })
    .from(targets)
    .innerJoin(systems, eq(systems.id, targets.systemId))
    .where(eq(targets.id, targetId));
  const target = await placedTarget(db, placed!.t, placed!.s);
  const given = options.precision ?? {};
  const { counted, notCounted, plan } = planEpochs(planned, target, given);
  const zenith = precisionModel([given]);
  // The Fisher matrix over every measurement runs where `run` puts it (the server: the pool).
  const forecast = await run('forecastDetection', {
    orbit,
    measurements: rows.map(toInput),
    plan,
    precision: { astrometryMas: zenith.astrometryMas, spectroscopyKmS: zenith.spectroscopyKmS },
  });
  const text = precisionText(counted, notCounted);
  return {
    ...forecast,
    solution: { id: solution.id, version: solution.version },
    at: jdToIso(options.atJd),
    precision: {
      source:
        "each planned block at the season planner's precision: its site's model (under the " +
        "request's, then its campaign's zenith values) × airmass^0.6 at the block's middle",
      text,
      epochs: counted,
      notCounted,
    },
    blockIds: counted.map((e) => e.blockId),
  };
}

/** The target's planned blocks from `atJd` on, with their nights, sites and campaigns. */
function plannedBlocks(db: DbOrTx, targetId: number, atJd: number) {
  return db
    .select({ b: blocks, n: nights, s: sites, c: campaigns })
    .from(blocks)
    .innerJoin(nights, eq(nights.id, blocks.nightId))
    .innerJoin(sites, eq(sites.id, nights.siteId))
    .leftJoin(campaigns, eq(campaigns.id, nights.campaignId))
    .where(
      and(
        eq(blocks.targetId, targetId),
        eq(blocks.status, 'planned'),
        gte(blocks.startUtc, jdToIso(atJd)),
      ),
    )
    .orderBy(blocks.startUtc);
}

type Counted = TargetForecast['precision']['epochs'];
type NotCounted = TargetForecast['precision']['notCounted'];

/**
 * Each planned block at its middle: open, it counts with the season planner's precision there
 * (its site's model under the request's, then its campaign's, × airmass^0.6); closed, it is
 * listed with the reason.
 */
function planEpochs(
  planned: Awaited<ReturnType<typeof plannedBlocks>>,
  target: Awaited<ReturnType<typeof placedTarget>>,
  given: NonNullable<TargetForecastOptions['precision']>,
): { counted: Counted; notCounted: NotCounted; plan: ForecastEpoch[] } {
  const counted: Counted = [];
  const notCounted: NotCounted = [];
  const plan: ForecastEpoch[] = [];
  for (const { b, n, s, c } of planned) {
    const jd = (parseEpoch(b.startUtc) + parseEpoch(b.endUtc)) / 2;
    const where = planningSite(s, c?.limits ?? {}, c?.goals.wavelengthUm);
    const base = {
      blockId: b.id,
      epoch: jdToIso(jd),
      kind: b.kind,
      site: s.name,
      night: n.date,
    };
    const moment = skyAtMoment(where.site, where.limits, target, jd);
    if (!moment.open) {
      notCounted.push({ ...base, reason: moment.words ?? 'closed' });
      continue;
    }
    const model = precisionModel([given, c?.goals.precision, where.precision]);
    const p = precisionAt(model, moment.airmass!, where.limits.zenithSeeingArcsec);
    const sigma = b.kind === 'astrometry' ? p.astrometryMas : p.spectroscopyKmS;
    counted.push({
      ...base,
      airmass: moment.airmass!,
      sigma,
      unit: b.kind === 'astrometry' ? 'mas' : 'km/s',
    });
    plan.push({ jd, kind: b.kind, sigma });
  }
  return { counted, notCounted, plan };
}

/** The precision in words: each kind's σ range over the counted epochs, then what was not counted. */
function precisionText(counted: Counted, notCounted: NotCounted): string {
  const range = (unit: 'mas' | 'km/s', what: string) => {
    const xs = counted.filter((e) => e.unit === unit).map((e) => e.sigma);
    if (xs.length === 0) return null;
    const [lo, hi] = [Math.min(...xs), Math.max(...xs)];
    const span =
      rounded(lo, 2) === rounded(hi, 2) ? rounded(lo, 2) : `${rounded(lo, 2)}–${rounded(hi, 2)}`;
    return `${what} σ ${span} ${unit} (${xs.length} epoch${xs.length === 1 ? '' : 's'})`;
  };
  const ranges = [range('mas', 'astrometry'), range('km/s', 'radial velocity')].filter(Boolean);
  const left = notCounted.map((e) => `${e.site} ${e.night} ${e.kind}: ${e.reason}`);
  const words = ranges.length ? ranges.join(', ') : 'no planned epoch counted';
  return left.length
    ? `${words}; not counted (closed at the block's middle): ${left.join('; ')}`
    : words;
}
