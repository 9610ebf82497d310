/**
 * /orbit-solutions: immutable versions of each target's orbit (lead writes). A new version
 * becomes current unless told otherwise; an older one can be made current again.
 */
import { createRoute, z } from '@hono/zod-openapi';
import { OrbitSolutionInput, type Store } from '../../store/index.ts';
import { requireRole, writer } from '../auth.ts';
import { OrbitSchema } from '../schemas/orbit.ts';
import {
  IdParam,
  PageQuery,
  errorResponses,
  json,
  optionalId,
  pageOf,
  resourceApp,
  security,
} from './common.ts';

const tags = ['orbit solutions'];
const Create = OrbitSolutionInput.extend({ orbit: OrbitSchema }).strict();
export const OrbitSolutionRowSchema = OrbitSolutionInput.omit({ makeCurrent: true })
  .extend({
    orbit: OrbitSchema,
    id: z.number().int(),
    version: z.number().int(),
    current: z.boolean(),
    createdBy: z.number().int().nullable(),
    createdAt: z.string(),
  })
  .strict()
  .openapi('OrbitSolutionRow');
const Row = OrbitSolutionRowSchema;
const Filters = PageQuery.extend({
  targetId: optionalId,
  current: z
    .enum(['true', 'false'])
    .optional()
    .openapi({ description: 'only the current (true) or only earlier versions (false)' }),
});

export function orbitSolutionRoutes(store: Store) {
  const app = resourceApp();
  addSolutionList(app, store);
  addSolutionRead(app, store);
  addSolutionCreate(app, store);
  addSolutionCurrent(app, store);
  addSolutionDelete(app, store);
  return app;
}

type ResourceApp = ReturnType<typeof resourceApp>;

/** Orbit solutions, every version. */
function addSolutionList(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/orbit-solutions',
      tags,
      security,
      summary: 'List orbit solutions (all versions)',
      request: { query: Filters },
      responses: { 200: json(pageOf(Row), 'one page'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { current, targetId, ...page } = c.req.valid('query');
      const filter = { targetId, current: current === undefined ? undefined : current === 'true' };
      return c.json(await store.orbitSolutions.list(filter, page), 200);
    },
  );
}

/** One orbit solution. */
function addSolutionRead(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/orbit-solutions/{id}',
      tags,
      security,
      summary: 'Read one orbit solution',
      request: { params: IdParam },
      responses: { 200: json(Row, 'the solution'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      return c.json(await store.orbitSolutions.get(c.req.valid('param').id), 200);
    },
  );
}

/** A new version of a target's orbit, checked by the orbit engine. */
function addSolutionCreate(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/orbit-solutions',
      tags,
      security,
      summary: 'Store a new version of a target’s orbit (checked by the orbit engine)',
      request: { body: { content: { 'application/json': { schema: Create } }, required: true } },
      responses: { 201: json(Row, 'stored'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      return c.json(await store.orbitSolutions.create(actor, c.req.valid('json')), 201);
    },
  );
}

/** Make a version its target's current solution. */
function addSolutionCurrent(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/orbit-solutions/{id}/current',
      tags,
      security,
      summary: 'Make this version the target’s current solution',
      request: { params: IdParam },
      responses: { 200: json(Row, 'now current'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      return c.json(await store.orbitSolutions.makeCurrent(actor, c.req.valid('param').id), 200);
    },
  );
}

/** Delete a version that is not current. */
function addSolutionDelete(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'delete',
      path: '/orbit-solutions/{id}',
      tags,
      security,
      summary: 'Delete a version that is not current',
      request: { params: IdParam },
      responses: { 204: { description: 'deleted' }, ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      await store.orbitSolutions.remove(actor, c.req.valid('param').id);
      return c.body(null, 204);
    },
  );
}
