/**
 * Response schemas of a site's learned statistics (GET /sites/{id}/statistics) and its clear-night
 * prior per month (GET and PUT /sites/{id}/clear-prior).
 */
import { z } from '@hono/zod-openapi';
import { BLOCK_KINDS } from '../../science/plan/index.ts';

export const MonthPriorSchema = z
  .object({
    month: z.number().int().min(1).max(12).openapi({ description: 'calendar month, 1–12' }),
    clearFraction: z
      .number()
      .min(0)
      .max(1)
      .openapi({ description: 'expected share of clear night time, [0, 1]' }),
    strengthNights: z
      .number()
      .openapi({ description: 'how many nights of log the prior is worth, (0, 1000]' }),
  })
  .strict()
  .openapi('MonthPrior');

export const ClearPriorSchema = z
  .object({
    siteId: z.number().int(),
    months: z
      .array(MonthPriorSchema.nullable())
      .openapi({ description: 'twelve entries, January first; null where the site has none' }),
  })
  .strict()
  .openapi('ClearPrior');

const SpreadSchema = z
  .object({ n: z.number().int(), median: z.number(), q25: z.number(), q75: z.number() })
  .strict()
  .openapi('Spread', { description: 'median and quartiles, with the count they rest on' });

const LossSchema = z
  .object({
    mean: z.number().openapi({ description: 'posterior mean share of allocated time lost' }),
    sigma: z.number().openapi({ description: 'posterior 1σ of that share' }),
    alpha: z.number(),
    beta: z.number(),
    prior: z.enum(['user', 'flat']),
    nights: z.number().int().openapi({ description: 'nights of log it rests on' }),
  })
  .strict()
  .openapi('LossEstimate');

const statisticsFields = {
  nights: z.number().int().openapi({ description: 'night reports it rests on' }),
  darkHours: z.number().openapi({ description: 'allocated time: astronomical darkness, h' }),
  lostHours: z.number(),
  loggedLossFraction: z
    .number()
    .nullable()
    .openapi({ description: 'Σ lost / Σ dark of the log alone; null without darkness' }),
  loss: LossSchema,
  clearProbability: z
    .number()
    .openapi({ description: '1 − the posterior loss: the weight a plan gives such a night' }),
  reasons: z.array(
    z.object({ reason: z.string(), nights: z.number().int(), hours: z.number() }).strict(),
  ),
  seeingArcsec: SpreadSchema.nullable(),
  strehlRatio: SpreadSchema.nullable(),
};

const BinSchema = z
  .object({
    low: z.number(),
    high: z.number().nullable(),
    n: z.number().int(),
    medianSigma: z.number().nullable(),
  })
  .strict()
  .openapi('PrecisionBin');

export const SiteStatisticsSchema = z
  .object({
    siteId: z.number().int(),
    site: z.string(),
    start: z.string().nullable(),
    end: z.string().nullable(),
    priors: z.array(MonthPriorSchema.nullable()),
    months: z.array(
      z
        .object({ month: z.number().int(), ...statisticsFields })
        .strict()
        .openapi('MonthStatistics'),
    ),
    year: z.object(statisticsFields).strict(),
    precision: z.array(
      z
        .object({
          instrument: z.string(),
          kind: z.enum(BLOCK_KINDS),
          unit: z.enum(['mas', 'km/s']),
          n: z.number().int(),
          medianSigma: z.number(),
          bySeeing: z
            .array(BinSchema)
            .openapi({ description: 'bins of the night’s seeing, arcsec' }),
          byAirmass: z.array(BinSchema),
          bySeeingAndAirmass: z
            .array(
              z
                .object({
                  seeingLow: z.number(),
                  seeingHigh: z.number().nullable(),
                  byAirmass: z.array(BinSchema),
                })
                .strict(),
            )
            .openapi({
              description:
                'seeing (rows, arcsec) and airmass (cells) together: measurements and median σ per cell',
            }),
          zenith: z
            .object({
              sigma: z.number(),
              referenceSeeingArcsec: z.number(),
              n: z.number().int(),
            })
            .strict()
            .nullable()
            .openapi({
              description:
                'the zenith σ at the median seeing that σ ∝ seeing · X^0.6 implies (the planner’s precision model)',
            }),
        })
        .strict()
        .openapi('AchievedPrecision'),
    ),
    rule: z.string().openapi({ description: 'the Beta-prior rule, in words' }),
  })
  .strict()
  .openapi('SiteStatistics');
