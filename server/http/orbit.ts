/**
 * Stateless orbit endpoints: POST /ephemeris and POST /events take an orbit in the body.
 */
import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import { ephemeris, eventsWithUncertainty, physicalQuantities, toCampbellInput, toThieleInnesInput, validateOrbit, type Orbit, type OrbitInput } from '../science/orbit/index.ts';
import { epochRange, parseDurationDays, parseEpoch } from '../science/time/index.ts';
import { InputError } from '../science/errors.ts';
import { EpochRangeSchema, EpochSchema, EventKindSchema, MonteCarloSchema, OrbitSchema } from './schemas/orbit.ts';
import { validationHook } from './validation.ts';

const json = (schema: z.ZodType, description: string) => ({ content: { 'application/json': { schema } }, description });
const Any = z.record(z.string(), z.unknown());

const EphemerisRequest = z
  .object({
    orbit: OrbitSchema,
    epochs: z.union([z.array(EpochSchema).min(1), EpochRangeSchema]).openapi({ description: 'a list of epochs, or a range with a step' }),
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

const errors = { 400: json(Any, 'malformed request'), 422: json(Any, 'a value breaks a rule (field, value, rule in details)') };

const ephemerisRoute = createRoute({
  method: 'post',
  path: '/ephemeris',
  summary: 'Predict offsets, separation, position angle and radial velocity at epochs',
  request: { body: { content: { 'application/json': { schema: EphemerisRequest } }, required: true } },
  responses: { 200: json(Any, 'the orbit in both forms, its physical quantities, and one row per epoch'), ...errors },
});

const eventsRoute = createRoute({
  method: 'post',
  path: '/events',
  summary: 'Periapsis, apoapsis, nodes, radial-velocity extrema and separation extrema in an interval',
  request: { body: { content: { 'application/json': { schema: EventsRequest } }, required: true } },
  responses: { 200: json(Any, 'events soonest first, each with its state and date uncertainty'), ...errors },
});

/** The epochs of a request as JD: a list, or a range with a step. */
export function resolveEpochs(epochs: string[] | { start: string; end: string; step: string | number }): Float64Array {
  if (Array.isArray(epochs)) return Float64Array.from(epochs, (e, i) => parseEpoch(e, `epochs.${i}`));
  const start = parseEpoch(epochs.start, 'epochs.start');
  const end = parseEpoch(epochs.end, 'epochs.end');
  if (end < start) throw new InputError('epochs.end', epochs.end, 'must not be before epochs.start');
  return epochRange(start, end, parseDurationDays(epochs.step, 'epochs.step'));
}

/** What every orbit response says about the orbit itself. */
export function describeOrbit(orbit: Orbit) {
  return {
    campbell: toCampbellInput(orbit),
    thieleInnes: toThieleInnesInput(orbit),
    physical: orbit.distancePc === null ? null : physicalQuantities(orbit),
    relativity: orbit.relativity,
  };
}

export function orbitRoutes() {
  const app = new OpenAPIHono({ defaultHook: validationHook });
  app.openapi(ephemerisRoute, (c) => {
    const body = c.req.valid('json');
    const orbit = validateOrbit(body.orbit as OrbitInput);
    const jd = resolveEpochs(body.epochs);
    const rows = ephemeris(orbit, jd, body.monteCarlo ? { monteCarlo: body.monteCarlo } : {});
    return c.json({ orbit: describeOrbit(orbit), predictions: rows }, 200);
  });
  app.openapi(eventsRoute, (c) => {
    const body = c.req.valid('json');
    const orbit = validateOrbit(body.orbit as OrbitInput);
    const start = parseEpoch(body.start, 'start');
    const end = parseEpoch(body.end, 'end');
    const events = eventsWithUncertainty(orbit, start, end, {
      ...(body.kinds ? { kinds: body.kinds } : {}),
      ...(body.monteCarlo ? { monteCarlo: body.monteCarlo } : {}),
    });
    return c.json({ orbit: describeOrbit(orbit), events }, 200);
  });
  return app;
}
