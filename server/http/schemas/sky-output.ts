/**
 * Response schemas of the sky engine's answers: the night report (Sun, twilights, darkness, Moon,
 * each target's windows and curve) and the season map. Instants come in UTC and in the site's zone.
 */
import { z } from '@hono/zod-openapi';
import { LIMITS, WAVELENGTH_SOURCES } from '../../science/sky/index.ts';

const num = (description: string) => z.number().openapi({ description });

export const InstantSchema = z
  .object({
    utc: z.string().openapi({ description: 'ISO 8601 UTC' }),
    local: z.string().openapi({ description: 'ISO 8601 with the site’s offset' }),
  })
  .strict()
  .openapi('Instant');

export const IntervalSchema = z
  .object({ start: InstantSchema, end: InstantSchema, hours: z.number() })
  .strict()
  .openapi('Interval');

const ReportPoint = InstantSchema.extend({ altitudeDeg: z.number(), airmass: z.number() }).strict();
const LimitSchema = z.enum(LIMITS).openapi({ description: 'the limit that opens or closes it' });

export const SkyWindowSchema = IntervalSchema.extend({
  opensBy: LimitSchema,
  closesBy: LimitSchema,
  transit: ReportPoint.nullable(),
  best: ReportPoint.extend({
    seeingArcsec: z.number().nullable().openapi({ description: 'with zenithSeeingArcsec only' }),
    moonSeparationDeg: z.number(),
  }).strict(),
})
  .strict()
  .openapi('SkyWindow');

export const TargetCurveSchema = z
  .object({
    utc: z.array(z.string()),
    altitudeDeg: z.array(z.number()),
    azimuthDeg: z.array(z.number()),
    airmass: z.array(z.number().nullable()).openapi({ description: 'null below the horizon' }),
    hourAngleDeg: z.array(z.number()),
    parallacticAngleDeg: z.array(z.number()),
    moonSeparationDeg: z.array(z.number()),
    horizonMaskDeg: z
      .array(z.number())
      .optional()
      .openapi({ description: 'with a horizon mask: its altitude at the target’s azimuth, deg' }),
    closedBy: z.array(LimitSchema.nullable()).openapi({
      description:
        'the limit that closes the target at each sample (the windows’ rule), null where open',
    }),
  })
  .strict()
  .openapi('TargetCurve');

export const TargetNightSchema = z
  .object({
    name: z.string(),
    raOfDateDeg: num('apparent place of date at the night’s middle, deg'),
    decOfDateDeg: z.number(),
    observableHours: z.number(),
    windows: z.array(SkyWindowSchema),
    moonSeparationDeg: num('at local solar midnight, deg'),
    sunSeparationDeg: num('at local solar midnight, deg'),
    curve: TargetCurveSchema.nullable().openapi({ description: 'null when no curves were asked' }),
  })
  .strict()
  .openapi('TargetNight');

const Twilight = z
  .object({
    dusk: InstantSchema.nullable(),
    dawn: InstantSchema.nullable(),
    sunAltitudeDeg: z.number(),
  })
  .strict();

export const NightReportSchema = z
  .object({
    site: z
      .object({
        name: z.string(),
        timeZone: z.string(),
        latitudeDeg: z.number(),
        longitudeDeg: z.number(),
        elevationM: z.number(),
        pressureHpa: z.number(),
        temperatureC: z.number(),
        humidityPct: z.number().openapi({ description: 'relative humidity for refraction, %' }),
        wavelengthUm: z
          .number()
          .openapi({ description: 'wavelength refraction is computed at, µm' }),
        wavelengthFrom: z.enum(WAVELENGTH_SOURCES).openapi({
          description:
            'where the wavelength came from: "campaign" (its goals.wavelengthUm, over the ' +
            'site’s), "site" (the site’s own), "default" (2.2 µm, the K band)',
        }),
        refraction: z
          .string()
          .openapi({ description: 'wavelength, humidity, pressure and temperature, in words' }),
      })
      .strict(),
    night: z
      .object({
        date: z.string().openapi({ description: 'local date of the evening, YYYY-MM-DD' }),
        start: InstantSchema,
        end: InstantSchema,
        hours: z.number(),
      })
      .strict(),
    sun: z
      .object({
        set: InstantSchema.nullable(),
        rise: InstantSchema.nullable(),
        midnight: InstantSchema,
        twilights: z
          .object({ civil: Twilight, nautical: Twilight, astronomical: Twilight })
          .strict(),
      })
      .strict(),
    darkness: z
      .object({ limit: z.string(), intervals: z.array(IntervalSchema), hours: z.number() })
      .strict(),
    moon: z
      .object({
        rise: InstantSchema.nullable(),
        set: InstantSchema.nullable(),
        transit: InstantSchema.nullable(),
        illuminatedFraction: z.number(),
        phaseDeg: z.number(),
        curve: z
          .object({ utc: z.array(z.string()), altitudeDeg: z.array(z.number()) })
          .strict()
          .nullable()
          .openapi({ description: 'topocentric altitude of the centre, no refraction, deg' }),
      })
      .strict(),
    limits: z
      .object({
        altitudeLimitDeg: z.number(),
        highestAirmass: z.number().nullable(),
        airmassFormula: z.string(),
        leastMoonDistanceDeg: z.number(),
        leastSunDistanceDeg: z.number(),
        horizonMask: z.boolean(),
      })
      .strict(),
    method: z.enum(['fast', 'exact']),
    targets: z.array(TargetNightSchema),
    cautions: z
      .array(z.string())
      .openapi({ description: 'safety notes; the site’s rules prevail' }),
  })
  .strict()
  .openapi('NightReport');

export const SeasonReportSchema = z
  .object({
    site: z
      .object({
        name: z.string(),
        timeZone: z.string(),
        latitudeDeg: z.number(),
        longitudeDeg: z.number(),
        elevationM: z.number(),
      })
      .strict(),
    year: z.number().int(),
    step: z.string().openapi({ description: 'the darkness sampling step, ISO 8601 duration' }),
    nights: z.array(z.object({ date: z.string(), darkHours: z.number() }).strict()),
    targets: z.array(
      z
        .object({
          name: z.string(),
          season: z
            .object({
              start: z.string().nullable(),
              end: z.string().nullable(),
              wrapsYearEnd: z.boolean(),
              allYear: z.boolean(),
              usableNights: z.number().int(),
              bestNight: z.string().nullable(),
              bestHours: z.number(),
            })
            .strict(),
          periapses: z.array(
            z
              .object({
                epoch: z.string(),
                night: z.string(),
                hours: z.number(),
                inSeason: z.boolean(),
              })
              .strict(),
          ),
          hoursPerNight: z
            .array(z.number())
            .openapi({ description: 'observable hours, one per night of `nights`' }),
        })
        .strict(),
    ),
    evaluations: num('samples × targets evaluated'),
    cautions: z.array(z.string()),
  })
  .strict()
  .openapi('SeasonReport');

export const NightVisibilitySchema = NightReportSchema.extend({
  nightId: z.number().int(),
  campaignId: z.number().int().nullable(),
})
  .strict()
  .openapi('NightVisibility');
