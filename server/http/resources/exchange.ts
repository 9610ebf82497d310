/**
 * Imports and exports: CSV imports of targets, orbit solutions and measurements (all or nothing,
 * `dryRun=true` to check only), measurements as CSV or JSON, and each campaign's iCalendar feed.
 */
import type { Runner } from '../../jobs/tasks.ts';
import { createRoute, z } from '@hono/zod-openapi';
import { CSV_KINDS, orbitsCsv, type Store } from '../../store/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { requireRole, writer } from '../auth.ts';
import { HttpError } from '../errors.ts';
import { IdParam, errorResponses, json, optionalId, resourceApp, security } from './common.ts';
import { MeasurementFilters } from './measurements.ts';

/** Rows of a measurements export written per job. */
const CSV_ROWS_PER_JOB = 5000;

const Report = z.object({
  kind: z.enum(CSV_KINDS),
  dryRun: z.boolean(),
  rows: z.number().int(),
  written: z.number().int(),
  problems: z.array(
    z.object({ line: z.number().int(), column: z.string(), value: z.unknown(), rule: z.string() }),
  ),
});
const ImportQuery = z.object({
  dryRun: z
    .enum(['true', 'false'])
    .default('false')
    .openapi({ description: 'check every row, write nothing' }),
  allowDuplicates: z
    .enum(['true', 'false'])
    .default('false')
    .openapi({
      description:
        'import a file imported before (same SHA-256 digest) and measurements equal to stored ones ' +
        '(same target, kind, epoch to the second, values); refused by default',
    }),
});
const CalendarQuery = z.object({
  at: z.string().optional().openapi({
    description: 'the moment the flags are computed for (ISO 8601 with zone, JD, MJD); default now',
  }),
  // Read by sign-in (auth.ts) for calendar programs, which cannot send a header; declared here so
  // the query check accepts it and the document shows it.
  token: z.string().optional().openapi({
    description: 'a token, for calendar programs that cannot send an Authorization header',
  }),
});
const OrbitExportQuery = z.object({
  targetId: optionalId,
  systemId: optionalId,
  current: z
    .enum(['true', 'false'])
    .default('false')
    .openapi({ description: 'only each target’s current solution (default: every version)' }),
});
const KindParam = z.object({
  kind: z.enum(CSV_KINDS).openapi({ param: { name: 'kind', in: 'path' } }),
});

/** Who may import what: orbit solutions and targets are the lead's, measurements the observers'. */
const IMPORT_ROLE = { targets: 'lead', orbits: 'lead', measurements: 'observer' } as const;

type ResourceApp = ReturnType<typeof resourceApp>;

export function exchangeRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  for (const add of [
    addImport,
    addMeasurementsExport,
    addOrbitsExport,
    addArchiveExport,
    addCalendarFeed,
    addFeedTokens,
  ])
    add(app, store, run);
  return app;
}

/** A CSV import of one kind, all rows or none; measurements are parsed and checked on a worker. */
function addImport(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/imports/{kind}',
      tags: ['imports'],
      security,
      summary: 'Import a CSV file of targets, orbit solutions or measurements, all rows or none',
      request: {
        params: KindParam,
        query: ImportQuery,
        body: { content: { 'text/csv': { schema: z.string() } }, required: true },
      },
      responses: {
        ...errorResponses,
        200: json(Report, 'imported (or checked, in a dry run)'),
        422: json(
          z.object({ error: z.object({ code: z.string(), message: z.string(), details: Report }) }),
          'bad rows: every one listed, nothing written',
        ),
      },
    }),
    async (c) => {
      const kind = c.req.valid('param').kind;
      const actor = writer(c, IMPORT_ROLE[kind]);
      const type = c.req.header('content-type') ?? '';
      if (!/^text\/csv\b/i.test(type))
        throw new HttpError(415, 'unsupported_media_type', 'send the file as text/csv');
      const text = await c.req.text();
      const options = {
        dryRun: c.req.valid('query').dryRun === 'true',
        allowDuplicates: c.req.valid('query').allowDuplicates === 'true',
      };
      // A measurements file is parsed and checked on a worker thread; only the writes stay here.
      const report =
        kind === 'measurements'
          ? await store.importPreparedMeasurements(
              actor,
              await run('prepareMeasurementsPacked', text),
              options,
            )
          : await store.importCsv(actor, kind, text, options);
      return c.json(report, 200);
    },
  );
}

