/**
 * The one HTTP error type, the one table from error classes to statuses, and the one error handler.
 * Every error leaves the server as `{ "error": { "code", "message", "details" } }`.
 */
import type { Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { JobRefused } from '../jobs/pool.ts';
import { ComputationError, InputError } from '../science/errors.ts';
import { FitRefusal } from '../science/orbit/fit/index.ts';
import { ConflictError, ImportRejected, NotFoundError } from '../store/index.ts';
import { RequestInvalid } from './request-invalid.ts';

export type ErrorStatus = 400 | 401 | 403 | 404 | 405 | 409 | 413 | 415 | 422 | 500 | 503;

export class HttpError extends Error {
  override readonly name = 'HttpError';
  constructor(
    readonly status: ErrorStatus,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** Response headers the error needs (Retry-After, Connection). */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export interface ErrorBody {
  error: { code: string; message: string; details?: unknown };
}

/** How one class of error leaves the server: its status, code and details. */
interface ErrorRule<E extends Error> {
  type: abstract new (...args: never[]) => E;
  toHttp: (err: E) => HttpError;
}
const rule = <E extends Error>(
  type: ErrorRule<E>['type'],
  toHttp: (err: E) => HttpError,
): ErrorRule<Error> => ({ type, toHttp: toHttp as (err: Error) => HttpError });

/** The statuses hono's own exceptions carry, in our codes and words. */
function fromHonoException(err: HTTPException): HttpError {
  const status: number = err.status;
  if (status === 413)
    return new HttpError(
      413,
      'body_too_large',
      'the request body is larger than the server accepts',
      undefined,
      { connection: 'close' },
    );
  if (status === 415)
    return new HttpError(415, 'unsupported_media_type', 'send the body as application/json');
  if (status === 400)
    return new HttpError(
      400,
      'malformed_body',
      err.message || 'the request body is not valid JSON',
    );
  if (status === 401)
    return new HttpError(401, 'unauthenticated', err.message || 'a valid bearer token is required');
  const known = status >= 400 && status < 600;
  return new HttpError(known ? (status as ErrorStatus) : 500, 'http_error', err.message);
}

/**
 * Every error class that may reach HTTP, most specific first (a subclass before its parent):
 * the one place an error becomes a status. Anything else is a 500 `internal`, logged.
 */
export const ERROR_TABLE: readonly ErrorRule<Error>[] = [
  rule(HttpError, (e: HttpError) => e),
  rule(
    NotFoundError,
    (e: NotFoundError) =>
      new HttpError(404, 'not_found', e.message, { entity: e.entity, id: e.id }),
  ),
  rule(ConflictError, (e: ConflictError) => new HttpError(409, e.code, e.message, e.details)),
  rule(
    ImportRejected,
    (e: ImportRejected) => new HttpError(422, 'import_rejected', e.message, e.report),
  ),
  rule(RequestInvalid, (e: RequestInvalid) => {
    if (!e.breaksRule)
      return new HttpError(400, 'invalid_request', e.message, { issues: e.issues });
    const first = e.issues[0]!;
    return new HttpError(422, 'invalid_value', e.message, {
      field: first.field,
      value: first.value ?? null,
      rule: first.rule,
      issues: e.issues,
    });
  }),
  rule(
    InputError,
    (e: InputError) =>
      new HttpError(422, 'invalid_value', e.message, {
        field: e.field,
        value: e.value,
        rule: e.rule,
        ...(e.problems.length > 0 ? { problems: e.problems } : {}),
      }),
  ),
  rule(
    FitRefusal,
    (e: FitRefusal) =>
      new HttpError(422, 'fit_refused', e.message, { reason: e.reason, parameters: e.parameters }),
  ),
  rule(ComputationError, (e: ComputationError) => new HttpError(422, 'no_solution', e.message)),
  rule(
    JobRefused,
    (e: JobRefused) =>
      new HttpError(
        503,
        e.code,
        e.message,
        e.details,
        e.retryAfterS === undefined ? undefined : { 'retry-after': String(e.retryAfterS) },
      ),
  ),
  rule(HTTPException, fromHonoException),
];

/** Map anything thrown into our status and JSON body. */
export function toHttpError(err: unknown): HttpError {
  const found = ERROR_TABLE.find((r) => err instanceof r.type);
  return found ? found.toHttp(err as Error) : new HttpError(500, 'internal', 'internal error');
}

export function errorResponse(c: Context, err: unknown): Response {
  const e = toHttpError(err);
  if (e.status === 500) console.error(err);
  const body: ErrorBody = {
    error: {
      code: e.code,
      message: e.message,
      ...(e.details === undefined ? {} : { details: e.details }),
    },
  };
  return c.json(body, e.status, e.headers);
}
