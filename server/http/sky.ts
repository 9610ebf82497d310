/**
 * Stateless sky endpoints: POST /sky/night (one night at one site: Sun, twilights, Moon, windows,
 * curves) and POST /sky/season (observable hours per night across a year). Sites come inline; zod
 * checks shapes (400), the sky engine checks ranges and rules (422 naming field, value and rule).
 */
import type { Runner } from '../jobs/tasks.ts';
import { OpenAPIHono, createRoute, z } from '@hono/zod-openapi';
import { InputError, requireFinite } from '../science/errors.ts';
import { parseDurationMinutes } from '../science/time/index.ts';
import {
  AIRMASS_FORMULAS,
  NIGHT_CURVE_STEP,
  NIGHT_STEP,
  SEASON_STEP,
  parseNightDate,
  validateLimits,
  validateSite,
  validateTarget,
  type Site,
  type Target,
} from '../science/sky/index.ts';
import { OrbitSchema } from './schemas/orbit.ts';
import { computeErrorResponses as errors, json } from './schemas/responses.ts';
import { NightReportSchema, SeasonReportSchema } from './schemas/sky-output.ts';
import { validationHook } from './validation.ts';

/** A coordinate: degrees as a JSON number, or text in a form of README's "Input forms" (read by the sky engine). */
const numberOrText = z.union([z.number(), z.string()]);

export const SiteSchema = z
  .object({
    name: z.string().optional(),
    latitudeDeg: numberOrText.openapi({
      description: 'geodetic latitude, degrees, north positive; a number or text (-24:37:38)',
    }),
    longitudeDeg: numberOrText.openapi({
      description: 'longitude, degrees east; a number or text (-70°24′10″)',
    }),
    elevationM: z.number().openapi({ description: 'height above sea level, m' }),
    timeZone: z.string().openapi({ description: 'IANA time zone', example: 'America/Santiago' }),
    longitudeZoneConfirmed: z
      .boolean()
      .optional()
      .openapi({
        description:
          'the longitude and the zone disagree by more than 3 h, and that is meant (otherwise ' +
          'refused with the likely correction)',
      }),
    pressureHpa: z.number().optional().openapi({
      description:
        'air pressure, hPa (default: standard atmosphere at the elevation; 0: no refraction)',
    }),
    temperatureC: z
      .number()
      .optional()
      .openapi({ description: 'air temperature, °C (default: standard atmosphere)' }),
    humidityPct: z
      .number()
      .optional()
      .openapi({ description: 'relative humidity for refraction, % (default 50)' }),
    wavelengthUm: z.number().optional().openapi({
      description: 'wavelength observed, for refraction, µm (default 2.2, the K band)',
    }),
    lowestAltitudeDeg: z
      .number()
      .optional()
      .openapi({ description: 'lowest pointing altitude, degrees (default 0)' }),
    horizonMask: z
      .array(z.object({ azimuthDeg: z.number(), altitudeDeg: z.number() }).strict())
      .optional()
      .openapi({
        description:
          'lowest usable altitude (degrees) by azimuth (degrees from north through east), interpolated',
      }),
    leastSunDistanceDeg: z
      .number()
      .optional()
      .openapi({ description: 'closest approach to the Sun, degrees (default 45)' }),
  })
  .strict()
  .openapi('Site');

export const SkyTargetSchema = z
  .object({
    name: z.string(),
    raDeg: numberOrText.openapi({
      description:
        "ICRS right ascension at epoch (the primary's when an orbit is given): degrees as a " +
        'number, or text (250.3, 16.69 h, 16:41:12.5 in hours)',
    }),
    decDeg: numberOrText.openapi({
      description: 'ICRS declination at epoch: degrees as a number, or text (-26.69, -26:41:12)',
    }),
    pmRaMasYr: z
      .number()
      .optional()
      .openapi({ description: 'proper motion μα* = μα·cos δ, mas/yr' }),
    pmDecMasYr: z.number().optional().openapi({ description: 'proper motion μδ, mas/yr' }),
    epoch: z
      .string()
      .optional()
      .openapi({ description: 'epoch of the position (default J2000.0)' }),
    orbit: OrbitSchema.optional().openapi({
      description: "the star's orbit about the primary: its offset is added on each date",
    }),
  })
  .strict()
  .openapi('SkyTarget');

export const LimitsSchema = z
  .object({
    darkness: z
      .union([z.enum(['civil', 'nautical', 'astronomical']), z.number()])
      .optional()
      .openapi({
        description: 'twilight kind, or highest solar altitude in degrees (default astronomical)',
      }),
    lowestAltitudeDeg: z.number().optional(),
    highestAirmass: z
      .number()
      .optional()
      .openapi({ description: 'default 2 unless lowestAltitudeDeg is given' }),
    airmassFormula: z.enum(AIRMASS_FORMULAS).optional(),
    leastMoonDistanceDeg: z
      .number()
      .optional()
      .openapi({ description: 'applies while the Moon is up; default 30' }),
    leastSunDistanceDeg: z.number().optional().openapi({ description: "overrides the site's" }),
    useHorizonMask: z.boolean().optional(),
    zenithSeeingArcsec: z.number().optional().openapi({
      description:
        "zenith seeing FWHM, arcsec: the seeing at each window's best airmass is reported",
    }),
  })
  .strict()
  .openapi('Limits');