/** Measurements as CSV (on a worker) or JSON. */
function addMeasurementsExport(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/exports/measurements',
      tags: ['exports'],
      security,
      summary: 'Measurements as CSV (the import layout) or JSON',
      request: {
        query: MeasurementFilters.extend({ format: z.enum(['csv', 'json']).default('csv') }),
      },
      responses: {
        200: { content: { 'text/csv': { schema: z.string() } }, description: 'the measurements' },
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { format, ...filters } = c.req.valid('query');
      const rows = await store.exports.measurements(filters as z.output<typeof MeasurementFilters>);
      if (format === 'json') return c.json({ measurements: rows }, 200);
      // Written on a worker a part at a time: handing it 100,000 rows in one message held the
      // server's thread for a quarter of a second (the rows are copied on the way).
      const parts: string[] = [];
      for (let i = 0; i === 0 || i < rows.length; i += CSV_ROWS_PER_JOB)
        parts.push(await run('measurementsCsv', rows.slice(i, i + CSV_ROWS_PER_JOB), i === 0));
      return c.body(parts.join(''), 200, {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': 'attachment; filename="measurements.csv"',
      });
    },
  );
}

/** Orbit solutions as CSV in the import layout. */
function addOrbitsExport(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/exports/orbits',
      tags: ['exports'],
      security,
      summary:
        'Orbit solutions as CSV in the import layout, σ and correlations from each stored covariance',
      request: { query: OrbitExportQuery },
      responses: {
        200: { content: { 'text/csv': { schema: z.string() } }, description: 'the solutions' },
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { current, ...filter } = c.req.valid('query');
      const rows = await store.exports.orbits({ ...filter, currentOnly: current === 'true' });
      return c.body(orbitsCsv(rows), 200, {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': 'attachment; filename="orbit-solutions.csv"',
      });
    },
  );
}

/** Every stored record but the tokens, as one JSON file (lead only). */
function addArchiveExport(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/exports/archive',
      tags: ['exports'],
      security,
      summary:
        'Every stored record but the tokens (systems, targets, solutions with covariance and ' +
        'provenance, sites, campaigns, nights, blocks, reports, measurements, users, audit ' +
        'trail) as one JSON file, for `epochwright restore --archive` into an empty database ' +
        '(lead only: it holds the users and the audit trail)',
      responses: {
        200: json(
          z
            .object({
              format: z.literal('epochwright-archive'),
              schema: z.string().openapi({ description: 'the last migration the rows follow' }),
              tables: z
                .record(z.string(), z.array(z.record(z.string(), z.unknown())))
                .openapi({ description: 'rows per table, in id order, columns by SQL name' }),
            })
            .strict()
            .openapi('Archive'),
          'the archive, as a download',
        ),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'lead');
      const archive = await store.archive();
      c.header('content-disposition', 'attachment; filename="epochwright-archive.json"');
      return c.json(archive, 200);
    },
  );
}

/** A campaign's iCalendar feed, flags as of `at`. */
function addCalendarFeed(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/campaigns/{id}/calendar.ics',
      tags: ['exports'],
      security,
      summary: 'The campaign as an iCalendar feed (RFC 5545); calendar programs may pass ?token=',
      request: { params: IdParam, query: CalendarQuery },
      responses: {
        200: { content: { 'text/calendar': { schema: z.string() } }, description: 'the feed' },
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { at } = c.req.valid('query');
      const text = await store.exports.calendar(
        c.req.valid('param').id,
        at === undefined ? {} : { flagsAtJd: parseEpoch(at, 'at') },
        run,
      );
      return c.body(text, 200, { 'content-type': 'text/calendar; charset=utf-8' });
    },
  );
}

/** A read-only token for one campaign's feed. */
function addFeedTokens(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/campaigns/{id}/feed-tokens',
      tags: ['exports'],
      security,
      summary:
        'Issue a read-only token for this campaign’s calendar feed only (shown once; revoke with DELETE /tokens/{id})',
      request: {
        params: IdParam,
        body: {
          content: {
            'application/json': {
              schema: z.object({ label: z.string().optional() }).strict(),
            },
          },
          required: true,
        },
      },
      responses: {
        201: json(
          z.object({
            tokenId: z.number().int(),
            token: z.string().openapi({ description: 'the secret, shown this once only' }),
            feedPath: z
              .string()
              .openapi({ description: 'the path to subscribe to, token included' }),
          }),
          'issued',
        ),
        ...errorResponses,
      },
    }),
    async (c) => {
      const lead = requireRole(c, 'lead');
      const id = c.req.valid('param').id;
      const issued = await store.users.issueFeedToken(
        { userId: lead.id },
        lead.name,
        id,
        c.req.valid('json').label ?? 'calendar feed',
      );
      return c.json(
        {
          tokenId: issued.tokenId,
          token: issued.secret,
          feedPath: `/api/campaigns/${id}/calendar.ics?token=${issued.secret}`,
        },
        201,
      );
    },
  );
}
