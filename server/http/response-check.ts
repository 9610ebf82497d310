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
import { routeKey, routeTable, type RouteTable } from './route-table.ts';

type Responses = Record<string, { content?: Record<string, { schema?: unknown }> }>;

const isZod = (s: unknown): s is z.ZodType =>
  typeof s === 'object' && s !== null && 'safeParse' in s;

export function responseCheck<E extends Env>(app: OpenAPIHono<E>): MiddlewareHandler {
  let table: RouteTable | undefined;
  return async (c, next) => {
    await next();
    const type = c.res.headers.get('content-type') ?? '';
    if (!type.includes('application/json')) return;
    const route = matchedRoutes(c)[c.req.routeIndex];
    if (!route) return;
    table ??= routeTable(app);
    const responses = table.get(routeKey(route))?.responses as Responses | undefined;
    const declared = responses?.[String(c.res.status)];
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
