/**
 * POST /nights/{id}/schedule: the schedule of a stored night from its campaign's candidates (or the
 * request's), with pins, moves and removals (written nowhere), and POST /nights/{id}/schedule/accept:
 * the same schedule computed again and stored in place of the night's still-planned blocks
 * (observer, as for blocks). Which stored blocks it replaces: server/store/views/plan-scope.ts.
 */
import type { Runner } from '../../jobs/tasks.ts';
import { createRoute, z } from '@hono/zod-openapi';
import { SCHEDULE_METHODS } from '../../science/plan/index.ts';
import {
  ACCEPT_AT_TOLERANCE_MINUTES,
  type NightScheduleRequest,
  type Store,
} from '../../store/index.ts';
import { requireRole, writer } from '../auth.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';
import { BlockRowSchema } from './nights.ts';
import { CandidateSchema, NightSchedulePreviewSchema } from '../schemas/plan-output.ts';
import { momentJd, nowMs } from '../../clock.ts';

const num = (d: string) => z.number().optional().openapi({ description: d });
export const NightScheduleBody = z
  .object({
    candidates: z
      .array(CandidateSchema)
      .optional()
      .openapi({
        description:
          'blocks to choose from: { id, target, kind, durationMinutes, priority, highestAirmass?, ' +
          'laserGuideStar?, earliestStart?, latestEnd? }; default the campaign’s, one per target ' +
          'and goal kind (id "<target>:<kind>"), repeated inside a periapsis window as the ' +
          'campaign asks (":<n>")',
      }),
    pins: z
      .array(z.object({ id: z.string(), start: z.string() }).strict())
      .optional()
      .openapi({
        description:
          'keep or move blocks: { id, start } (ISO 8601 UTC, snapped to the nearest slot edge)',
      }),
    remove: z.array(z.string()).optional().openapi({ description: 'candidate ids to leave out' }),
    slotMinutes: num('slot length, minutes, [1, 30]; default 5'),
    slewMinutes: num('gap between targets, minutes, [0, 120]; default 8'),
    sameTargetMinutes: num('gap between blocks of one target, minutes, [0, 120]; default 3'),
    method: z.enum(SCHEDULE_METHODS).optional().openapi({
      description: '"auto" (default): exact up to 8 candidates, else greedy with local improvement',
    }),
    blockMinutes: z
      .object({ astrometry: num('default 40'), spectroscopy: num('default 60') })
      .strict()
      .optional()
      .openapi({ description: 'lengths of the campaign’s candidates, minutes' }),
    at: z
      .string()
      .optional()
      .openapi({
        description:
          `the moment of scheduling (ISO 8601, JD, MJD); default now. Blocks begun ` +
          `before it are kept. Accept refuses (422) a moment more than ` +
          `${ACCEPT_AT_TOLERANCE_MINUTES} min before the server clock`,
      }),
    digest: z.string().optional().openapi({
      description: 'accept only: the preview’s digest; 409 if the schedule would now differ',
    }),
  })
  .strict();

const Accepted = NightSchedulePreviewSchema.extend({ written: z.array(BlockRowSchema) }).strict();

/** The body without `at`, and `at` as JD (default: the clock). */
function split({ at, ...body }: z.output<typeof NightScheduleBody>) {
  return { body: body satisfies NightScheduleRequest, atJd: momentJd(at, 'at') };
}

export function nightScheduleRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  const body = { content: { 'application/json': { schema: NightScheduleBody } }, required: true };
  app.openapi(
    createRoute({
      method: 'post',
      path: '/nights/{id}/schedule',
      tags: ['planning'],
      security,
      summary:
        'Preview the schedule of a stored night: blocks in darkness, every left-out block with ' +
        'its reason, laser and Sun cautions',
      request: { params: IdParam, body },
      responses: {
        200: json(NightSchedulePreviewSchema, 'the schedule, written nowhere'),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { body: b, atJd } = split(c.req.valid('json'));
      return c.json(await store.plans.previewNight(c.req.valid('param').id, b, atJd, run), 200);
    },
  );
  app.openapi(
    createRoute({
      method: 'post',
      path: '/nights/{id}/schedule/accept',
      tags: ['planning'],
      security,
      summary: 'Store the night’s schedule in place of its still-planned blocks (all or nothing)',
      request: { params: IdParam, body },
      responses: {
        201: json(Accepted, 'the schedule with the blocks written'),
        ...errorResponses,
      },
    }),
    async (c) => {
      const actor = writer(c, 'observer');
      const { body: b, atJd } = split(c.req.valid('json'));
      const id = c.req.valid('param').id;
      return c.json(await store.plans.acceptNight(actor, id, b, atJd, nowMs(), run), 201);
    },
  );
  return app;
}
