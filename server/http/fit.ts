/**
 * Orbit fitting over HTTP.
 * - POST /fit: measurements and options in the body, the fit back (nothing stored), with one page
 *   of residuals (`residualPage`) and a summary of all; POST …/fit/residuals answers every
 *   residual as CSV instead (the fit runs again: it is deterministic).
 * - With the store: POST /targets/{id}/fit and /systems/{id}/fit fit stored measurements (preview,
 *   viewer role); POST …/fit/accept runs the same fit and stores each star's solution as a new
 *   orbit-solution version, made current (lead role; earlier versions stay).
 * A fit the data cannot support answers 422 `fit_refused` with the reason and the parameters
 * (errors.ts maps FitRefusal).
 */
import type { Runner } from '../jobs/tasks.ts';
import { createRoute, z } from '@hono/zod-openapi';
import type { Context } from 'hono';
import type { FitRequest } from '../science/orbit/fit/index.ts';
import { RESIDUAL_PAGE } from '../science/orbit/fit/residual-page.ts';
import { RESIDUAL_CSV_COLUMNS, type Store } from '../store/index.ts';
import { identify, requireRole, writer } from './auth.ts';
import { HttpError } from './errors.ts';
import { IdParam, resourceApp, security } from './resources/common.ts';
import { OrbitSolutionRowSchema } from './resources/orbit-solutions.ts';
import { FitResultSchema } from './schemas/fit-output.ts';
import { RelativitySwitchesSchema } from './schemas/orbit-output.ts';
import { CampbellSchema } from './schemas/orbit.ts';
import { MEASURED_COMPONENTS } from '../../descriptors/measurement-kinds.ts';
import { errorResponses, json } from './schemas/responses.ts';

const tags = ['fits'];
const Epoch = z
  .union([z.string(), z.number()])
  .openapi({ description: 'ISO 8601, "JD …", "MJD …", "J2027.35", "B1934.008", or a JD number' });
const Range = z.object({ min: z.number(), max: z.number() }).strict();
const Hints = z
  .object({
    periodYears: Range.optional().openapi({ description: 'period search range, years' }),
    eccentricity: Range.optional(),
    start: z
      .object({
        elements: CampbellSchema,
        distancePc: z.number().optional(),
        systemicVelocityKmS: z.number().optional(),
      })
      .strict()
      .optional()
      .openapi({
        description: 'an orbit to start from as well: Campbell elements, distance and γ',
      }),
  })
  .strict();
/* Shapes and types here (400); ranges and rules in the fit's own checks (422 naming the field). */
const measurement = {
  epoch: Epoch,
  component: z
    .enum(MEASURED_COMPONENTS)
    .optional()
    .openapi({
      description:
        'which body: "relative" (default; positions of the secondary relative to the primary, a ' +
        'velocity with the primary at rest), or for a radial velocity "primary" / "secondary" ' +
        'about the barycentre, fitted with the mass ratio q = M₂/M₁',
    }),
  id: z.string().optional().openapi({ description: 'your identifier, echoed in the residuals' }),
};
const MeasurementInput = z
  .discriminatedUnion('kind', [
    z
      .object({
        kind: z.literal('offsets'),
        ...measurement,
        dRaMas: z.number(),
        dDecMas: z.number(),
        sigmaDRaMas: z.number(),
        sigmaDDecMas: z.number(),
        correlation: z.number().optional(),
      })
      .strict(),
    z
      .object({
        kind: z.literal('separation'),
        ...measurement,
        separationMas: z.number(),
        positionAngleDeg: z.number(),
        sigmaSeparationMas: z.number(),
        sigmaPositionAngleDeg: z.number(),
      })
      .strict(),
    z
      .object({
        kind: z.literal('radial-velocity'),
        ...measurement,
        radialVelocityKmS: z.number(),
        sigmaRadialVelocityKmS: z.number(),
      })
      .strict(),
  ])
  .openapi('FitMeasurement');
