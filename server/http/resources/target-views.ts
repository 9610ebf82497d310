/**
 * Computed views of a stored target from its current orbit solution: ephemeris (JSON or CSV)
 * and events, through the same orbit engine functions as the stateless endpoints.
 */
import { createRoute, z } from '@hono/zod-openapi';
import { EVENT_KINDS } from '../../science/orbit/index.ts';
import { InputError } from '../../science/errors.ts';
import { parseEpoch } from '../../science/time/index.ts';
import type { Runner } from '../../jobs/tasks.ts';
import type { Store } from '../../store/index.ts';
import { requireRole } from '../auth.ts';
import { describeOrbit } from '../../science/orbit/index.ts';
import { resolveEpochs } from '../../science/time/index.ts';
import {
  EphemerisRowSchema,
  OrbitDescriptionSchema,
  OrbitEventSchema,
} from '../schemas/orbit-output.ts';
import { TargetForecastSchema } from '../schemas/forecast-output.ts';
import { momentJd } from '../../clock.ts';
import { IdParam, errorResponses, json, resourceApp, security } from './common.ts';

const tags = ['targets'];
const SolutionRef = z
  .object({ id: z.number().int(), version: z.number().int() })
  .strict()
  .openapi({ description: 'the orbit solution the answer was computed from' });
const TargetEphemeris = z
  .object({
    solution: SolutionRef,
    orbit: OrbitDescriptionSchema,
    predictions: z.array(EphemerisRowSchema),
  })
  .strict();
const TargetEvents = z
  .object({ solution: SolutionRef, events: z.array(OrbitEventSchema) })
  .strict();
const EphemerisQuery = z.object({
  start: z.string().openapi({ description: 'first epoch (ISO 8601 with zone, JD, MJD, J…)' }),
  end: z.string(),
  step: z.string().default('P30D').openapi({
    description: 'ISO 8601 duration between epochs, e.g. "P1D", "PT12H"; default P30D',
  }),
  format: z.enum(['json', 'csv']).default('json'),
});
const ForecastQuery = z.object({
  at: z
    .string()
    .optional()
    .openapi({ description: 'count planned blocks from here (ISO 8601, JD, MJD); default now' }),
  astrometryMas: z.coerce
    .number()
    .positive()
    .optional()
    .openapi({ description: '1σ per offset component of a planned epoch, mas' }),
  spectroscopyKmS: z.coerce
    .number()
    .positive()
    .optional()
    .openapi({ description: '1σ of a planned radial velocity, km/s' }),
});
const EventsQuery = z.object({
  start: z.string(),
  end: z.string(),
  kinds: z
    .string()
    .optional()
    .openapi({ description: `comma-separated: ${EVENT_KINDS.join(', ')}` }),
});

export function targetViewRoutes(store: Store, run: Runner) {
  const app = resourceApp();
  addEphemeris(app, store, run);
  addEvents(app, store, run);
  addForecast(app, store, run);
  return app;
}

type ResourceApp = ReturnType<typeof resourceApp>;

/** A target's ephemeris from its current solution, JSON or CSV. */
function addEphemeris(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/targets/{id}/ephemeris',
      tags,
      security,
      summary: 'Ephemeris of a target from its current orbit solution',
      request: { params: IdParam, query: EphemerisQuery },
      responses: {
        200: {
          content: {
            'application/json': { schema: TargetEphemeris },
            'text/csv': { schema: z.string() },
          },
          description: 'solution, orbit and one row per epoch (CSV with format=csv)',
        },
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const q = c.req.valid('query');
      const { solution, orbit } = await store.orbitSolutions.current(c.req.valid('param').id);
      const jd = resolveEpochs({ start: q.start, end: q.end, step: q.step });
      if (q.format === 'csv')
        return c.body(await run('ephemerisCsv', orbit, jd), 200, {
          'content-type': 'text/csv; charset=utf-8',
        });
      const rows = await run('ephemeris', orbit, jd);
      return c.json(
        {
          solution: { id: solution.id, version: solution.version },
          orbit: describeOrbit(orbit),
          predictions: rows,
        },
        200,
      );
    },
  );
}

/** A target's periapses and other events with their uncertainty. */
function addEvents(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/targets/{id}/events',
      tags,
      security,
      summary: 'Periapsis and other events of a target from its current orbit solution',
      request: { params: IdParam, query: EventsQuery },
      responses: { 200: json(TargetEvents, 'events soonest first'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const q = c.req.valid('query');
      const { solution, orbit } = await store.orbitSolutions.current(c.req.valid('param').id);
      const kinds = q.kinds?.split(',').map((k) => {
        const kind = EVENT_KINDS.find((e) => e === k.trim());
        if (kind === undefined)
          throw new InputError('kinds', k, `is not an event kind; use ${EVENT_KINDS.join(', ')}`);
        return kind;
      });
      const events = await run(
        'eventsWithUncertainty',
        orbit,
        parseEpoch(q.start, 'start'),
        parseEpoch(q.end, 'end'),
        kinds ? { kinds } : {},
      );
      return c.json({ solution: { id: solution.id, version: solution.version }, events }, 200);
    },
  );
}

/** When the relativity factors become detectable with the planned blocks. */
function addForecast(app: ResourceApp, store: Store, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/targets/{id}/forecast',
      tags,
      security,
      summary: 'When the redshift and precession factors become detectable with the planned blocks',
      request: { params: IdParam, query: ForecastQuery },
      responses: {
        200: json(
          TargetForecastSchema,
          'Fisher σ of each factor now and after the plan, dates of 3σ and 5σ, top epochs',
        ),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const q = c.req.valid('query');
      const precision = {
        ...(q.astrometryMas !== undefined ? { astrometryMas: q.astrometryMas } : {}),
        ...(q.spectroscopyKmS !== undefined ? { spectroscopyKmS: q.spectroscopyKmS } : {}),
      };
      const forecast = await store.plans.forecast(
        c.req.valid('param').id,
        { atJd: momentJd(q.at, 'at'), precision },
        run,
      );
      return c.json(forecast, 200);
    },
  );
}
