/** POST /campaigns/{id}/time-request: a semester's time request from the campaign's plan and log (written nowhere). */
import { createRoute, z } from '@hono/zod-openapi';
import type { Runner } from '../../jobs/tasks.ts';
import { timeRequestMarkdown } from '../../science/plan/time-request.ts';
import { WEATHER_CHOICES, timeRequestCsv, type Store } from '../../store/index.ts';
import { requireRole } from '../auth.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';
import { momentJd } from '../../clock.ts';

const Body = z
  .object({
    name: z.string().openapi({ description: 'the semester’s name, 1–40 characters (e.g. 2027A)' }),
    startDate: z.iso.date().openapi({ description: 'first night of the semester' }),
    endDate: z.iso.date().openapi({ description: 'last night of the semester' }),
    weather: z.enum(WEATHER_CHOICES).optional().openapi({ description: 'default "aware"' }),
    at: z.string().optional().openapi({ description: 'the moment of planning; default now' }),
  })
  .strict();

const Pair = z.object({ without: z.number().nullable(), with: z.number().nullable() }).strict();
const Answer = z
  .object({
    campaignId: z.number().int(),
    weather: z.enum(WEATHER_CHOICES),
    semester: z.object({ name: z.string(), startDate: z.string(), endDate: z.string() }).strict(),
    sites: z.array(
      z
        .object({
          site: z.string(),
          nights: z.number().int(),
          hours: z.number(),
          allowanceHours: z.number(),
          requestHours: z.number(),
          clearChance: z.number(),
          byTarget: z.array(
            z
              .object({
                target: z.string(),
                kind: z.enum(['astrometry', 'spectroscopy']),
                blocks: z.number().int(),
                hours: z.number(),
                allowanceHours: z.number(),
              })
              .strict(),
          ),
        })
        .strict(),
    ),
    targets: z.array(
      z
        .object({
          target: z.string(),
          hours: z.number(),
          allowanceHours: z.number(),
          passage: z.string().nullable(),
          periapsisSigmaDays: Pair,
          massFraction: Pair,
          coverage: z
            .object({ withinDays: z.number(), without: z.number(), with: z.number() })
            .strict()
            .nullable(),
          factors: z.array(
            z
              .object({
                name: z.enum(['redshiftFactor', 'precessionFactor']),
                without: z.number().nullable(),
                with: z.number().nullable(),
              })
              .strict(),
          ),
          reason: z.string(),
        })
        .strict(),
    ),
    totals: z
      .object({
        hours: z.number(),
        allowanceHours: z.number(),
        requestHours: z.number(),
        nights: z.number().int(),
      })
      .strict(),
    rule: z.string(),
    method: z
      .string()
      .openapi({ description: 'how the results with and without the time are reckoned' }),
    markdown: z.string().openapi({ description: 'the same, ready to paste into a proposal' }),
    csv: z.string().openapi({
      description: 'hours per site, target and kind with the site totals, as the CLI’s --csv',
    }),
  })
  .strict()
  .openapi('TimeRequest');

export function timeRequestRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  app.openapi(
    createRoute({
      method: 'post',
      path: '/campaigns/{id}/time-request',
      tags: ['planning'],
      security,
      summary:
        'A semester’s time request: hours per site, target and kind, the weather allowance, and the expected ' +
        'result with and without the time',
      request: {
        params: IdParam,
        body: { content: { 'application/json': { schema: Body } }, required: true },
      },
      responses: { 200: json(Answer, 'the request, written nowhere'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { at, ...b } = c.req.valid('json');
      const r = await store.plans.timeRequest(c.req.valid('param').id, b, momentJd(at, 'at'), run);
      return c.json({ ...r, markdown: timeRequestMarkdown(r), csv: timeRequestCsv(r) }, 200);
    },
  );
  return app;
}
