/**
 * Response schemas of the planners: a campaign's flags, the season plan and the night schedule
 * previews (what accepting would write). Instants as in the sky answers (UTC and the site's zone).
 */
import { z } from '@hono/zod-openapi';
import { FLAG_KINDS, BLOCK_KINDS, NIGHT_REASONS } from '../../science/plan/index.ts';
import { NIGHT_CHOICES, WEATHER_CHOICES } from '../../store/index.ts';
import { DetectionForecastSchema } from './forecast-output.ts';
import { InstantSchema, IntervalSchema } from './sky-output.ts';

const BlockKind = z.enum(BLOCK_KINDS);
const Before = z.object({ before: z.number().nullable(), after: z.number().nullable() }).strict();
const NightReason = z.enum(NIGHT_REASONS).openapi({
  description: 'the limit that closed the night (the words say it in full, with its numbers)',
});
const NightNote = z
  .object({
    site: z.string(),
    date: z.string(),
    kind: BlockKind,
    reason: NightReason,
    words: z.string(),
  })
  .strict()
  .openapi('NightNote');
const Gain = z
  .object({
    periapsisSigmaHoursRemoved: z.number().nullable().openapi({
      description:
        'hours of σ removed from the date of the coming passage (the plan’s shrinkage.passage)',
    }),
    massVariancePercentRemoved: z
      .number()
      .nullable()
      .openapi({ description: '% of the mass variance removed' }),
    text: z.string().openapi({ description: 'the same in words, as the CLI and client show it' }),
  })
  .strict()
  .openapi('EpochGain');

export const FlagSchema = z
  .object({
    kind: z.enum(FLAG_KINDS),
    target: z.string(),
    date: z.string().openapi({
      description:
        'when it applies, ISO 8601 UTC: the periapsis, the blend’s start, or for a stale ' +
        'prediction the first moment a site can observe the target (now if it can)',
    }),
    daysAhead: z.number(),
    reason: z.string(),
    periapsis: z
      .object({
        sigmaDays: z.number().nullable(),
        band: z.string(),
        sites: z.array(
          z
            .object({
              site: z.string(),
              nights: z.array(
                z
                  .object({
                    date: z.string(),
                    hours: z.number(),
                    reason: NightReason.nullable(),
                    words: z.string().nullable(),
                  })
                  .strict(),
              ),
              minHours: z.number(),
              maxHours: z.number(),
              blocked: z.string().nullable().openapi({
                description: 'why it cannot be observed on the night of periapsis, if it cannot',
              }),
            })
            .strict(),
        ),
        radialVelocityRateKmSPerDay: z.number().nullable(),
        skyRateMasPerDay: z.number(),
        samplingDays: z.number().nullable().openapi({
          description: 'longest interval between epochs that still follows the change, days',
        }),
        coverage: z
          .object({
            planned: z.array(z.object({ site: z.string(), date: z.string() }).strict()),
            closed: z
              .array(z.object({ site: z.string(), date: z.string(), words: z.string() }).strict())
              .openapi({
                description:
                  'planned epochs of the window at a moment the target cannot be observed (the ' +
                  'Moon, …): they do not cover it',
              }),
            allocated: z.array(z.object({ site: z.string(), date: z.string() }).strict()),
            mostLikelyCovered: z.boolean(),
            text: z.string(),
          })
          .strict()
          .openapi({
            description:
              'nights (site, local evening date) of the ± window holding a planned epoch at an ' +
              'observable moment or an allocated observable night, and whether the most likely ' +
              'date is covered',
          }),
        relativity: z
          .object({
            gravitationalRedshiftKmS: z.number(),
            transverseDopplerKmS: z.number(),
            precessionArcminPerOrbit: z.number(),
          })
          .strict()
          .nullable(),
      })
      .strict()
      .optional(),
    blend: z
      .object({ other: z.string(), start: z.string(), end: z.string(), closestMas: z.number() })
      .strict()
      .optional(),
    relativity: z
      .object({
        epochs: z.array(
          z
            .object({
              epoch: z.string().openapi({ description: 'the planned epoch (block middle), UTC' }),
              shares: z.array(
                z.object({ factor: z.string(), share: z.number() }).strict().openapi({
                  description:
                    'share (0–1) of the factor’s information after the plan the epoch carries',
                }),
              ),
              reaches: z
                .array(z.string())
                .openapi({ description: 'detections reached with it, e.g. "redshift 5σ"' }),
            })
            .strict(),
        ),
        summary: z.array(z.string()),
      })
      .strict()
      .optional()
      .openapi({ description: 'coming planned epochs the relativity forecast depends on' }),
    stale: z
      .object({
        sigmaMas: z
          .number()
          .nullable()
          .openapi({ description: 'position 1σ at the flag’s date, mas' }),
        daysSinceMeasured: z
          .number()
          .nullable()
          .openapi({ description: 'days from the last measurement to the flag’s date' }),
        nextPlanned: z.string().nullable(),
        observableFrom: z
          .object({ utc: z.string(), site: z.string(), night: z.string() })
          .strict()
          .nullable()
          .openapi({
            description:
              'when a site can next observe the target, if not now: first open moment (UTC; the ' +
              'flag’s date), site, night (local evening date)',
          }),
      })
      .strict()
      .optional(),
  })
  .strict()
  .openapi('Flag');

