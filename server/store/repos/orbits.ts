/**
 * Orbit solutions: immutable versions per target, elements stored as given and checked by the
 * orbit engine's validateOrbit before any write. Exactly one version per target is current.
 */
import { and, desc, eq, max } from 'drizzle-orm';
import { orbitSolutions } from '../../../db/schema.ts';
import { InputError } from '../../science/errors.ts';
import {
  THIELE_INNES_PARAMETERS,
  validateOrbit,
  type Orbit,
  type OrbitInput,
} from '../../science/orbit/index.ts';
import { recordAudit, type Actor } from '../audit.ts';
import { nowIso } from '../../clock.ts';
import { entity, getById, list, remove, requireRef, type Page, type PageRequest } from '../crud.ts';
import type { Db, DbOrTx } from '../database.ts';
import { ConflictError, NotFoundError } from '../errors.ts';
import { parseInput } from '../schemas/common.ts';
import { OrbitSolutionInput } from '../schemas/entities.ts';
import { targetEntity } from './catalogue.ts';
import { measurementEntity } from './measurements.ts';

export type OrbitSolutionRow = typeof orbitSolutions.$inferSelect;

/** Which versions to list: of one target, only the current one (true) or only earlier ones (false). */
export interface OrbitSolutionFilter {
  targetId?: number | undefined;
  current?: boolean | undefined;
}

export const orbitSolutionEntity = entity<OrbitSolutionRow>({
  name: 'orbit solution',
  table: orbitSolutions,
  hasUpdatedAt: false,
  versioned: false,
  orderBy: [orbitSolutions.targetId, orbitSolutions.version],
});

async function setCurrent(tx: DbOrTx, targetId: number, solutionId: number): Promise<void> {
  // Clear first: the partial unique index allows one current row per target at any moment.
  await tx
    .update(orbitSolutions)
    .set({ current: false })
    .where(and(eq(orbitSolutions.targetId, targetId), eq(orbitSolutions.current, true)));
  await tx.update(orbitSolutions).set({ current: true }).where(eq(orbitSolutions.id, solutionId));
}

export function orbitSolutionRepository(db: Db) {
  return {
    entity: orbitSolutionEntity,
    list: (filter: OrbitSolutionFilter = {}, page?: PageRequest): Promise<Page<OrbitSolutionRow>> =>
      list(
        db,
        orbitSolutionEntity,
        [
          filter.targetId ? eq(orbitSolutions.targetId, filter.targetId) : undefined,
          filter.current === undefined ? undefined : eq(orbitSolutions.current, filter.current),
        ],
        page,
      ),
    get: (id: number) => getById(db, orbitSolutionEntity, id),
    /** The target's current solution and its validated orbit (404 when it has none). */
    current: (targetId: number) => currentOrbit(db, targetId),
    createIn,
    create: (actor: Actor, input: unknown) => db.transaction((tx) => createIn(tx, actor, input)),
    /** Make an earlier (or later) version the target's current one. */
    makeCurrent: (actor: Actor, id: number) =>
      db.transaction(async (tx) => {
        const row = await getById(tx, orbitSolutionEntity, id);
        await setCurrent(tx, row.targetId, id);
        await recordAudit(tx, actor, 'update', 'orbit solution', id, { current: true });
        return { ...row, current: true };
      }),
    /** Versions are history: only a version that is not current may be removed. */
    remove: async (actor: Actor, id: number) => {
      const row = await getById(db, orbitSolutionEntity, id);
      if (row.current)
        throw new ConflictError(
          'not_allowed',
          `orbit solution ${id} is the current one of target ${row.targetId}; make another version current first`,
        );
      await remove(db, orbitSolutionEntity, actor, id);
    },
  };
}

/**
 * A new version of a target's orbit inside `tx`: checked by the orbit engine, a fitted one with
 * the target's own measurements; the first version (or one asked to be) becomes current.
 */
async function createIn(tx: DbOrTx, actor: Actor, input: unknown): Promise<OrbitSolutionRow> {
  const s = parseInput(OrbitSolutionInput, input);
  const checked = validateOrbit(s.orbit as unknown as OrbitInput, 'orbit');
  // Stored as given, except a covariance over Thiele–Innes constants: kept as the orbit engine
  // carried it to a, i, Ω, ω, the parameters every reader of a stored covariance expects.
  const tiCovariance = (
    s.orbit.covariance as { parameters?: string[] } | undefined
  )?.parameters?.some((p) => (THIELE_INNES_PARAMETERS as readonly string[]).includes(p));
  const orbit = tiCovariance ? { ...s.orbit, covariance: checked.covariance! } : s.orbit;
  await requireRef(tx, targetEntity, 'targetId', s.targetId);
  if (s.provenance === 'fitted' && !(s.fittedFrom && s.fittedFrom.length > 0)) {
    throw new InputError(
      'fittedFrom',
      s.fittedFrom,
      'must list the measurements a fitted solution used',
    );
  }
  for (const [k, m] of (s.fittedFrom ?? []).entries()) {
    const row = await requireRef(tx, measurementEntity, `fittedFrom.${k}`, m);
    if (row.targetId !== s.targetId)
      throw new InputError(
        `fittedFrom.${k}`,
        m,
        `is a measurement of target ${row.targetId}, not ${s.targetId}`,
      );
  }
  const [{ last }] = (await tx
    .select({ last: max(orbitSolutions.version) })
    .from(orbitSolutions)
    .where(eq(orbitSolutions.targetId, s.targetId))) as [{ last: number | null }];
  const version = (last ?? 0) + 1;
  const makeCurrent = s.makeCurrent || last === null;
  const [row] = await tx
    .insert(orbitSolutions)
    .values({
      targetId: s.targetId,
      version,
      current: false,
      orbit: orbit as unknown as OrbitInput,
      provenance: s.provenance,
      fittedFrom: s.fittedFrom ?? null,
      reference: s.reference,
      notes: s.notes,
      createdBy: actor.userId,
      createdAt: nowIso(),
    })
    .returning();
  if (makeCurrent) await setCurrent(tx, s.targetId, row!.id);
  await recordAudit(tx, actor, 'create', 'orbit solution', row!.id, {
    targetId: s.targetId,
    version,
    provenance: s.provenance,
  });
  return { ...row!, current: makeCurrent };
}

/** The current solution of a target and its validated orbit. */
export async function currentOrbit(
  db: DbOrTx,
  targetId: number,
): Promise<{ solution: OrbitSolutionRow; orbit: Orbit }> {
  await getById(db, targetEntity, targetId);
  const [solution] = await db
    .select()
    .from(orbitSolutions)
    .where(and(eq(orbitSolutions.targetId, targetId), eq(orbitSolutions.current, true)))
    .orderBy(desc(orbitSolutions.version))
    .limit(1);
  if (!solution) throw new NotFoundError('current orbit solution for target', targetId);
  return { solution, orbit: validateOrbit(solution.orbit, 'orbit') };
}
