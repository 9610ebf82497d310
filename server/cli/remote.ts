/**
 * `--server URL` with a token: a store command sent to a running server over its HTTP API
 * instead of opening the database, so the server's rules, roles and audit trail apply (the
 * actor is the token's user). The token comes from --token or EPOCHWRIGHT_TOKEN. The server's
 * errors come back as the store's own (a bad value as InputError, a missing row as
 * NotFoundError, …), so a command reports them the same way whichever way it went in.
 */
import { InputError, type FieldProblem } from '../science/errors.ts';
import { ConflictError, ImportRejected, NotFoundError, type ImportReport } from '../store/index.ts';
import { UsageError } from './io.ts';

export const serverOptions = { server: { type: 'string' }, token: { type: 'string' } } as const;
export const SERVER_HELP = `  --server <url>         send the command to a running server (http://host:port) instead of
                         opening the database; its actions are audited under the token's user
  --token <secret>       the bearer token for --server (default EPOCHWRIGHT_TOKEN)`;

export interface Remote {
  base: string;
  token: string;
}

/** The server to talk to, or null to open the database. */
export function remoteOf(values: {
  server?: string;
  token?: string;
  database?: string;
}): Remote | null {
  if (values.server === undefined) {
    if (values.token !== undefined) throw new UsageError('--token goes with --server');
    return null;
  }
  if (values.database !== undefined) throw new UsageError('give --server or --database, not both');
  let url: URL;
  try {
    url = new URL(values.server);
  } catch {
    throw new InputError('--server', values.server, 'must be a URL such as http://127.0.0.1:8417');
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:')
    throw new InputError('--server', values.server, 'must be an http:// or https:// URL');
  const token = values.token ?? process.env.EPOCHWRIGHT_TOKEN;
  if (!token) throw new UsageError('--server needs --token <secret> (or EPOCHWRIGHT_TOKEN)');
  return { base: url.origin, token };
}

/** One request to the server's API: the path under /api, its query and a JSON (or text) body. */
export interface ApiRequest {
  method: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  path: string;
  query?: Record<string, string | number | boolean | undefined>;
  /** Sent as JSON, or as the text given with its media type. */
  body?: unknown;
  text?: { text: string; type: string };
}

interface ErrorBody {
  code: string;
  message: string;
  details?: Record<string, unknown>;
}

/** The server's error as the store would have thrown it; anything else a 4xx (exit 2) or a failure (exit 1). */
function storeErrorOf(status: number, e: ErrorBody, base: string): Error {
  const d = e.details ?? {};
  if (e.code === 'import_rejected') return new ImportRejected(d as unknown as ImportReport);
  if (e.code === 'invalid_value' && typeof d.field === 'string')
    return new InputError(
      d.field,
      d.value,
      String(d.rule),
      (d.problems ?? d.issues ?? []) as FieldProblem[],
    );
  if (status === 404 && e.code === 'not_found' && typeof d.entity === 'string')
    return new NotFoundError(d.entity, d.id as number);
  if (status === 409) return new ConflictError(e.code as ConflictError['code'], e.message, d);
  const line = `${base} answered ${status} ${e.code}: ${e.message}`;
  return status >= 400 && status < 500 ? new UsageError(line) : new Error(line);
}

/** Send one request; a 2xx answers the response, anything else throws (see storeErrorOf). */
export async function send(remote: Remote, r: ApiRequest): Promise<Response> {
  const query = new URLSearchParams();
  for (const [k, v] of Object.entries(r.query ?? {})) if (v !== undefined) query.set(k, String(v));
  const q = query.size ? `?${query}` : '';
  const body =
    r.text ??
    (r.body === undefined ? undefined : { text: JSON.stringify(r.body), type: 'application/json' });
  let res: Response;
  try {
    res = await fetch(`${remote.base}/api${r.path}${q}`, {
      method: r.method,
      headers: {
        authorization: `Bearer ${remote.token}`,
        // One connection per request: a kept-alive socket that the server closes as idle just as
        // the next request goes out fails as "fetch failed"; a command sends only a few requests.
        connection: 'close',
        ...(body ? { 'content-type': body.type } : {}),
      },
      ...(body ? { body: body.text } : {}),
    });
  } catch (err) {
    // fetch says only "fetch failed"; the reason (refused, reset, timed out) is its cause.
    const cause = (err as { cause?: { code?: string; message?: string } }).cause;
    const why = cause ? ` (${[cause.code, cause.message].filter(Boolean).join(': ')})` : '';
    throw new Error(
      `no answer from ${remote.base}: ${err instanceof Error ? err.message : String(err)}${why}`,
    );
  }
  if (res.ok) return res;
  const text = await res.text();
  let e: ErrorBody = { code: 'error', message: text };
  try {
    const parsed = JSON.parse(text) as { error?: ErrorBody };
    if (parsed.error) e = parsed.error;
  } catch {
    // not JSON: keep the text
  }
  throw storeErrorOf(res.status, e, remote.base);
}

/** A request's answer: its JSON, or its text when the server answers text (CSV, iCalendar); null for 204. */
export async function call<T = unknown>(remote: Remote, r: ApiRequest): Promise<T> {
  const res = await send(remote, r);
  if (res.status === 204) return null as T;
  const type = res.headers.get('content-type') ?? '';
  return (type.includes('json') ? await res.json() : await res.text()) as T;
}
