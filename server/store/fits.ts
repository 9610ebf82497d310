/**
 * Fits of stored measurements: gather a target's (or a system's) measurements into a fit request,
 * with defaults from the current orbit solutions, and accept a fit as new orbit-solution versions
 * with their provenance, all targets in one transaction. The fit itself is the orbit engine's.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { measurements, orbitSolutions, targets } from '../../db/schema.ts';
import { InputError } from '../science/errors.ts';
import { JULIAN_YEAR_DAYS } from '../science/constants.ts';
import { toCampbellInput, validateOrbit, type RelativitySwitches } from '../science/orbit/index.ts';
import type {
  FitRequest,
  FitResult,
  MeasurementInput,
  StarHints,
} from '../science/orbit/fit/index.ts';
import type { Actor } from './audit.ts';
import { getById } from './crud.ts';
import type { StoreContext } from './context.ts';
import { measurementsInEpochOrder, type MeasurementRow } from './repos/measurements.ts';
import type { OrbitSolutionRow } from './repos/orbits.ts';
import { systemEntity, targetEntity } from './repos/catalogue.ts';
import { nowIso } from '../clock.ts';
import { describeKind, fieldsOfKind } from '../../descriptors/measurement-kinds.ts';

/** What a stored fit may set; everything else comes from the stored measurements. */
export type StoredFitOptions = Omit<FitRequest, 'stars'> & {
  /** Only these measurements (ids); default every measurement of the targets. */
  measurementIds?: number[];
  /** Search ranges per target name; default P from 0.75 to 1.35 times the current solution's, which is also a start. */
  hints?: Record<string, StarHints>;
};

export interface PreparedFit {
  request: FitRequest;
  targets: { id: number; name: string; measurementIds: number[] }[];
}

/** A stored measurement as the fit reads it: its kind's fields, and the correlation when stored. */
export function toInput(m: MeasurementRow): MeasurementInput {
  const fields = Object.fromEntries(fieldsOfKind(m.kind).map((f) => [f, m[f]]));
  const correlation =
    describeKind(m.kind).correlated && m.correlation !== null ? { correlation: m.correlation } : {};
  return {
    kind: m.kind,
    component: m.component,
    epoch: m.epoch,
    id: String(m.id),
    ...fields,
    ...correlation,
  } as MeasurementInput;
}

/**
 * The targets of a system that have measurements, by id; `only` picks some of them.
 * @throws NotFoundError for an unknown system; InputError for a target outside the system
 */
export async function systemTargetIds(
  store: StoreContext,
  systemId: number,
  only?: number[],
): Promise<number[]> {
  await getById(store.db, systemEntity, systemId);
  const rows = await store.db
    .selectDistinct({ id: targets.id })
    .from(targets)
    .innerJoin(measurements, eq(measurements.targetId, targets.id))
    .where(eq(targets.systemId, systemId))
    .orderBy(targets.id);
  const ids = rows.map((r) => r.id);
  if (!only) return ids;
  only.forEach((id, k) => {
    if (!ids.includes(id))
      throw new InputError(
        `targetIds.${k}`,
        id,
        `is not a target of system ${systemId} with measurements (those are ${ids.join(', ')})`,
      );
  });
  return only;
}

/** Build the fit request of the given targets from their stored measurements. */
export async function prepareStoredFit(
  store: StoreContext,
  targetIds: number[],
  options: StoredFitOptions,
): Promise<PreparedFit> {
  if (targetIds.length === 0)
    throw new InputError('targets', targetIds, 'must name at least one target with measurements');
  const { measurementIds, hints, ...rest } = options;
  // Each target's rows in epoch order, in pages (a star may have 100,000 measurements), each
  // row made the fit's input as its page comes in.
  const byTarget = new Map<number, { id: number; input: MeasurementInput }[]>();
  for (const id of targetIds)
    byTarget.set(
      id,
      await measurementsInEpochOrder(store.db, id, [], (r) => ({ id: r.id, input: toInput(r) })),
    );
  const chosen = measurementIds ? new Set(measurementIds) : null;
  if (measurementIds) {
    const stored = new Set<number>();
    for (const rows of byTarget.values()) for (const r of rows) stored.add(r.id);
    measurementIds.forEach((id, k) => {
      if (!stored.has(id))
        throw new InputError(
          `measurementIds.${k}`,
          id,
          `is not a measurement of target ${targetIds.join(', ')}`,
        );
    });
  }
  const current = await store.db
    .select()
    .from(orbitSolutions)
    .where(and(inArray(orbitSolutions.targetId, targetIds), eq(orbitSolutions.current, true)));
  const out: PreparedFit['targets'] = [];
  const stars: FitRequest['stars'] = [];
  for (const id of targetIds) {
    const target = await getById(store.db, targetEntity, id);
    const all = byTarget.get(id)!;
    const mine = chosen ? all.filter((r) => chosen.has(r.id)) : all;
    if (mine.length === 0)
      throw new InputError('targets', id, `target ${target.name} has no measurements to fit`);
    const sol = current.find((c) => c.targetId === id);
    let starHints = hints?.[target.name];
    if (sol) {
      const orbit = validateOrbit(sol.orbit, 'orbit');
      const p = orbit.periodDays / JULIAN_YEAR_DAYS;
      starHints = { ...(starHints ?? { periodYears: { min: 0.75 * p, max: 1.35 * p } }) };
      starHints.start ??= {
        elements: toCampbellInput(orbit),
        ...(orbit.distancePc !== null ? { distancePc: orbit.distancePc } : {}),
        systemicVelocityKmS: orbit.gammaKmS,
      };
    }
    // Each star keeps its stored solution's switches unless the request sets them for all.
    const own: Partial<RelativitySwitches> | undefined =
      sol && rest.relativity === undefined
        ? validateOrbit(sol.orbit, 'orbit').relativity
        : undefined;
    stars.push({
      name: target.name,
      measurements: mine.map((r) => r.input),
      ...(starHints ? { hints: starHints } : {}),
      ...(own ? { relativity: own } : {}),
    });
    out.push({ id, name: target.name, measurementIds: mine.map((r) => r.id) });
  }
  const relativityOrigin =
    rest.relativity === undefined ? "the stored solution's switches" : 'the request';
  return { request: { ...rest, relativityOrigin, stars }, targets: out };
}

/**
 * Store each fitted star as a new orbit-solution version of its target (provenance "fitted",
 * the measurements used, method and χ² in the reference), made current; all or none.
 */
export async function acceptStoredFit(
  store: StoreContext,
  actor: Actor,
  prepared: PreparedFit,
  result: FitResult,
  notes = '',
): Promise<OrbitSolutionRow[]> {
  const when = nowIso();
  const reference =
    `fit ${when}: ` +
    `${result.derivatives === 'analytic' ? '' : 'relativistic terms on; '}χ² = ` +
    `${result.chi2.toFixed(2)} for ${result.dof} degrees of ` +
    `freedom${result.reducedChi2 !== null ? ` (χ²/dof = ${result.reducedChi2.toFixed(3)})` : ''}` +
    `, loss ${result.loss}, ${result.outliers} outlier(s)`;
  return store.db.transaction(async (tx) => {
    const rows: OrbitSolutionRow[] = [];
    for (const [k, t] of prepared.targets.entries()) {
      const star = result.stars[k]!;
      rows.push(
        await store.orbitSolutions.createIn(tx, actor, {
          targetId: t.id,
          orbit: star.orbit,
          provenance: 'fitted',
          fittedFrom: t.measurementIds,
          reference: reference.slice(0, 500),
          notes,
          makeCurrent: true,
        }),
      );
    }
    return rows;
  });
}
