/**
 * POST /nights/{id}/schedule: the schedule of a stored night from its campaign's candidates (or the
 * request's), with pins, moves and removals (written nowhere), and POST /nights/{id}/schedule/accept:
 * the same schedule computed again and stored in place of the night's still-planned blocks
 * (observer, as for blocks). Which stored blocks it replaces: server/store/views/plan-scope.ts.
 */
import type { Runner } from '../../jobs/tasks.ts';
import { z } from '@hono/zod-openapi';
import { SCHEDULE_METHODS } from '../../science/plan/index.ts';
import { ACCEPT_AT_TOLERANCE_MINUTES, type Store } from '../../store/index.ts';
import { digestField, previewAcceptRoutes, splitAt } from './preview-accept.ts';
import { BlockRowSchema } from './nights.ts';
import { CandidateSchema, NightSchedulePreviewSchema } from '../schemas/plan-output.ts';
import { nowMs } from '../../clock.ts';

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
    digest: digestField('schedule'),
  })
  .strict();

const Accepted = NightSchedulePreviewSchema.extend({ written: z.array(BlockRowSchema) }).strict();

export function nightScheduleRoutes(store: Store, run: Runner) {
  return previewAcceptRoutes({
    tag: 'planning',
    body: NightScheduleBody,
    preview: {
      path: '/nights/{id}/schedule',
      summary:
        'Preview the schedule of a stored night: blocks in darkness, every left-out block with ' +
        'its reason, laser and Sun cautions',
      role: 'viewer',
      response: NightSchedulePreviewSchema,
      answers: 'the schedule, written nowhere',
      run: (id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.previewNight(id, body, atJd, run);
      },
    },
    accept: {
      path: '/nights/{id}/schedule/accept',
      summary: 'Store the night’s schedule in place of its still-planned blocks (all or nothing)',
      role: 'observer',
      response: Accepted,
      answers: 'the schedule with the blocks written',
      run: (actor, id, request) => {
        const { body, atJd } = splitAt(request);
        return store.plans.acceptNight(actor, id, body, atJd, nowMs(), run);
      },
    },
  });
}
