/**
 * 405 Method Not Allowed (RFC 9110 §15.5.6) for a path the API serves under other methods, with
 * the `Allow` header listing them: a PATCH on an orbit solution (an immutable version) is refused
 * as such, not reported missing. Paths that no route knows still fall through to 404.
 */
import type { MiddlewareHandler } from 'hono';
import { HttpError, errorResponse } from './errors.ts';

interface RouteInfo {
  method: string;
  path: string;
}

/** A hono route path (`/api/orbit-solutions/:id`, `:name{regex}`, `*`) as a whole-path regular expression. */
function pathPattern(path: string): RegExp {
  const body = path
    .split('/')
    .map((seg) => {
      if (seg === '*') return '.*';
      const param = /^:[^{]+(?:\{(.+)\})?$/.exec(seg);
      if (param) return param[1] ? `(?:${param[1]})` : '[^/]+';
      return seg.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    })
    .join('/');
  return new RegExp(`^${body}$`); // hono matches paths strictly: no optional trailing slash
}

/**
 * Mount after every route and before the 404 fallback. `routes` is read on first use, so routes
 * added after mounting still count. Middleware (method ALL) does not make a path known.
 */
export function methodNotAllowed(app: { routes: readonly RouteInfo[] }): MiddlewareHandler {
  let known: { pattern: RegExp; method: string }[] | null = null;
  return async (c, next) => {
    known ??= app.routes
      .filter((r) => r.method !== 'ALL')
      .map((r) => ({ pattern: pathPattern(r.path), method: r.method.toUpperCase() }));
    const methods = new Set(known.filter((r) => r.pattern.test(c.req.path)).map((r) => r.method));
    if (methods.size === 0 || methods.has(c.req.method)) return next();
    if (methods.has('GET')) methods.add('HEAD'); // hono answers HEAD from the GET route
    const allow = [...methods].sort();
    c.header('Allow', allow.join(', '));
    return errorResponse(
      c,
      new HttpError(
        405,
        'method_not_allowed',
        `${c.req.method} is not allowed on ${c.req.path}; allowed: ${allow.join(', ')}`,
        { method: c.req.method, allow },
      ),
    );
  };
}
