/**
 * POST /nights/{id}/replan: after a night whose report records lost time, the rest of its
 * campaign's season planned again (written nowhere); POST /nights/{id}/replan/accept: the same,
 * computed again and stored in one transaction (lead), with the preview's digest. The season
 * plan's rules apply: only blocks that are still plans are replaced.
 */
import { createRoute, z } from '@hono/zod-openapi';
import type { Runner } from '../../jobs/tasks.ts';
import { WEATHER_CHOICES, type Store } from '../../store/index.ts';
import { requireRole, writer } from '../auth.ts';
import { SeasonPlanPreviewSchema } from '../schemas/plan-output.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';
import { BlockRowSchema, NightRowSchema } from './nights.ts';
import { momentJd, nowMs } from '../../clock.ts';

const ReplanBody = z
  .object({
    at: z.string().optional().openapi({
      description: 'the moment of planning (ISO 8601, JD, MJD); default now',
    }),
    endDate: z.iso.date().optional().openapi({
      description: 'last night to plan; default the campaign’s last (at most 400 nights on)',
    }),
    weather: z.enum(WEATHER_CHOICES).optional().openapi({
      description: 'default "aware": nights weigh by their site’s learned chance of being clear',
    }),
    digest: z.string().optional().openapi({
      description: 'accept only: the preview’s digest; 409 if the plan would now differ',
    }),
  })
  .strict();

const ReplanSchema = z
  .object({
    night: z
      .object({
        id: z.number().int(),
        date: z.string(),
        siteId: z.number().int(),
        timeLostHours: z.number(),
        reason: z.string(),
      })
      .strict(),
    lost: z.array(
      z
        .object({
          blockId: z.number().int(),
          target: z.string(),
          kind: z.string(),
          status: z.string(),
        })
        .strict(),
    ),
    request: z
      .object({ startDate: z.string(), endDate: z.string(), weather: z.enum(WEATHER_CHOICES) })
      .strict(),
    preview: SeasonPlanPreviewSchema,
  })
  .strict()
  .openapi('Replan');

const Accepted = ReplanSchema.extend({
  written: z.array(BlockRowSchema),
  nightsCreated: z.array(NightRowSchema),
}).strict();

export function replanRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  const body = { content: { 'application/json': { schema: ReplanBody } }, required: true };
  app.openapi(
    createRoute({
      method: 'post',
      path: '/nights/{id}/replan',
      tags: ['planning'],
      security,
      summary: 'Preview the rest of the season planned again after this night lost time',
      request: { params: IdParam, body },
      responses: { 200: json(ReplanSchema, 'the re-plan, written nowhere'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { at, ...b } = c.req.valid('json');
      return c.json(
        await store.plans.previewReplan(c.req.valid('param').id, b, momentJd(at, 'at'), run),
        200,
      );
    },
  );
  app.openapi(
    createRoute({
      method: 'post',
      path: '/nights/{id}/replan/accept',
      tags: ['planning'],
      security,
      summary:
        'Store the re-plan after a lost night (all or nothing; only blocks still planned are replaced)',
      request: { params: IdParam, body },
      responses: { 201: json(Accepted, 'the re-plan with the blocks written'), ...errorResponses },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      const { at, ...b } = c.req.valid('json');
      return c.json(
        await store.plans.acceptReplan(
          actor,
          c.req.valid('param').id,
          b,
          momentJd(at, 'at'),
          nowMs(),
          run,
        ),
        201,
      );
    },
  );
  return app;
}
