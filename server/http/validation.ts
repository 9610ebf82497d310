/**
 * A request's shape is checked here: zod's verdict on its parts becomes RequestInvalid (400 for a
 * wrong shape, 422 when every issue is a broken rule) with field-level details, and a query
 * parameter its route does not declare is refused with a 400.
 */
import type { Context, Env, MiddlewareHandler } from 'hono';
import type { OpenAPIHono, RouteConfig, z } from '@hono/zod-openapi';
import { HttpError } from './errors.ts';
import { RequestInvalid, type RequestIssue } from './request-invalid.ts';
import { declaredRoute, routeTable, type RouteTable } from './route-table.ts';

interface Issue {
  path: PropertyKey[];
  message: string;
  code: string;
  input?: unknown;
  /** invalid_union: each member's own issues, paths relative to the union. */
  errors?: Issue[][];
}

/**
 * A union that matched no member is reported by the member the input came closest to (fewest
 * issues), field by field: `orbit.elements.periodYears: expected number`, not `orbit.elements:
 * Invalid input` (an input shaped as Campbell elements is read against the Campbell member).
 */
function flatten(issue: Issue): Issue[] {
  const members = issue.code === 'invalid_union' ? (issue.errors ?? []) : [];
  if (members.length === 0) return [issue];
  const closest = members.reduce((a, b) => (b.length < a.length ? b : a));
  if (closest.length === 0) return [issue];
  return closest.flatMap((i) => flatten({ ...i, path: [...issue.path, ...i.path] }));
}

/** One entry per problem: the field path, the rule in words, and the value sent there. */
export function describeIssues(error: z.ZodError, input?: unknown): RequestIssue[] {
  return (error.issues as Issue[]).flatMap(flatten).map((i) => {
    const value = valueAt(input, i.path);
    return {
      field: i.path.map(String).join('.') || '(body)',
      rule: i.message,
      code: i.code,
      ...(value === undefined ? {} : { value }),
    };
  });
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let v = input;
  for (const k of path)
    v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k] : undefined;
  return v;
}

/** The OpenAPIHono default hook: a failed validation names every field. */
export function validationHook(
  result: { success: boolean; error?: z.ZodError; data?: unknown; target?: string },
  _c: Context,
): void {
  if (!result.success && result.error)
    throw new RequestInvalid(describeIssues(result.error, result.data), result.target);
}

/** Query parameters renamed in our own words: the old name is refused with the new one named. */
const RENAMED_PARAMETERS: Record<string, string> = { from: 'start', to: 'end', every: 'step' };

/** The query parameters a route declares (none when it declares no query). */
function acceptedParameters(route: RouteConfig): string[] {
  const query = route.request?.query as { shape?: Record<string, unknown> } | undefined;
  return Object.keys(query?.shape ?? {}).sort();
}

/**
 * Refuses, with a 400 naming it and the accepted ones, a query parameter the matched route does not
 * declare: `?campaignId=3` on an export, or an old name such as `from`, would otherwise be ignored
 * and the answer would cover more than was asked. Runs before sign-in and before any work.
 */
export function unknownQueryCheck<E extends Env>(app: OpenAPIHono<E>): MiddlewareHandler {
  let table: RouteTable | undefined;
  return async (c, next) => {
    table ??= routeTable(app);
    const route = declaredRoute(c, table);
    const names = route ? [...new URL(c.req.url).searchParams.keys()] : [];
    if (route && names.length > 0) {
      const accepted = acceptedParameters(route);
      const unknown = [...new Set(names)].filter((n) => !accepted.includes(n));
      if (unknown.length > 0) {
        const where = `${route.method.toUpperCase()} ${route.path}`;
        const list = accepted.length > 0 ? `accepted: ${accepted.join(', ')}` : 'it takes none';
        const issues = unknown.map((n) => ({
          field: n,
          rule:
            `is not a query parameter of ${where}` +
            `${RENAMED_PARAMETERS[n] && accepted.includes(RENAMED_PARAMETERS[n]) ? ` (renamed: use ${RENAMED_PARAMETERS[n]})` : ''}` +
            `; ${list}`,
          code: 'unknown_parameter',
        }));
        const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
        throw new HttpError(
          400,
          'invalid_request',
          `${issues[0]!.field}: ${issues[0]!.rule}${more}`,
          {
            issues,
            accepted,
          },
        );
      }
    }
    await next();
  };
}
