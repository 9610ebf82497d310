/**
 * POST /nights/{id}/replan: after a night whose report records lost time, the rest of its
 * campaign's season planned again (written nowhere); POST /nights/{id}/replan/accept: the same,
 * computed again and stored in one transaction (lead), with the preview's digest. The season
 * plan's rules apply: only blocks that are still plans are replaced.
 */
import { z } from '@hono/zod-openapi';
import type { Runner } from '../../jobs/tasks.ts';
import { WEATHER_CHOICES, type Store } from '../../store/index.ts';
import { SeasonPlanPreviewSchema } from '../schemas/plan-output.ts';
import { digestField, previewAcceptRoutes, splitAt } from './preview-accept.ts';
import { BlockRowSchema, NightRowSchema } from './nights.ts';
import { nowMs } from '../../clock.ts';

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
    digest: digestField('plan'),
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
  return previewAcceptRoutes({
    tag: 'planning',
    body: ReplanBody,
    preview: {
      path: '/nights/{id}/replan',
      summary: 'Preview the rest of the season planned again after this night lost time',
      role: 'viewer',
      response: ReplanSchema,
      answers: 'the re-plan, written nowhere',
      run: (id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.previewReplan(id, body, atJd, run);
      },
    },
    accept: {
      path: '/nights/{id}/replan/accept',
      summary:
        'Store the re-plan after a lost night (all or nothing; only blocks still planned are replaced)',
      role: 'lead',
      response: Accepted,
      answers: 'the re-plan with the blocks written',
      run: (actor, id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.acceptReplan(actor, id, body, atJd, nowMs(), run);
      },
    },
  });
}
