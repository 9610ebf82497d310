/**
 * The one HTTP error type and the one error handler. Every error leaves the server as
 * `{ "error": { "code", "message", "details" } }` with the status that fits it.
 */
import type { Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { ComputationError, InputError } from '../science/errors.ts';

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

/** Map anything thrown into our status and JSON body. */
export function toHttpError(err: unknown): HttpError {
  if (err instanceof HttpError) return err;
  if (err instanceof InputError) {
    return new HttpError(422, 'invalid_value', err.message, {
      field: err.field,
      value: err.value,
      rule: err.rule,
    });
  }
  if (err instanceof ComputationError) return new HttpError(422, 'no_solution', err.message);
  if (err instanceof HTTPException) {
    const status = err.status as number;
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
      return new HttpError(
        401,
        'unauthenticated',
        err.message || 'a valid bearer token is required',
      );
    return new HttpError(
      status >= 400 && status < 600 ? (status as ErrorStatus) : 500,
      'http_error',
      err.message,
    );
  }
  return new HttpError(500, 'internal', 'internal error');
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
