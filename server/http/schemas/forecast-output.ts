/** Response schema of a detection forecast of the relativity factors (server/science/plan/forecast.ts). */
import { z } from '@hono/zod-openapi';

const FactorForecastSchema = z
  .object({
    name: z.enum(['redshiftFactor', 'precessionFactor']),
    assumedValue: z
      .number()
      .openapi({ description: 'the value assumed true (1: general relativity)' }),
    sigmaNow: z
      .number()
      .nullable()
      .openapi({ description: 'Fisher 1σ from the measurements; null: not determined yet' }),
    sigmaAfter: z.number().nullable().openapi({ description: 'Fisher 1σ with the planned epochs' }),
    significanceNow: z.number().openapi({ description: 'expected |value|/σ now' }),
    significanceAfter: z.number().openapi({ description: 'expected |value|/σ after the plan' }),
    reaches: z.array(
      z
        .object({
          sigma: z.number(),
          already: z.boolean(),
          epoch: z.string().nullable().openapi({
            description:
              'the planned epoch (observed time, ISO 8601 UTC) after which the threshold is reached; null if never',
          }),
        })
        .strict(),
    ),
    topEpochs: z.array(
      z
        .object({
          epoch: z.string(),
          kind: z.enum(['astrometry', 'spectroscopy']),
          share: z.number().openapi({
            description: 'fraction of the information after the plan that this epoch adds',
          }),
        })
        .strict(),
    ),
  })
  .strict()
  .openapi('FactorForecast');

export const TargetForecastSchema = z
  .object({
    factors: z.array(FactorForecastSchema),
    plannedEpochs: z.number().int(),
    summary: z.array(z.string()),
    assumptions: z.string(),
    solution: z.object({ id: z.number().int(), version: z.number().int() }).strict(),
    at: z.string(),
    precision: z
      .object({ astrometryMas: z.number(), spectroscopyKmS: z.number(), source: z.string() })
      .strict(),
    blockIds: z.array(z.number().int()),
  })
  .strict()
  .openapi('TargetForecast');
