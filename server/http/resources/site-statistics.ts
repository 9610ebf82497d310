/**
 * GET /sites/{id}/statistics: what the site's night reports and measurements have learned, per
 * calendar month (loss by the Beta-prior rule, seeing, Strehl ratio, achieved precision);
 * GET and PUT /sites/{id}/clear-prior: the site's clear-night prior per month (lead writes).
 */
import { createRoute, z } from '@hono/zod-openapi';
import {
  CLEAR_PRIOR_COLUMNS,
  DEFAULT_PRIOR_STRENGTH_NIGHTS,
  readClearPriorCsv,
  type Store,
} from '../../store/index.ts';
import { InputError } from '../../science/errors.ts';
import { requireRole, writer } from '../auth.ts';
import {
  ClearPriorSchema,
  MonthPriorSchema,
  SiteStatisticsSchema,
} from '../schemas/site-output.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';

const RangeQuery = z.object({
  start: z.iso.date().optional().openapi({ description: 'first night (local evening date)' }),
  end: z.iso.date().optional().openapi({ description: 'last night' }),
});

const MonthsBody = z
  .object({
    months: z.array(MonthPriorSchema).max(12).openapi({
      description: 'the months that have a prior, each at most once; the rest are cleared',
    }),
  })
  .strict();
const CsvBody = z
  .object({
    csv: z
      .string()
      .max(20_000)
      .openapi({
        description:
          `CSV text: a header with ${CLEAR_PRIOR_COLUMNS.slice(0, 2).join(' and ')} ` +
          `(and optionally ${CLEAR_PRIOR_COLUMNS[2]}), one row per month that has a prior; the ` +
          `rest are cleared`,
      }),
    strengthNights: z
      .number()
      .optional()
      .openapi({
        description:
          `weight of rows without strength_nights, nights, (0, 1000]; default ` +
          `${DEFAULT_PRIOR_STRENGTH_NIGHTS}`,
      }),
  })
  .strict();
const PriorBody = z.union([MonthsBody, CsvBody]).openapi({
  description: 'the months as values, or as the CSV the CLI’s --set-prior reads',
});

function positiveStrength(x: number): number {
  if (!(x > 0 && x <= 1000)) throw new InputError('strengthNights', x, 'must lie in (0, 1000]');
  return x;
}

export function siteStatisticsRoutes(store: Store) {
  const app = resourceApp();
  app.openapi(
    createRoute({
      method: 'get',
      path: '/sites/{id}/statistics',
      tags: ['sites'],
      security,
      summary: 'Loss per month (Beta prior and log), seeing, Strehl ratio and achieved precision',
      request: { params: IdParam, query: RangeQuery },
      responses: { 200: json(SiteStatisticsSchema, 'the statistics'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const q = c.req.valid('query');
      return c.json(
        await store.siteWeather.statistics(c.req.valid('param').id, {
          start: q.start,
          end: q.end,
        }),
        200,
      );
    },
  );
  app.openapi(
    createRoute({
      method: 'get',
      path: '/sites/{id}/clear-prior',
      tags: ['sites'],
      security,
      summary: 'The site’s clear-night prior per calendar month',
      request: { params: IdParam },
      responses: { 200: json(ClearPriorSchema, 'twelve months'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      return c.json(await store.siteWeather.prior(c.req.valid('param').id), 200);
    },
  );
  app.openapi(
    createRoute({
      method: 'put',
      path: '/sites/{id}/clear-prior',
      tags: ['sites'],
      security,
      summary: 'Replace the site’s clear-night prior (all months at once, as values or CSV)',
      request: {
        params: IdParam,
        body: { content: { 'application/json': { schema: PriorBody } }, required: true },
      },
      responses: { 200: json(ClearPriorSchema, 'the stored prior'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      const body = c.req.valid('json');
      const months =
        'csv' in body
          ? readClearPriorCsv(
              body.csv,
              body.strengthNights === undefined
                ? DEFAULT_PRIOR_STRENGTH_NIGHTS
                : positiveStrength(body.strengthNights),
            )
          : body.months;
      return c.json(
        await store.siteWeather.replacePrior(actor, c.req.valid('param').id, months),
        200,
      );
    },
  );
  return app;
}