export const FlagsAnswer = z
  .object({ campaignId: z.number().int(), flags: z.array(FlagSchema) })
  .strict();

export const ScheduledBlockSchema = z
  .object({
    id: z.string(),
    target: z.string(),
    kind: BlockKind,
    start: InstantSchema,
    end: InstantSchema,
    minutes: z.number(),
    priority: z.number(),
    value: z.number().openapi({ description: 'priority × mean 1/airmass over the block' }),
    airmassStart: z.number(),
    airmassMiddle: z.number(),
    airmassEnd: z.number(),
    altitudeMiddleDeg: z.number(),
    pinned: z.boolean(),
    laserGuideStar: z.boolean(),
    cautions: z.array(z.string()),
  })
  .strict()
  .openapi('ScheduledBlock');

export const NightScheduleSchema = z
  .object({
    site: z.string(),
    timeZone: z.string(),
    date: z.string(),
    slotMinutes: z.number(),
    slewMinutes: z.number(),
    sameTargetMinutes: z.number(),
    method: z.enum(['exact', 'heuristic']),
    darkness: z.array(IntervalSchema),
    darkHours: z.number(),
    scheduledHours: z.number().openapi({ description: 'hours inside blocks' }),
    totalValue: z.number(),
    blocks: z.array(ScheduledBlockSchema),
    leftOut: z.array(
      z
        .object({ id: z.string(), target: z.string(), kind: BlockKind, reason: z.string() })
        .strict(),
    ),
    cautions: z.array(z.string()),
  })
  .strict()
  .openapi('NightSchedule');

export const CandidateSchema = z
  .object({
    id: z.string().openapi({ description: 'your name for the block, unique in the request' }),
    target: z.string(),
    kind: BlockKind,
    durationMinutes: z.number().openapi({ description: 'time on target, minutes, (0, 720]' }),
    priority: z.number().openapi({ description: 'weight in the night’s value, (0, 1000]' }),
    highestAirmass: z.number().optional(),
    laserGuideStar: z.boolean().optional(),
    earliestStart: z
      .string()
      .optional()
      .openapi({ description: 'timing window: start no earlier than this (ISO 8601 UTC)' }),
    latestEnd: z
      .string()
      .optional()
      .openapi({ description: 'timing window: end no later than this (ISO 8601 UTC)' }),
  })
  .strict()
  .openapi('Candidate');

const Kept = z.object({ id: z.number().int(), reason: z.string() }).strict();

export const NightSchedulePreviewSchema = z
  .object({
    nightId: z.number().int(),
    campaignId: z.number().int(),
    at: z.string(),
    candidatesFrom: z.enum(['campaign', 'request']),
    candidates: z.array(CandidateSchema),
    schedule: NightScheduleSchema,
    replaces: z
      .array(z.number().int())
      .openapi({ description: 'stored blocks accepting would delete (all still only plans)' }),
    kept: z.array(Kept),
    digest: z.string(),
  })
  .strict()
  .openapi('NightSchedulePreview');

export const SeasonPlanSchema = z
  .object({
    startDate: z.string(),
    endDate: z.string(),
    sites: z.array(
      z
        .object({
          name: z.string(),
          nights: z.number().int(),
          nightsUsed: z.number().int(),
          darkHours: z.number(),
          plannedHours: z.number(),
        })
        .strict(),
    ),
    epochs: z.array(
      z
        .object({
          target: z.string(),
          kind: BlockKind,
          site: z.string(),
          date: z.string(),
          block: ScheduledBlockSchema,
          precision: z
            .object({
              sigma: z.number(),
              unit: z.enum(['mas', 'km/s']),
              airmass: z.number(),
              seeingArcsec: z.number().nullable(),
            })
            .strict()
            .openapi({ description: 'the 1σ expected there and then (FWHM ∝ X^0.6)' }),
          gain: Gain,
          why: z.enum(['periapsis', 'cadence', 'information', 'backup']),
          reason: z.string(),
        })
        .strict(),
    ),
    unmet: z.array(
      z
        .object({
          target: z.string(),
          kind: BlockKind,
          start: z.string(),
          end: z.string(),
          reason: z.string(),
          nights: z.array(NightNote),
        })
        .strict(),
    ),
    targets: z.array(
      z
        .object({
          target: z.string(),
          priority: z.number(),
          cadenceDays: z.number(),
          epochs: z
            .object({ astrometry: z.number().int(), spectroscopy: z.number().int() })
            .strict(),
          periapses: z.array(z.string()),
          cadenceMet: z.boolean(),
          passage: z
            .object({
              date: z
                .string()
                .openapi({ description: 'the coming passage these numbers are about' }),
              sigmaDays: Before,
              windowSigma: z.number(),
              windowStart: z.string(),
              windowEnd: z.string(),
              coverage: z
                .object({ withinDays: z.number(), before: z.number(), after: z.number() })
                .strict()
                .openapi({
                  description:
                    'probability that the passage date lies within withinDays of an epoch, before ' +
                    '(kept blocks) and after the plan',
                }),
              epochs: z.number().int(),
              unused: z.array(NightNote).openapi({
                description: 'allocated site-nights of the window left without an epoch, with why',
              }),
            })
            .strict()
            .nullable(),
          shrinkage: z
            .object({
              periapsisDays: Before,
              passage: z.string().nullable().openapi({
                description: 'the passage whose date σ periapsisDays gives (not the element T)',
              }),
              massFraction: Before,
              nominalPrior: z.boolean(),
            })
            .strict()
            .nullable()
            .openapi({ description: '1σ before and after the plan (linear, Fisher)' }),
          backups: z
            .object({
              critical: z.number().int(),
              backedUp: z.number().int(),
              words: z.string(),
            })
            .strict()
            .nullable()
            .openapi({
              description:
                'critical epochs on nights likely lost and how many got a backup, in words with ' +
                'the numbers (or why none is critical); null when no night is likely lost',
            }),
          nextBest: z.array(
            z.object({ date: z.string(), site: z.string(), kind: BlockKind, gain: Gain }).strict(),
          ),
          relativity: z.union([DetectionForecastSchema, z.null()]).openapi({
            description:
              'the relativity detection forecast after the plan: the measurements, then the ' +
              'blocks that stay and the plan’s epochs at their σ; null when the orbit has no ' +
              'distance or no relativistic term',
          }),
        })
        .strict(),
    ),
    cautions: z.array(z.string()),
  })
  .strict()
  .openapi('SeasonPlan');

