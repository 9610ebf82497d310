/**
 * The one way the client talks to the server: JSON over /api with the session's bearer token,
 * typed by path from the generated OpenAPI types (schema.d.ts), so a request's parameters and body
 * and its answer are the server's own. Errors keep the server's shape ({ code, message, details })
 * so forms can show field messages.
 */
import { ruleWords } from '../lib/field-words.ts';
import { sessionToken } from '../lib/session.ts';
import type { components, paths } from './schema.d.ts';

/** The server's named shapes (rows, reports, plans, fits), as its OpenAPI document declares them. */
export type Schemas = components['schemas'];

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

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
/** Paths that have an operation for the method. */
type PathsWith<M extends Method> = {
  [P in keyof paths]: paths[P][M] extends undefined ? never : P;
}[keyof paths];
type Op<P extends keyof paths, M extends Method> = NonNullable<paths[P][M]>;
type PathParams<O> = O extends { parameters: { path: infer T } } ? T : never;
type QueryOf<O> = O extends { parameters: { query?: infer T } } ? T : never;
type BodyOf<O> = O extends { requestBody?: { content: infer C } }
  ? C extends { 'application/json': infer B }
    ? B
    : C[keyof C]
  : never;
/** The JSON answer of an operation's 2xx status, or undefined for 204. */
export type AnswerOf<O> = O extends { responses: infer R }
  ? R[keyof R & (200 | 201)] extends { content: { 'application/json': infer A } }
    ? A
    : undefined
  : never;

export interface Init<O> {
  params?: { path?: PathParams<O>; query?: QueryOf<O> };
  body?: BodyOf<O>;
  /** For a body that is not JSON (a CSV import): its content type, sent as is. */
  contentType?: string;
}

function apiError(status: number, body: unknown): ApiError {
  const e =
    typeof body === 'object' && body !== null && 'error' in body
      ? (body as { error: { code?: string; message?: string; details?: unknown } }).error
      : undefined;
  return new ApiError(status, e?.code ?? 'http_error', e?.message ?? `HTTP ${status}`, e?.details);
}

/** One request: path parameters filled in, the query string, the bearer token, errors thrown. */
async function request(
  method: string,
  template: string,
  init: { params?: { path?: object; query?: object }; body?: unknown; contentType?: string },
): Promise<unknown> {
  const vars: Record<string, unknown> = { ...init.params?.path };
  const path = template.replaceAll(/\{(\w+)\}/g, (_, k: string) =>
    encodeURIComponent(String(vars[k])),
  );
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(init.params?.query ?? {}))
    if (v !== undefined) q.set(k, String(v));
  const token = sessionToken();
  const headers: Record<string, string> = token ? { authorization: `Bearer ${token}` } : {};
  const hasBody = init.body !== undefined;
  if (hasBody) headers['content-type'] = init.contentType ?? 'application/json';
  const res = await fetch(`/api${path}${q.size ? `?${q}` : ''}`, {
    method,
    headers,
    ...(hasBody ? { body: init.contentType ? String(init.body) : JSON.stringify(init.body) } : {}),
  });
  if (res.status === 204) return undefined;
  const type = res.headers.get('content-type') ?? '';
  const body: unknown = type.includes('json') ? await res.json() : await res.text();
  if (!res.ok) throw apiError(res.status, body);
  return body;
}

const call =
  <M extends Method>(method: M) =>
  <P extends PathsWith<M>>(path: P, init: Init<Op<P, M>> = {}) =>
    // The answer of a 2xx from this path, as its route declares it.
    request(method.toUpperCase(), path, init) as Promise<AnswerOf<Op<P, M>>>;

/** `api.GET('/nights/{id}', { params: { path: { id } } })`: paths, parameters, bodies and answers from `paths`. */
export const api = {
  GET: call('get'),
  POST: call('post'),
  PUT: call('put'),
  PATCH: call('patch'),
  DELETE: call('delete'),
};

/**
 * Save a file the server writes (a CSV export, the archive, a calendar): fetched with the session's token like any
 * other call (errors thrown as ApiError), then handed to the browser as a download named `filename`.
 */
