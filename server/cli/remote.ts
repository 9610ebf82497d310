/**
 * `--server URL` with a token: a store command sent to a running server over its HTTP API
 * instead of opening the database, so the server's rules, roles and audit trail apply (the
 * actor is the token's user). The token comes from --token or EPOCHWRIGHT_TOKEN.
 */
import { InputError } from '../science/errors.ts';
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

/** The server's error body, as the CLI reports it. */
export interface RemoteError {
  status: number;
  code: string;
  message: string;
  details?: unknown;
}

/**
 * Send one request; 2xx answers the response, anything else throws: a 4xx as bad input (exit 2,
 * the server's message), a 5xx or no answer as a failure (exit 1).
 */
export async function send(
  remote: Remote,
  method: string,
  path: string,
  body?: { text: string; type: string },
  onError?: (e: RemoteError) => never | undefined,
): Promise<Response> {
  let res: Response;
  try {
    res = await fetch(`${remote.base}/api${path}`, {
      method,
      headers: {
        authorization: `Bearer ${remote.token}`,
        ...(body ? { 'content-type': body.type } : {}),
      },
      ...(body ? { body: body.text } : {}),
    });
  } catch (err) {
    throw new Error(
      `no answer from ${remote.base}: ${err instanceof Error ? err.message : String(err)}`,
    );
  }
  if (res.ok) return res;
  const text = await res.text();
  let e: RemoteError = { status: res.status, code: 'error', message: text };
  try {
    const parsed = JSON.parse(text) as { error?: Omit<RemoteError, 'status'> };
    if (parsed.error) e = { status: res.status, ...parsed.error };
  } catch {
    // not JSON: keep the text
  }
  onError?.(e);
  const line = `${remote.base} answered ${res.status} ${e.code}: ${e.message}`;
  if (res.status >= 400 && res.status < 500) throw new UsageError(line);
  throw new Error(line);
}