const Options = {
  relativity: RelativitySwitchesSchema.partial()
    .optional()
    .openapi({ description: 'relativistic terms in the model (all off by default)' }),
  freeFactors: z
    .array(z.enum(['redshiftFactor', 'precessionFactor']))
    .optional()
    .openapi({
      description:
        'relativity factors fitted as parameters (0 Newtonian, 1 general relativity); each switches its terms on',
    }),
  frame: z
    .object({ offset: z.boolean().optional(), drift: z.boolean().optional() })
    .strict()
    .optional()
    .openapi({ description: 'fit the primary’s offset (mas) and drift (mas/yr) on the sky' }),
  frameEpoch: Epoch.optional(),
  fixed: z.record(z.string(), z.number()).optional().openapi({
    description:
      'parameters held at a value, by name (e.g. "distancePc", "Ilex.eccentricity"), interface units',
  }),
  priors: z
    .record(z.string(), z.object({ mean: z.number(), sigma: z.number() }).strict())
    .optional()
    .openapi({ description: 'Gaussian priors by parameter name' }),
  loss: z.enum(['gaussian', 'huber']).optional(),
  asOf: Epoch.optional().openapi({
    description: 'next periapsis counted from here (default: the latest epoch)',
  }),
  posterior: z
    .object({
      seed: z.number().int(),
      ensembleSize: z.number().int().optional(),
      rounds: z.number().int().optional(),
      discardRounds: z.number().int().optional(),
    })
    .strict()
    .optional()
    .openapi({ description: 'posterior sampling (affine-invariant ensemble), seeded' }),
};
const ResidualPage = z
  .object({
    offset: z
      .number()
      .int()
      .optional()
      .openapi({ description: 'first residual, 0-based (default 0)' }),
    limit: z
      .number()
      .int()
      .optional()
      .openapi({
        description:
          `residuals in the answer, 1 to ${RESIDUAL_PAGE.maxLimit} (default ` +
          `${RESIDUAL_PAGE.defaultLimit}); every residual: …/fit/residuals as CSV`,
      }),
  })
  .strict()
  .optional();
const FitBody = z
  .object({
    stars: z
      .array(
        z
          .object({
            name: z.string(),
            measurements: z.array(MeasurementInput).openapi({
              description:
                'offsets, separation or radial-velocity measurements (fields as in /measurements)',
            }),
            hints: Hints.optional(),
            relativity: RelativitySwitchesSchema.partial()
              .optional()
              .openapi({ description: 'this star’s terms, over the request’s relativity' }),
          })
          .strict(),
      )
      .min(1),
    ...Options,
    residualPage: ResidualPage,
  })
  .strict();
const StoredBody = z
  .object({
    ...Options,
    measurementIds: z
      .array(z.number().int().positive())
      .optional()
      .openapi({ description: 'fit only these measurements' }),
    targetIds: z
      .array(z.number().int().positive())
      .min(1)
      .optional()
      .openapi({ description: 'system fits: only these targets of the system' }),
    hints: z.record(z.string(), Hints).optional().openapi({
      description: 'search ranges by target name (default: around the current solution’s period)',
    }),
    notes: z
      .string()
      .max(2000)
      .optional()
      .openapi({ description: 'stored with the accepted solutions' }),
    residualPage: ResidualPage,
  })
  .strict();
const body = <S extends z.ZodType>(schema: S) => ({
  body: { content: { 'application/json': { schema } }, required: true },
});
const fitted = json(
  FitResultSchema,
  'the fit: parameters with 1σ, covariance, χ², residuals per measurement, per-star elements and derived quantities',
);
const FittedTargets = z.array(
  z
    .object({ id: z.number().int(), name: z.string(), measurementIds: z.array(z.number().int()) })
    .strict(),
);
const residualCsv = {
  content: { 'text/csv': { schema: z.string() } },
  description:
    `every residual, RFC 4180: ${RESIDUAL_CSV_COLUMNS.join(', ')} (observed − model, ` +
    `each component's unit beside it)`,
};
const csvAnswer = (c: Context, text: string) =>
  c.body(text, 200, { 'content-type': 'text/csv; charset=utf-8' });
const StoredPreview = z.object({ targets: FittedTargets, result: FitResultSchema }).strict();
const StoredAccept = z
  .object({ solutions: z.array(OrbitSolutionRowSchema), result: FitResultSchema })
  .strict();

export function fitRoutes(run: Runner, store?: Store) {
  const app = resourceApp();
  addBodyFit(app, run);
  addBodyResiduals(app, run);
  if (!store) return app;
  for (const path of [
    '/targets/:id/fit',
    '/targets/:id/fit/accept',
    '/targets/:id/fit/residuals',
    '/systems/:id/fit',
    '/systems/:id/fit/accept',
    '/systems/:id/fit/residuals',
  ])
    app.use(path, identify(store));
  for (const scope of ['target', 'system'] as const) {
    const on: StoredFit = {
      run,
      store,
      scope,
      base: scope === 'target' ? '/targets/{id}/fit' : '/systems/{id}/fit',
      what:
        scope === 'target'
          ? 'a target’s stored measurements'
          : 'the stored measurements of a system’s targets jointly (shared mass, distance, γ)',
    };
    addStoredPreview(app, on);
    addStoredResiduals(app, on);
    addStoredAccept(app, on);
  }
  return app;
}

