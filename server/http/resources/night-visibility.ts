/** GET /nights/{id}/visibility: the sky engine's report for a stored night and its campaign's targets. */
import { createRoute, z } from '@hono/zod-openapi';
import type { Runner } from '../../jobs/tasks.ts';
import type { Store } from '../../store/index.ts';
import { requireRole } from '../auth.ts';
import { NightVisibilitySchema } from '../schemas/sky-output.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';

const Query = z.object({
  curves: z
    .enum(['true', 'false'])
    .default('false')
    .openapi({
      description:
        'include curves every 10 minutes: each target’s altitude, airmass and (with a horizon mask) ' +
        'the mask along its path, and the Moon’s altitude',
    }),
});

export function nightVisibilityRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  app.openapi(
    createRoute({
      method: 'get',
      path: '/nights/{id}/visibility',
      tags: ['nights'],
      security,
      summary: 'Darkness, Moon and each target’s windows on a stored night',
      request: { params: IdParam, query: Query },
      responses: {
        200: json(NightVisibilitySchema, 'the night report with cautions'),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      return c.json(
        await store.nightVisibility(
          c.req.valid('param').id,
          {
            curves: c.req.valid('query').curves === 'true',
          },
          run,
        ),
        200,
      );
    },
  );
  return app;
}