export async function downloadFile<P extends PathsWith<'get'>>(
  path: P,
  init: Init<Op<P, 'get'>>,
  filename: string,
  type = 'text/csv',
): Promise<void> {
  const body = await request('GET', path, init);
  // A JSON answer (the archive) is written back as the text it came as, numbers unchanged.
  const text = typeof body === 'string' ? body : JSON.stringify(body);
  const url = URL.createObjectURL(new Blob([text], { type }));
  Object.assign(document.createElement('a'), { href: url, download: filename }).click();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** Paths whose GET answers one page ({ items, total, … }). */
type ListPath = {
  [P in keyof paths]: paths[P]['get'] extends {
    responses: { 200: { content: { 'application/json': { items: unknown[]; total: number } } } };
  }
    ? P
    : never;
}[keyof paths];
type ItemOf<P extends ListPath> =
  paths[P]['get']['responses'][200]['content']['application/json']['items'][number];
type FiltersOf<P extends ListPath> = Omit<
  NonNullable<paths[P]['get']['parameters']['query']>,
  'limit' | 'offset'
>;

/** Every page of a list endpoint (the server caps a page at 500 rows). */
export async function getAll<P extends ListPath>(
  path: P,
  filters?: FiltersOf<P>,
): Promise<ItemOf<P>[]> {
  const out: ItemOf<P>[] = [];
  for (let offset = 0; ; offset += 500) {
    const query = { ...filters, limit: 500, offset };
    // The body of a 200 from this path, as its route declares it.
    const page = (await request('GET', path, { params: { query } })) as {
      items: ItemOf<P>[];
      total: number;
    };
    out.push(...page.items);
    if (out.length >= page.total || page.items.length === 0) return out;
  }
}

/** Field-level messages from a 400 (issues: field, rule) or 422 (field, value, rule, and issues when a schema refused it) error, keyed by dotted field path. */
export function fieldMessages(err: unknown): Record<string, string> {
  if (!(err instanceof ApiError)) return {};
  const d = (err.details ?? {}) as Schemas['ErrorDetails'];
  const out: Record<string, string> = {};
  if (typeof d.field === 'string')
    out[d.field] = `${JSON.stringify(d.value)} ${ruleWords(String(d.rule ?? ''))}`.trim();
  for (const i of d.issues ?? []) {
    if (i.field === d.field && i.rule === d.rule) continue; // a 422 from the schema repeats its first issue
    const rule = ruleWords(i.rule);
    out[i.field] = out[i.field] ? `${out[i.field]}; ${rule}` : rule;
  }
  return out;
}

/** The answer of a route, by path and method. */
export type Answer<
  P extends keyof paths,
  M extends 'get' | 'post' | 'patch',
  S extends number = 200,
> = paths[P][M] extends { responses: Record<S, { content: { 'application/json': infer A } }> }
  ? A
  : never;

// Names the views use for the server's shapes (aliases of the generated types, nothing hand-written).
export type Me = Answer<'/me', 'get'>;
export type Role = Me['role'];
export type SystemRow = Schemas['SystemRow'];
export type TargetRow = Schemas['TargetRow'];
export type SiteRow = Schemas['SiteRow'];
export type HorizonPoint = SiteRow['horizonMask'][number];
export type CampaignRow = Schemas['CampaignRow'];
export type NightRow = Schemas['NightRow'];
export type BlockRow = Schemas['BlockRow'];
export type BlockOrigin = BlockRow['origin'];
export type ReportRow = Schemas['NightReportRow'];
export type Outcome = Schemas['OutcomeRow'];
export type MeasurementRow = Schemas['MeasurementRow'];
export type SolutionRow = Schemas['OrbitSolutionRow'];
export type Prediction = Schemas['EphemerisRow'];
export type OrbitEvent = Schemas['OrbitEvent'];
export type Window = Schemas['SkyWindow'];
export type Limit = Window['opensBy'];
export type VisTarget = Schemas['TargetNight'];
export type Visibility = Schemas['NightVisibility'];
export type FactorForecast = Schemas['FactorForecast'];
export type DetectionForecast = Schemas['DetectionForecast'];

/**
 * The generic record table and form (records.tsx, record-forms.tsx) build a body field by field
 * from their field registry, so its type is the registry's, not the route's: the server checks
 * every field (400/422 naming it). Everything else calls `api` by path.
 */
export async function sendRecord(
  method: 'POST' | 'PATCH',
  path: string,
  body: Record<string, unknown>,
): Promise<{ id: number; name?: string }> {
  return request(method, path, { body }) as Promise<{ id: number; name?: string }>;
}
