/**
 * The one way the client talks to the server: JSON over /api with the session's bearer token.
 * Errors keep the server's shape ({ code, message, details }) so forms can show field messages.
 */
import { sessionToken } from '../lib/session.ts';

export class ApiError extends Error {
  override name = 'ApiError';
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details: unknown,
  ) {
    super(message);
  }
}

function headers(extra: Record<string, string> = {}): Record<string, string> {
  const token = sessionToken();
  return { ...(token ? { authorization: `Bearer ${token}` } : {}), ...extra };
}

async function parse<T>(res: Response): Promise<T> {
  if (res.status === 204) return undefined as T;
  const type = res.headers.get('content-type') ?? '';
  const body: unknown = type.includes('json') ? await res.json() : await res.text();
  if (!res.ok) {
    const e = (body as { error?: { code?: string; message?: string; details?: unknown } }).error;
    throw new ApiError(
      res.status,
      e?.code ?? 'http_error',
      e?.message ?? `HTTP ${res.status}`,
      e?.details,
    );
  }
  return body as T;
}

export async function get<T>(
  path: string,
  query: Record<string, string | number | undefined> = {},
): Promise<T> {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined) q.set(k, String(v));
  const qs = q.toString();
  return parse<T>(await fetch(`/api${path}${qs ? `?${qs}` : ''}`, { headers: headers() }));
}

export async function send<T>(
  method: 'POST' | 'PATCH' | 'DELETE',
  path: string,
  body?: unknown,
  contentType = 'application/json',
): Promise<T> {
  const init: RequestInit = {
    method,
    headers: headers(body === undefined ? {} : { 'content-type': contentType }),
  };
  if (body !== undefined) init.body = typeof body === 'string' ? body : JSON.stringify(body);
  return parse<T>(await fetch(`/api${path}`, init));
}

/** Every page of a list endpoint (the server caps a page at 500 rows). */
export async function getAll<T>(
  path: string,
  query: Record<string, string | number | undefined> = {},
): Promise<T[]> {
  const out: T[] = [];
  for (let offset = 0; ; offset += 500) {
    const page = await get<{ items: T[]; total: number }>(path, { ...query, limit: 500, offset });
    out.push(...page.items);
    if (out.length >= page.total || page.items.length === 0) return out;
  }
}

/** Field-level messages from a 400 (issues: field, rule) or 422 (field, value, rule) error, keyed by dotted field path. */
export function fieldMessages(err: unknown): Record<string, string> {
  if (!(err instanceof ApiError)) return {};
  const d = (err.details ?? {}) as {
    field?: unknown;
    value?: unknown;
    rule?: unknown;
    issues?: { field: string; rule: string }[];
    problems?: { field?: string; rule?: string }[];
  };
  const out: Record<string, string> = {};
  if (typeof d.field === 'string')
    out[d.field] = `${JSON.stringify(d.value)} ${String(d.rule ?? '')}`.trim();
  for (const i of d.issues ?? [])
    out[i.field] = out[i.field] ? `${out[i.field]}; ${i.rule}` : i.rule;
  return out;
}
