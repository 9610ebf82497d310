/** Response schema of a detection forecast of the relativity factors (server/science/plan/forecast.ts). */
import { z } from '@hono/zod-openapi';
import { BLOCK_KINDS } from '../../science/plan/index.ts';

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

const detection = {
  factors: z.array(FactorForecastSchema),
  plannedEpochs: z.number().int(),
  summary: z.array(z.string()),
  assumptions: z.string(),
};

/** The forecast of a plan's epochs alone (a proposed season plan's, per target). */
export const DetectionForecastSchema = z.object(detection).strict().openapi('DetectionForecast');

export const TargetForecastSchema = z
  .object({
    ...detection,
    solution: z.object({ id: z.number().int(), version: z.number().int() }).strict(),
    at: z.string(),
    precision: z
      .object({
        source: z.string(),
        text: z
          .string()
          .openapi({ description: 'σ range per kind and blocks not counted, in words' }),
        epochs: z.array(
          z
            .object({
              blockId: z.number().int(),
              epoch: z.string().openapi({ description: 'the block’s middle, ISO 8601 UTC' }),
              kind: z.enum(BLOCK_KINDS),
              site: z.string(),
              night: z.string().openapi({ description: 'local evening date' }),
              airmass: z.number(),
              sigma: z.number().openapi({ description: 'expected 1σ there and then, in `unit`' }),
              unit: z.enum(['mas', 'km/s']),
            })
            .strict(),
        ),
        notCounted: z.array(
          z
            .object({
              blockId: z.number().int(),
              epoch: z.string(),
              kind: z.enum(BLOCK_KINDS),
              site: z.string(),
              night: z.string(),
              reason: z
                .string()
                .openapi({ description: 'the limit that closes the block’s middle' }),
            })
            .strict(),
        ),
      })
      .strict()
      .openapi({
        description:
          'the σ each planned block is counted at (the season planner’s precision model at its ' +
          'airmass), and blocks the limits close',
      }),
    blockIds: z.array(z.number().int()),
  })
  .strict()
  .openapi('TargetForecast');