type ResourceApp = ReturnType<typeof resourceApp>;

/** What the stored-fit routes of one scope share. */
interface StoredFit {
  run: Runner;
  store: Store;
  scope: 'target' | 'system';
  /** The routes' path, `/targets/{id}/fit` or `/systems/{id}/fit`. */
  base: string;
  /** What is fitted, in the summaries' words. */
  what: string;
}

/** The targets a stored fit fits: the target itself, or the system's (all, or those listed). */
function targetsOf(on: StoredFit, id: number, only?: number[]): Promise<number[]> | number[] {
  if (on.scope === 'target' && only)
    throw new HttpError(
      400,
      'invalid_request',
      'targetIds: belongs to system fits; a target fit fits its own target',
    );
  return on.scope === 'target' ? [id] : on.store.fits.systemTargetIds(id, only);
}

/** Fit the measurements in the body. */
function addBodyFit(app: ResourceApp, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/fit',
      tags,
      summary: 'Fit orbits to measurements in the body (one star, or several jointly)',
      request: body(FitBody),
      responses: { 200: fitted, ...errorResponses },
    }),
    async (c) => {
      const { residualPage, ...request } = c.req.valid('json');
      return c.json(await run('fitPage', request as FitRequest, residualPage), 200);
    },
  );
}

/** Fit the body and answer every residual as CSV. */
function addBodyResiduals(app: ResourceApp, run: Runner): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/fit/residuals',
      tags,
      summary: 'Fit as POST /fit does and answer every residual as CSV (one line per measurement)',
      request: body(FitBody),
      responses: { 200: residualCsv, ...errorResponses },
    }),
    async (c) => {
      const { residualPage: _page, ...request } = c.req.valid('json');
      return csvAnswer(c, await run('fitResidualsCsv', request as FitRequest));
    },
  );
}

/** Fit stored measurements, storing nothing. */
function addStoredPreview(app: ResourceApp, on: StoredFit): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: on.base,
      tags,
      security,
      summary: `Fit ${on.what} (preview, nothing stored)`,
      request: { params: IdParam, ...body(StoredBody) },
      responses: {
        200: json(StoredPreview, 'the targets and measurements fitted, and the fit'),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { notes: _notes, targetIds, residualPage, ...options } = c.req.valid('json');
      const ids = await targetsOf(on, c.req.valid('param').id, targetIds);
      const prepared = await on.store.fits.prepare(ids, options);
      return c.json(
        {
          targets: prepared.targets,
          result: await on.run('fitPage', prepared.request, residualPage),
        },
        200,
      );
    },
  );
}

/** Fit stored measurements and answer every residual as CSV. */
function addStoredResiduals(app: ResourceApp, on: StoredFit): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: `${on.base}/residuals`,
      tags,
      security,
      summary: `Fit ${on.what} and answer every residual as CSV (preview, nothing stored)`,
      request: { params: IdParam, ...body(StoredBody) },
      responses: { 200: residualCsv, ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'viewer');
      const { notes: _notes, targetIds, residualPage: _page, ...options } = c.req.valid('json');
      const ids = await targetsOf(on, c.req.valid('param').id, targetIds);
      const prepared = await on.store.fits.prepare(ids, options);
      return csvAnswer(c, await on.run('fitResidualsCsv', prepared.request));
    },
  );
}

/** Fit stored measurements and store the result as new current versions. */
function addStoredAccept(app: ResourceApp, on: StoredFit): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: `${on.base}/accept`,
      tags,
      security,
      summary: `Fit ${on.what} and store the result as new current orbit-solution versions (lead)`,
      request: { params: IdParam, ...body(StoredBody) },
      responses: {
        201: json(StoredAccept, 'the stored versions and the fit'),
        ...errorResponses,
      },
    }),
    async (c) => {
      const actor = writer(c, 'lead');
      const { notes, targetIds, residualPage, ...options } = c.req.valid('json');
      const ids = await targetsOf(on, c.req.valid('param').id, targetIds);
      const prepared = await on.store.fits.prepare(ids, options);
      const result = await on.run('fitPage', prepared.request, residualPage);
      const solutions = await on.store.fits.accept(actor, prepared, result, notes ?? '');
      return c.json({ solutions, result }, 201);
    },
  );
}
