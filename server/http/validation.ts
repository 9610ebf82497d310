/**
 * Turns zod's verdict on a request into our 400 error with field-level details.
 */
import type { Context } from 'hono';
import type { z } from '@hono/zod-openapi';
import { HttpError } from './errors.ts';

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

/** One entry per problem: the field path, the rule in words. */
export function describeIssues(error: z.ZodError): { field: string; rule: string; code: string }[] {
  return (error.issues as Issue[]).flatMap(flatten).map((i) => ({
    field: i.path.map(String).join('.') || '(body)',
    rule: i.message,
    code: i.code,
  }));
}

/** The OpenAPIHono default hook: a failed validation is a 400 naming every field. */
export function validationHook(
  result: { success: boolean; error?: z.ZodError; target?: string },
  _c: Context,
): void {
  if (!result.success && result.error) {
    const issues = describeIssues(result.error);
    const first = issues[0]!;
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
    throw new HttpError(400, 'invalid_request', `${first.field}: ${first.rule}${more}`, { issues });
  }
}
