/**
 * GET /sites/{id}/statistics: what the site's night reports and measurements have learned, per
 * calendar month (loss by the Beta-prior rule, seeing, Strehl ratio, achieved precision);
 * GET and PUT /sites/{id}/clear-prior: the site's clear-night prior per month (lead writes).
 */
import { createRoute, z } from '@hono/zod-openapi';
import type { Store } from '../../store/index.ts';
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

const PriorBody = z
  .object({
    months: z.array(MonthPriorSchema).max(12).openapi({
      description: 'the months that have a prior, each at most once; the rest are cleared',
    }),
  })
  .strict();

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
      summary: 'Replace the site’s clear-night prior (all months at once)',
      request: {
        params: IdParam,
        body: { content: { 'application/json': { schema: PriorBody } }, required: true },
      },
      responses: { 200: json(ClearPriorSchema, 'the stored prior'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      return c.json(
        await store.siteWeather.replacePrior(
          actor,
          c.req.valid('param').id,
          c.req.valid('json').months,
        ),
        200,
      );
    },
  );
  return app;
}
