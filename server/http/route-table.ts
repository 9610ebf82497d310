/**
 * The routes as declared (the OpenAPI registry of the mounted app), looked up by the route a
 * request matched: what the query check and the response check read a route's rules from.
 */
import type { OpenAPIHono, RouteConfig } from '@hono/zod-openapi';
import type { Context, Env } from 'hono';
import { matchedRoutes } from 'hono/route';

export type RouteTable = Map<string, RouteConfig>;

/** `POST /api/targets/:id/fit` → its declaration, for every route the app documents. */
export function routeTable<E extends Env>(app: OpenAPIHono<E>): RouteTable {
  const table: RouteTable = new Map();
  for (const def of app.openAPIRegistry.definitions) {
    if (def.type !== 'route') continue;
    const path = def.route.path.replaceAll(/\{([^}]+)\}/g, ':$1');
    table.set(`${def.route.method.toUpperCase()} ${path}`, def.route);
  }
  return table;
}

/** The key of a matched route (`GET /api/nights/:id`), as `routeTable` files it. */
export const routeKey = (r: { method: string; path: string }) => `${r.method} ${r.path}`;

/**
 * The declared route a request is answered by, found before it runs (middleware sees every route
 * the request matched, its own `ALL /api/*` entries first); undefined where no documented route
 * matched (a 404, a 405, the OpenAPI document itself).
 */
export function declaredRoute(c: Context, table: RouteTable): RouteConfig | undefined {
  for (const r of matchedRoutes(c)) {
    const found = table.get(routeKey(r));
    if (found) return found;
  }
  return undefined;
}
