/**
 * POST /campaigns/{id}/season-plan: the season plan of a stored campaign (written nowhere), and
 * POST /campaigns/{id}/season-plan/accept: the same plan computed again and stored as blocks in one
 * transaction (lead: it reshapes the campaign's nights). Which stored blocks a plan replaces:
 * server/store/views/plan-scope.ts.
 */
import type { Runner } from '../../jobs/tasks.ts';
import { createRoute, z } from '@hono/zod-openapi';
import {
  ACCEPT_AT_TOLERANCE_MINUTES,
  NIGHT_CHOICES,
  WEATHER_CHOICES,
  type Store,
} from '../../store/index.ts';
import { requireRole } from '../auth.ts';
import { IdParam, errorResponses, json, security, type ResourceApp } from './common.ts';
import { digestField, previewAcceptRoutes, splitAt } from './preview-accept.ts';
import { BlockRowSchema, NightRowSchema } from './nights.ts';
import { SeasonDrawsSchema, SeasonPlanPreviewSchema } from '../schemas/plan-output.ts';
import { nowMs } from '../../clock.ts';

const num = (d: string) => z.number().optional().openapi({ description: d });
export const SeasonPlanBody = z
  .object({
    startDate: z.iso
      .date()
      .openapi({ description: 'first night (local evening date), within the campaign' }),
    endDate: z.iso
      .date()
      .openapi({ description: 'last night, within the campaign and 400 nights of startDate' }),
    siteIds: z
      .array(z.number().int().positive())
      .optional()
      .openapi({ description: 'sites of the campaign to plan; default all' }),
    nights: z.enum(NIGHT_CHOICES).optional().openapi({
      description:
        '"allocated" (default): the campaign’s stored nights; "all": every night of the range',
    }),
    at: z
      .string()
      .optional()
      .openapi({
        description:
          `the moment of planning (ISO 8601, JD, MJD); default now. Nights begun before it are not ` +
          `planned. Accept refuses (422) a moment more than ${ACCEPT_AT_TOLERANCE_MINUTES} min before the ` +
          `server clock`,
      }),
    blockMinutes: z
      .object({ astrometry: num('minutes, default 40'), spectroscopy: num('minutes, default 60') })
      .strict()
      .optional(),
    precision: z
      .object({
        astrometryMas: num('expected 1σ per offset at the zenith, mas; default 1'),
        spectroscopyKmS: num('expected 1σ at the zenith, km/s; default 5'),
        referenceSeeingArcsec: num(
          'seeing the zenith values hold for, arcsec; default the site’s own (σ then scales only with airmass)',
        ),
      })
      .strict()
      .optional()
      .openapi({
        description:
          'overrides the campaign’s and each site’s precision model; σ scales with FWHM ∝ X^0.6 (Roddier 1981)',
      }),
    periapsisWindowSigma: num(
      'half-width of the periapsis window in σ of the coming passage’s date, [0.1, 10]; default 2',
    ),
    coverageWithinDays: num(
      'an epoch this close (days) to the passage date covers it, [0.01, 30]; default 1',
    ),
    laserGuideStar: z
      .object({ astrometry: z.boolean().optional(), spectroscopy: z.boolean().optional() })
      .strict()
      .optional()
      .openapi({ description: 'laser guide star use per kind where a site has one; default none' }),
    periapsisRepeat: z
      .union([
        z.enum(['single', 'fill']),
        z
          .object({
            step: z.string().openapi({
              description: 'ISO 8601 duration between epochs, PT30M to PT12H, e.g. "PT2H"',
            }),
          })
          .strict(),
      ])
      .optional()
      .openapi({
        description:
          'epochs per night in a periapsis window: "single", "fill" (as many as fit) or { step } (one per ISO ' +
          '8601 duration)',
      }),
    relativityGoal: z
      .boolean()
      .optional()
      .openapi({
        description:
          'also maximise the relativity forecast: epochs that most tighten the redshift and precession factors ' +
          'of targets with those terms on; default the campaign’s (false)',
      }),
    slotMinutes: num('slot length, minutes, [1, 30]; default 10'),
    slewMinutes: num('gap between targets, minutes, [0, 120]; default 8'),
    sameTargetMinutes: num('gap between blocks of one target, minutes, [0, 120]; default 3'),
    fillFraction: num('share of each night’s darkness the plan may fill, (0, 1]; default 0.9'),
    extraEpochsPerTarget: num(
      'epochs beyond the cadence, placed where they most tighten the orbit, [0, 20]; default 0',
    ),
    weather: z
      .enum(WEATHER_CHOICES)
      .optional()
      .openapi({
        description:
          '"aware" (default): each night weighs by its site’s learned chance of being clear (GET ' +
          '/sites/{id}/statistics) and critical epochs on likely-lost nights get backups; "blind": every night ' +
          'weighs 1',
      }),
    backupLossAbove: num(
      'a critical epoch (periapsis window, or one the relativity forecast rests on) whose night is lost ' +
        'with at least this chance gets a backup, [0.01, 1]; default 0.2',
    ),
    digest: digestField('plan'),
  })
  .strict();

const DrawsBody = SeasonPlanBody.omit({ digest: true })
  .extend({
    draws: z.number().int().openapi({ description: 'seasons drawn, [1, 20000]' }),
    seed: z.number().int().openapi({ description: 'seed of the draws, [0, 2³² − 1]' }),
    precisionScatter: num(
      's of each night’s precision factor exp(s·z), z ~ N(0, 1), [0, 2]; default 0.25',
    ),
  })
  .strict();

const Accepted = SeasonPlanPreviewSchema.extend({
  written: z.array(BlockRowSchema),
  nightsCreated: z.array(NightRowSchema),
}).strict();

export function seasonPlanRoutes(store: Store, run: Runner) {
  return previewAcceptRoutes({
    tag: 'planning',
    body: SeasonPlanBody,
    preview: {
      path: '/campaigns/{id}/season-plan',
      summary:
        'Preview the season plan of a campaign: epochs per target, reasons, unmet goals, expected σ ' +
        'shrinkage, blocks it would replace',
      role: 'viewer',
      response: SeasonPlanPreviewSchema,
      answers: 'the plan, written nowhere',
      run: (id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.previewSeason(id, body, atJd, run);
      },
    },
    between: (app) => addDrawsRoute(app, store, run),
    accept: {
      path: '/campaigns/{id}/season-plan/accept',
      summary:
        'Store the season plan as blocks, replacing the still-planned blocks of its open nights (all or nothing)',
      role: 'lead',
      response: Accepted,
      answers: 'the plan with the blocks and nights written',
      run: (actor, id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.acceptSeason(actor, id, body, atJd, nowMs(), run);
      },
    },
  });
}

/** POST /campaigns/{id}/season-plan/draws: the season plan drawn many times (written nowhere). */
function addDrawsRoute(app: ResourceApp, store: Store, run: Runner) {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/campaigns/{id}/season-plan/draws',
      tags: ['planning'],
      security,
      summary:
        'Draw the season plan many times under the learned weather: percentiles of the final σ of the ' +
        'passage date, the mass and the relativity factors, and the passage’s coverage',
      request: {
        params: IdParam,
        body: { content: { 'application/json': { schema: DrawsBody } }, required: true },
      },
      responses: { 200: json(SeasonDrawsSchema, 'the distribution'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { body, atJd } = splitAt(c.req.valid('json'));
      return c.json(await store.plans.seasonDraws(c.req.valid('param').id, body, atJd, run), 200);
    },
  );
}
