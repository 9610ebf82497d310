/**
 * A guard for tests: every JSON answer must parse under the schema its route declares for that
 * status, so the OpenAPI document, and the client types generated from it, cannot drift from what
 * the server sends. Output object schemas are strict, so an undocumented field fails too.
 * On when `createApp({ checkResponses: true })` or EPOCHWRIGHT_CHECK_RESPONSES=1 (both test
 * projects set it); off in production, where it would only cost time.
 */
import type { OpenAPIHono, z } from '@hono/zod-openapi';
import type { Env, MiddlewareHandler } from 'hono';
import { matchedRoutes } from 'hono/route';
import { HttpError, errorResponse } from './errors.ts';

type Responses = Record<string, { content?: Record<string, { schema?: unknown }> }>;

/** `POST /api/targets/:id/fit` → the route's responses, from the registry of the mounted app. */
function routeTable<E extends Env>(app: OpenAPIHono<E>): Map<string, Responses> {
  const table = new Map<string, Responses>();
  for (const def of app.openAPIRegistry.definitions) {
    if (def.type !== 'route') continue;
    const path = def.route.path.replaceAll(/\{([^}]+)\}/g, ':$1');
    table.set(`${def.route.method.toUpperCase()} ${path}`, def.route.responses as Responses);
  }
  return table;
}

const isZod = (s: unknown): s is z.ZodType =>
  typeof s === 'object' && s !== null && 'safeParse' in s;

export function responseCheck<E extends Env>(app: OpenAPIHono<E>): MiddlewareHandler {
  let table: Map<string, Responses> | undefined;
  return async (c, next) => {
    await next();
    const type = c.res.headers.get('content-type') ?? '';
    if (!type.includes('application/json')) return;
    const route = matchedRoutes(c)[c.req.routeIndex];
    if (!route) return;
    table ??= routeTable(app);
    const declared = table.get(`${route.method} ${route.path}`)?.[String(c.res.status)];
    const schema = declared?.content?.['application/json']?.schema;
    if (!isZod(schema)) return;
    const result = schema.safeParse(await c.res.clone().json());
    if (result.success) return;
    const issue = result.error.issues[0];
    c.res = errorResponse(
      c,
      new HttpError(
        500,
        'response_schema',
        `${route.method} ${route.path} ${c.res.status}: the answer breaks its declared schema at ` +
          `${issue?.path.map(String).join('.') || '(body)'}: ${issue?.message}`,
        { issues: result.error.issues.slice(0, 10) },
      ),
    );
  };
}