const ClearChance = z
  .object({
    mean: z.number().nullable().openapi({
      description: 'mean chance an open night is clear, from the site’s statistics',
    }),
    nightsLogged: z.number().int().openapi({ description: 'night reports it rests on' }),
  })
  .strict();

export const SeasonPlanPreviewSchema = z
  .object({
    campaignId: z.number().int(),
    at: z.string(),
    nights: z.enum(NIGHT_CHOICES),
    weather: z.enum(WEATHER_CHOICES),
    sites: z.array(
      z
        .object({
          siteId: z.number().int(),
          name: z.string(),
          openNights: z.number().int(),
          clearChance: ClearChance,
          skipped: z.array(z.object({ date: z.string(), reason: z.string() }).strict()),
          plannedAround: z.array(z.object({ date: z.string(), kept: z.array(Kept) }).strict()),
        })
        .strict(),
    ),
    plan: SeasonPlanSchema,
    replaces: z.array(z.number().int()),
    digest: z.string(),
  })
  .strict()
  .openapi('SeasonPlanPreview');

const DistributionSchema = z
  .object({
    percentiles: z
      .array(
        z
          .object({
            p: z.number(),
            value: z.number(),
            low: z.number(),
            high: z.number(),
          })
          .strict(),
      )
      .openapi({
        description:
          'percentiles 5, 16, 50, 84, 95; low–high: the values at the ranks N·p ∓ 2√(N p (1 − p)), the sampling error',
      }),
    mean: z.number(),
    n: z.number().int(),
  })
  .strict()
  .openapi('DrawDistribution');

export const SeasonDrawsSchema = z
  .object({
    campaignId: z.number().int(),
    at: z.string(),
    weather: z.enum(WEATHER_CHOICES),
    sites: SeasonPlanPreviewSchema.shape.sites,
    planned: z.object({ epochs: z.number().int(), digest: z.string() }).strict(),
    draws: z
      .object({
        draws: z.number().int(),
        seed: z.number().int(),
        precisionScatter: z.number(),
        targets: z.array(
          z
            .object({
              target: z.string(),
              epochs: z.number().int().openapi({
                description: 'the plan’s epochs of the target and its kept blocks that count',
              }),
              kept: z
                .object({ planned: z.number().int(), obtained: z.number().int() })
                .strict()
                .openapi({
                  description:
                    'kept blocks among the epochs: still planned (drawn with their night) and obtained (certain)',
                }),
              passage: z
                .object({ date: z.string(), sigmaDaysNow: z.number().nullable() })
                .strict()
                .nullable(),
              periapsisSigmaDays: DistributionSchema.nullable().openapi({
                description: '1σ of the coming passage’s date after the season, days',
              }),
              massFraction: DistributionSchema.nullable().openapi({
                description: '1σ of the mass after the season, as a fraction of the mass',
              }),
              factors: z.array(
                z
                  .object({
                    name: z.enum(['redshiftFactor', 'precessionFactor']),
                    sigma: DistributionSchema.nullable(),
                  })
                  .strict(),
              ),
              coverage: z
                .object({ withinDays: z.number(), distribution: DistributionSchema })
                .strict()
                .nullable(),
              windowCovered: z.number().nullable().openapi({
                description: 'share of seasons with at least one epoch in the passage’s window',
              }),
              epochsLost: z.number().openapi({ description: 'mean epochs lost per season' }),
            })
            .strict()
            .openapi('TargetDraws'),
        ),
        assumptions: z.string(),
      })
      .strict(),
  })
  .strict()
  .openapi('SeasonDraws');