const NightRequest = z
  .object({
    site: SiteSchema,
    date: z.string().openapi({
      description: 'local date on which the evening falls, YYYY-MM-DD',
      example: '2027-06-15',
    }),
    targets: z.array(SkyTargetSchema).max(200),
    limits: LimitsSchema.optional(),
    method: z.enum(['fast', 'exact']).optional().openapi({
      description: 'fast (default) or exact (astronomy-engine per instant, at most 20 targets)',
    }),
    step: z.string().optional().openapi({
      description:
        'window search step, ISO 8601 duration up to PT30M; default PT5M (edges refined to 1 s)',
      example: 'PT5M',
    }),
    curveStep: z.string().optional().openapi({
      description: 'curve step, ISO 8601 duration up to PT1H; PT0S for no curves; default PT10M',
      example: 'PT10M',
    }),
  })
  .strict();

const SeasonRequest = z
  .object({
    site: SiteSchema,
    year: z.number().int(),
    targets: z.array(SkyTargetSchema).max(500),
    limits: LimitsSchema.optional(),
    step: z.string().optional().openapi({
      description: 'darkness sampling step, ISO 8601 duration from PT1M to PT1H; default PT5M',
      example: 'PT5M',
    }),
    minHoursPerNight: z
      .number()
      .optional()
      .openapi({ description: 'hours that make a night usable; default 1' }),
    maxGapNights: z
      .number()
      .int()
      .optional()
      .openapi({ description: 'unusable nights bridged inside a season; default 7' }),
  })
  .strict();

const nightRoute = createRoute({
  method: 'post',
  path: '/sky/night',
  summary:
    "One night at a site: Sun, twilights, darkness, Moon, and each target's windows and altitude curve",
  request: { body: { content: { 'application/json': { schema: NightRequest } }, required: true } },
  responses: {
    200: json(NightReportSchema, "the night report; times in UTC and in the site's zone"),
    ...errors,
  },
});

const seasonRoute = createRoute({
  method: 'post',
  path: '/sky/season',
  summary:
    "Observable hours per night across a year, with each target's season start, end and best night",
  request: { body: { content: { 'application/json': { schema: SeasonRequest } }, required: true } },
  responses: { 200: json(SeasonReportSchema, 'the season map'), ...errors },
});

function inRange(
  field: string,
  value: number | undefined,
  lo: number,
  hi: number,
  loOpen = false,
): number | undefined {
  if (value === undefined) return undefined;
  const x = requireFinite(field, value);
  if ((loOpen ? x <= lo : x < lo) || x > hi)
    throw new InputError(field, value, `must lie in ${loOpen ? '(' : '['}${lo}, ${hi}]`);
  return x;
}

/** Site and targets of a request, validated (every target before any work). */
function siteAndTargets(body: { site: unknown; targets: unknown[] }): {
  site: Site;
  targets: Target[];
} {
  const site = validateSite(body.site, 'site');
  const targets = body.targets.map((t, i) => validateTarget(t, `targets.${i}`));
  const seen = new Set<string>();
  targets.forEach((t, i) => {
    if (seen.has(t.name))
      throw new InputError(`targets.${i}.name`, t.name, 'must be unique within the request');
    seen.add(t.name);
  });
  return { site, targets };
}

export function skyRoutes(run: Runner) {
  const app = new OpenAPIHono({ defaultHook: validationHook });
  app.openapi(nightRoute, async (c) => {
    const body = c.req.valid('json');
    const { site, targets } = siteAndTargets(body);
    parseNightDate(body.date, 'date');
    const limits = validateLimits(body.limits ?? {}, site, 'limits');
    const stepMinutes = parseDurationMinutes(
      body.step ?? NIGHT_STEP.default,
      'step',
      NIGHT_STEP.rule,
    );
    const curveStepMinutes = parseDurationMinutes(
      body.curveStep ?? NIGHT_CURVE_STEP.default,
      'curveStep',
      NIGHT_CURVE_STEP.rule,
    );
    if (body.method === 'exact' && targets.length > 20) {
      throw new InputError(
        'targets',
        `${targets.length} targets`,
        'must number at most 20 with method "exact"',
      );
    }
    const report = await run('nightReport', site, body.date, targets, limits, {
      ...(body.method ? { method: body.method } : {}),
      stepMinutes,
      curveStepMinutes,
    });
    return c.json(report, 200);
  });
  app.openapi(seasonRoute, async (c) => {
    const body = c.req.valid('json');
    const { site, targets } = siteAndTargets(body);
    if (body.year < 1900 || body.year > 2100)
      throw new InputError('year', body.year, 'must lie between 1900 and 2100');
    const limits = validateLimits(body.limits ?? {}, site, 'limits');
    const stepMinutes = parseDurationMinutes(
      body.step ?? SEASON_STEP.default,
      'step',
      SEASON_STEP.rule,
    );
    const minHoursPerNight = inRange('minHoursPerNight', body.minHoursPerNight, 0, 24);
    const maxGapNights = inRange('maxGapNights', body.maxGapNights, 0, 60);
    const report = await run('seasonReport', site, body.year, targets, limits, {
      stepMinutes,
      ...(minHoursPerNight === undefined ? {} : { minHoursPerNight }),
      ...(maxGapNights === undefined ? {} : { maxGapNights }),
    });
    return c.json(report, 200);
  });
  return app;
}
