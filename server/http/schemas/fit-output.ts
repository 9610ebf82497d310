/**
 * Response schemas of a fit: every parameter and derived quantity with 1σ, the covariance,
 * residuals per measurement, and per star an orbit that can be stored as a new solution.
 */
import { z } from '@hono/zod-openapi';
import {
  MEASURED_COMPONENTS,
  MEASUREMENT_KIND_NAMES,
} from '../../../descriptors/measurement-kinds.ts';
import { PERCENTILES } from '../../science/orbit/index.ts';
import { OrbitSchema } from './orbit.ts';

const percentiles = z
  .array(z.number())
  .optional()
  .openapi({ description: `posterior percentiles ${PERCENTILES.join(', ')} when sampled` });

export const FittedParameterSchema = z
  .object({
    name: z.string(),
    value: z.number(),
    sigma: z.number().openapi({ description: '1σ from the covariance; 0 when held fixed' }),
    unit: z.string(),
    fixed: z.boolean(),
    percentiles,
  })
  .strict()
  .openapi('FittedParameter');

export const StarSolutionSchema = z
  .object({
    name: z.string(),
    quantities: z.array(
      z
        .object({
          name: z.string(),
          value: z.number(),
          sigma: z.number(),
          unit: z.string(),
          percentiles,
          fitted: z.boolean(),
        })
        .strict(),
    ),
    orbit: OrbitSchema.openapi({ description: 'the solution with the covariance of its elements' }),
    nextPeriapsis: z.string().openapi({ description: 'ISO 8601 UTC, counted from asOf' }),
    chi2: z.number(),
    components: z.number().int(),
  })
  .strict()
  .openapi('StarSolution');

export const ResidualSchema = z
  .object({
    star: z.string(),
    index: z.number().int(),
    id: z.string().optional().openapi({ description: 'the measurement’s id, as sent' }),
    kind: z.enum(MEASUREMENT_KIND_NAMES),
    component: z
      .enum(MEASURED_COMPONENTS)
      .openapi({ description: 'which body the measurement is of' }),
    jd: z.number(),
    epoch: z.string(),
    residual: z.array(z.number()).openapi({
      description: 'observed − model: [Δα*, Δδ] mas, [ρ mas, θ deg] or [v km/s]',
    }),
    normalized: z.array(z.number()).openapi({ description: 'residual / σ per component' }),
    outlier: z.boolean(),
  })
  .strict()
  .openapi('Residual');

export const ResidualSummarySchema = z
  .object({
    total: z.number().int(),
    outliers: z.number().int(),
    groups: z.array(
      z
        .object({
          star: z.string(),
          kind: z.enum(MEASUREMENT_KIND_NAMES),
          count: z.number().int(),
          rmsNormalized: z
            .number()
            .openapi({ description: 'RMS of (o−c)/σ over the components: about 1 for a good fit' }),
          worstNormalized: z.number().openapi({ description: 'largest |(o−c)/σ|' }),
          worstIndex: z.number().int().openapi({ description: 'the measurement it belongs to' }),
          worstId: z.string().optional(),
          outliers: z.number().int(),
        })
        .strict(),
    ),
  })
  .strict()
  .openapi('ResidualSummary', { description: 'every residual summarised, by star and kind' });

const Term = z.enum(['romer', 'gravitationalRedshift', 'transverseDoppler', 'precession']);

export const RelativitySettingsSchema = z
  .object({
    terms: z.record(Term, z.boolean()),
    reasons: z.record(Term, z.string()).openapi({ description: '"on"/"off" and why, per term' }),
    stars: z.array(
      z
        .object({
          name: z.string(),
          terms: z.record(Term, z.boolean()),
          reasons: z.record(Term, z.string()),
        })
        .strict(),
    ),
    factors: z.array(
      z
        .object({
          name: z.enum(['redshiftFactor', 'precessionFactor']),
          value: z.number(),
          sigma: z.number().openapi({ description: '1σ; 0 when fixed' }),
          fitted: z.boolean(),
          detectionSigma: z
            .number()
            .openapi({ description: '|value|/σ: departure from Newtonian 0 (0 when fixed)' }),
          departureFromGrSigma: z
            .number()
            .openapi({ description: '|value − 1|/σ: departure from general relativity' }),
        })
        .strict(),
    ),
  })
  .strict()
  .openapi('RelativitySettings');

export const FitResultSchema = z
  .object({
    method: z.string(),
    derivatives: z.string(),
    loss: z.enum(['gaussian', 'huber']),
    stars: z.array(StarSolutionSchema),
    parameters: z.array(FittedParameterSchema),
    covariance: z
      .object({ parameters: z.array(z.string()), matrix: z.array(z.array(z.number())) })
      .strict()
      .openapi({ description: 'of the free parameters, interface units' }),
    chi2: z.number(),
    dof: z.number().int(),
    reducedChi2: z.number().nullable(),
    components: z.number().int(),
    iterations: z.number().int(),
    converged: z.boolean(),
    frameEpoch: z.string().nullable(),
    asOf: z.string(),
    residuals: z.array(ResidualSchema).openapi({
      description: 'one page of the residuals, in measurement order (residualPage says which)',
    }),
    residualPage: z
      .object({
        offset: z.number().int(),
        limit: z.number().int(),
        total: z.number().int().openapi({ description: 'residuals in the fit' }),
      })
      .strict(),
    residualSummary: ResidualSummarySchema,
    outliers: z.number().int(),
    relativity: RelativitySettingsSchema,
    warnings: z
      .array(z.string())
      .openapi({ description: 'e.g. relativistic terms left off that the data can see' }),
    posterior: z
      .object({
        ensembleSize: z.number().int(),
        rounds: z.number().int(),
        discardRounds: z.number().int(),
        seed: z.number().int(),
        acceptance: z.number(),
        samples: z.number().int(),
      })
      .strict()
      .optional(),
  })
  .strict()
  .openapi('FitResult');
