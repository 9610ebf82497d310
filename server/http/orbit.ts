/**
 * Stateless orbit endpoints: POST /ephemeris and POST /events take an orbit in the body.
 */
import type { Runner } from '../jobs/tasks.ts';
import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import { describeOrbit, validateOrbit, type OrbitInput } from '../science/orbit/index.ts';
import { parseEpoch, resolveEpochs } from '../science/time/index.ts';
import {
  EpochRangeSchema,
  EpochSchema,
  EventKindSchema,
  MonteCarloSchema,
  OrbitSchema,
} from './schemas/orbit.ts';
import { EphemerisAnswer, EventsAnswer } from './schemas/orbit-output.ts';
import { computeErrorResponses as errors, json } from './schemas/responses.ts';
import { validationHook } from './validation.ts';

const EphemerisRequest = z
  .object({
    orbit: OrbitSchema,
    epochs: z
      .union([z.array(EpochSchema).min(1), EpochRangeSchema])
      .openapi({ description: 'a list of epochs, or a range with a step' }),
    monteCarlo: MonteCarloSchema.optional(),
  })
  .strict();

const EventsRequest = z
  .object({
    orbit: OrbitSchema,
    start: EpochSchema,
    end: EpochSchema,
    kinds: z.array(EventKindSchema).optional(),
    monteCarlo: MonteCarloSchema.optional(),
  })
  .strict();

const ephemerisRoute = createRoute({
  method: 'post',
  path: '/ephemeris',
  summary: 'Predict offsets, separation, position angle and radial velocity at epochs',
  request: {
    body: { content: { 'application/json': { schema: EphemerisRequest } }, required: true },
  },
  responses: {
    200: json(
      EphemerisAnswer,
      'the orbit in both forms, its physical quantities, and one row per epoch',
    ),
    ...errors,
  },
});

const eventsRoute = createRoute({
  method: 'post',
  path: '/events',
  summary:
    'Periapsis, apoapsis, nodes, radial-velocity extrema and separation extrema in an interval',
  request: { body: { content: { 'application/json': { schema: EventsRequest } }, required: true } },
  responses: {
    200: json(EventsAnswer, 'events soonest first, each with its state and date uncertainty'),
    ...errors,
  },
});

export function orbitRoutes(run: Runner) {
  const app = new OpenAPIHono({ defaultHook: validationHook });
  app.openapi(ephemerisRoute, async (c) => {
    const body = c.req.valid('json');
    const orbit = validateOrbit(body.orbit as OrbitInput);
    const jd = resolveEpochs(body.epochs);
    const rows = await run(
      'ephemeris',
      orbit,
      jd,
      body.monteCarlo ? { monteCarlo: body.monteCarlo } : {},
    );
    return c.json({ orbit: describeOrbit(orbit), predictions: rows }, 200);
  });
  app.openapi(eventsRoute, async (c) => {
    const body = c.req.valid('json');
    const orbit = validateOrbit(body.orbit as OrbitInput);
    const start = parseEpoch(body.start, 'start');
    const end = parseEpoch(body.end, 'end');
    const events = await run('eventsWithUncertainty', orbit, start, end, {
      ...(body.kinds ? { kinds: body.kinds } : {}),
      ...(body.monteCarlo ? { monteCarlo: body.monteCarlo } : {}),
    });
    return c.json({ orbit: describeOrbit(orbit), events }, 200);
  });
  return app;
}
