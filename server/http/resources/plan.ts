/** GET /campaigns/{id}/flags: the planning flags of a stored campaign, soonest first. */
import { createRoute, z } from '@hono/zod-openapi';
import type { Runner } from '../../jobs/tasks.ts';
import type { Store } from '../../store/index.ts';
import { requireRole } from '../auth.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';
import { FlagsAnswer } from '../schemas/plan-output.ts';
import { momentJd, nowMs } from '../../clock.ts';
import { unixMsToJd } from '../../science/time/index.ts';

const FlagsQuery = z.object({
  at: z.string().optional().openapi({
    description: 'the moment to compute flags for (ISO 8601, JD, MJD); default the current minute',
  }),
  resolutionMas: z.coerce
    .number()
    .positive()
    .optional()
    .openapi({ description: 'resolution limit for blend flags, mas' }),
});

export function planRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  app.openapi(
    createRoute({
      method: 'get',
      path: '/campaigns/{id}/flags',
      tags: ['planning'],
      security,
      summary: 'Periapsis, blend and stale-prediction flags of a campaign, soonest first',
      request: { params: IdParam, query: FlagsQuery },
      responses: { 200: json(FlagsAnswer, 'the flags'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const q = c.req.valid('query');
      // "Now" is the current minute: the answers of one minute are one (the store keeps them
      // until a write), and no flag's words change within a minute.
      const nowJd =
        q.at === undefined
          ? unixMsToJd(Math.floor(nowMs() / 60_000) * 60_000)
          : momentJd(q.at, 'at');
      return c.json(
        await store.plans.flags(
          c.req.valid('param').id,
          {
            nowJd,
            ...(q.resolutionMas ? { resolutionMas: q.resolutionMas } : {}),
          },
          run,
        ),
        200,
      );
    },
  );
  return app;
}
