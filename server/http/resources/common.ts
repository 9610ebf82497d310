/**
 * What every store resource shares: the error handler, paging, the bearer security note for the
 * OpenAPI document, and the five routes of a plain resource (list, read, create, update, delete).
 */
import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import type { Repository, Role, Store } from '../../store/index.ts';
import { requireRole, writer, type AuthEnv } from '../auth.ts';
import { errorResponse } from '../errors.ts';
import { errorResponses, json } from '../schemas/responses.ts';
import { validationHook } from '../validation.ts';

export function resourceApp() {
  const app = new OpenAPIHono<AuthEnv>({ defaultHook: validationHook });
  app.onError((err, c) => errorResponse(c, err));
  return app;
}
export type ResourceApp = ReturnType<typeof resourceApp>;

export const security = [{ bearer: [] }];
export { errorResponses, json };
/**
 * Ids and counts in paths and queries are written in plain decimal: `0x2`, `2.0`, `1e0` or ` 2`
 * would otherwise be read as a number (and change the wrong row), so they are refused as they are.
 */
const decimalInteger = (min: 0 | 1, description: string) =>
  z
    // A number here is one this schema already read (handlers parse a checked query again).
    .preprocess((v) => (typeof v === 'number' ? String(v) : v), z.string())
    .pipe(
      z.string().regex(min === 1 ? /^[1-9][0-9]{0,14}$/ : /^(0|[1-9][0-9]{0,14})$/, {
        message:
          `must be a ${min === 1 ? 'positive' : 'non-negative'} whole number in plain ` +
          `decimal digits (${description})`,
      }),
    )
    .transform(Number);
const pathId = decimalInteger(1, 'an id such as 12');
export const IdParam = z.object({
  id: pathId.openapi({ param: { name: 'id', in: 'path' }, type: 'integer' }),
});
export const PageQuery = z.object({
  limit: decimalInteger(1, 'a page size 1–500')
    .pipe(z.number().max(500))
    .default(50)
    .openapi({ description: 'page size, 1–500', type: 'integer' }),
  offset: decimalInteger(0, 'rows to skip').default(0).openapi({ type: 'integer' }),
});
const VersionField = z.object({
  version: z.number().int().positive().openapi({ description: 'the version you last read' }),
});
export const optionalId = pathId.optional().openapi({ type: 'integer' });
export const pageOf = (item: z.ZodType) =>
  z.object({
    items: z.array(item),
    total: z.number().int(),
    limit: z.number().int(),
    offset: z.number().int(),
  });

export interface ResourceSpec<T, Q extends z.ZodObject> {
  store: Store;
  path: string;
  tag: string;
  /** The store's repository; its typed filter is what `filters` parses from the query string. */
  repo: Repository<T, z.output<Q>>;
  create: z.ZodType;
  patch: z.ZodObject;
  row: z.ZodType;
  filters: Q;
  writeRole: Role;
  /** Enrich a row for output (join tables, outcomes). */
  view?: (row: T) => Promise<unknown>;
}

/** The five routes of a plain resource. Versioned resources take `version` in the PATCH body. */
export function crudRoutes<T, Q extends z.ZodObject>(spec: ResourceSpec<T, Q>) {
  const app = resourceApp();
  const view = spec.view ?? (async (r: T) => r);
  addCrudReads(app, spec, view);
  addCrudWrites(app, spec, view);
  return app;
}

/** The list (one page, filtered) and the one-record read. */
function addCrudReads<T, Q extends z.ZodObject>(
  app: ResourceApp,
  spec: ResourceSpec<T, Q>,
  view: (r: T) => Promise<unknown>,
): void {
  const { path, tag, repo } = spec;
  const one = `${path}/{id}`;
  app.openapi(
    createRoute({
      method: 'get',
      path,
      tags: [tag],
      security,
      summary: `List ${tag}`,
      request: { query: PageQuery.extend(spec.filters.shape) },
      responses: { 200: json(pageOf(spec.row), 'one page'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      // The route checked the whole query; its two parts are read with their own schemas, since
      // TypeScript cannot follow a generic extend (this parse cannot fail).
      const query = c.req.valid('query');
      const page = await repo.list(spec.filters.parse(query), PageQuery.parse(query));
      return c.json({ ...page, items: await Promise.all(page.items.map(view)) }, 200);
    },
  );
  app.openapi(
    createRoute({
      method: 'get',
      path: one,
      tags: [tag],
      security,
      summary: `Read one of ${tag}`,
      request: { params: IdParam },
      responses: { 200: json(spec.row, 'the record'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      return c.json(await view(await repo.get(c.req.valid('param').id)), 200);
    },
  );
}

/** Create, change (with the version read, for versioned entities) and delete, by the writing role. */
function addCrudWrites<T, Q extends z.ZodObject>(
  app: ResourceApp,
  spec: ResourceSpec<T, Q>,
  view: (r: T) => Promise<unknown>,
): void {
  const { path, tag, repo, writeRole } = spec;
  const versioned = repo.entity.versioned;
  const patchBody = versioned ? spec.patch.extend(VersionField.shape) : spec.patch;
  const one = `${path}/{id}`;
  app.openapi(
    createRoute({
      method: 'post',
      path,
      tags: [tag],
      security,
      summary: `Create one of ${tag}`,
      request: {
        body: { content: { 'application/json': { schema: spec.create } }, required: true },
      },
      responses: { 201: json(spec.row, 'created'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, writeRole);
      return c.json(await view(await repo.create(actor, c.req.valid('json'))), 201);
    },
  );
  app.openapi(
    createRoute({
      method: 'patch',
      path: one,
      tags: [tag],
      security,
      summary: `Change one of ${tag}${versioned ? ' (send the version you read; 409 if it changed)' : ''}`,
      request: {
        params: IdParam,
        body: { content: { 'application/json': { schema: patchBody } }, required: true },
      },
      responses: { 200: json(spec.row, 'the changed record'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, writeRole);
      const { version, ...patch } = c.req.valid('json');
      const checked = versioned ? VersionField.parse({ version }).version : undefined;
      return c.json(
        await view(await repo.update(actor, c.req.valid('param').id, patch, checked)),
        200,
      );
    },
  );
  app.openapi(
    createRoute({
      method: 'delete',
      path: one,
      tags: [tag],
      security,
      summary: `Delete one of ${tag}`,
      request: { params: IdParam },
      responses: { 204: { description: 'deleted' }, ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, writeRole);
      await repo.remove(actor, c.req.valid('param').id);
      return c.body(null, 204);
    },
  );
}

/** A PATCH body: every field optional, no defaults (a missing field stays as stored), no unknown keys. */
export function patchOf(fields: z.ZodObject, fixed: readonly string[] = []): z.ZodObject {
  const shape = Object.fromEntries(
    Object.entries(fields.shape)
      .filter(([k]) => !fixed.includes(k))
      .map(([k, v]) => [
        k,
        (v instanceof z.ZodDefault ? (v.unwrap() as z.ZodType) : (v as z.ZodType)).optional(),
      ]),
  );
  return z.object(shape).strict();
}

/**
 * The stored row as documented, under its component name: the input fields plus id and
 * timestamps. Strict, so the test-time response check fails on a field the document leaves out.
 */
export function rowOf(
  name: string,
  fields: z.ZodObject,
  extra: Record<string, z.ZodType> = {},
): z.ZodObject {
  return fields
    .extend({
      id: z.number().int(),
      createdAt: z.string(),
      updatedAt: z.string().optional(),
      ...extra,
    })
    .strict()
    .openapi(name);
}
