/**
 * Input schemas of every stored entity (units in the names). `…Fields` are the plain objects
 * (their `.partial()` documents PATCH bodies); `…Input` add the cross-field rules.
 */
import { z } from 'zod';
import { BLOCK_ORIGINS, BLOCK_STATUSES } from '../../../db/schema.ts';
import {
  BLOCK_KINDS,
  CORRELATION_FIELD,
  MEASUREMENT_KIND_NAMES,
  MEASURED_COMPONENTS,
  MEASUREMENT_VALUE_FIELDS,
  describeKind,
  fieldsOfKind,
  type MeasuredField,
} from '../../../descriptors/measurement-kinds.ts';
import { ROLE_NAMES } from '../../../descriptors/roles.ts';
import {
  declination,
  epoch,
  freeText,
  id,
  isoDuration,
  latitude,
  lineText,
  localDate,
  longitude,
  name,
  notes,
  rightAscension,
  timeZone,
} from './common.ts';

const optionalNumber = (s: z.ZodNumber) => s.nullable().optional();

export const SystemFields = z.object({
  name,
  raDeg: rightAscension(
    'ICRS right ascension of the primary: degrees [0, 360) as a number, or text (250.3, ' +
      '16h41m12.5s, 16:41:12.5 in hours, 16.69 h)',
  ),
  decDeg: declination(
    'ICRS declination of the primary: degrees as a number, or text (-26.69, -26:41:12, -26°41′12″)',
  ),
  pmRaMasYr: z.number().default(0).describe('proper motion μα* = μα·cos δ, mas/yr'),
  pmDecMasYr: z.number().default(0).describe('proper motion μδ, mas/yr'),
  positionEpoch: epoch
    .default('J2000.0')
    .describe(
      'epoch of raDeg/decDeg (ISO 8601 with zone, JD, MJD, J…, B…); stored as ISO 8601 UTC; default J2000.0',
    ),
  distancePc: optionalNumber(z.number().positive().describe('distance, parsec')),
  massSolar: optionalNumber(
    z.number().positive().describe('mass estimate of the primary, solar masses'),
  ),
  notes,
});

export const TargetFields = z.object({
  systemId: id,
  name,
  magnitude: optionalNumber(z.number().min(-5).max(35).describe('apparent magnitude in `band`')),
  band: lineText(20).nullable().optional(),
  notes,
});

/** The orbit is checked in depth by validateOrbit (422 naming the element); here only its shape. */
export const OrbitShape = z
  .object({
    elements: z
      .record(z.string(), z.unknown())
      .describe('Campbell elements or Thiele–Innes constants (see OrbitInput)'),
    distancePc: z.number().positive().optional(),
    systemicVelocityKmS: z.number().optional(),
    relativity: z.record(z.string(), z.boolean()).optional(),
    relativityFactors: z.record(z.string(), z.number()).optional(),
    massRatio: z
      .number()
      .optional()
      .describe(
        'q = M₂/M₁ of a binary of comparable masses (0 ≤ q ≤ 1000): both bodies’ velocities',
      ),
    lightFraction: z
      .number()
      .optional()
      .describe('β = L₂/(L₁+L₂), the secondary’s share of the light (0 ≤ β ≤ 1): the photocentre'),
    covariance: z
      .object({ parameters: z.array(z.string()), matrix: z.array(z.array(z.number())) })
      .optional(),
  })
  .strict();

export const OrbitSolutionInput = z.object({
  targetId: id,
  orbit: OrbitShape,
  provenance: z.enum(['entered', 'imported', 'fitted']).default('entered'),
  fittedFrom: z.array(id).nullable().optional().describe('measurement ids a fit used'),
  reference: freeText(500).default('').describe('where the solution comes from'),
  notes,
  makeCurrent: z.boolean().default(true).describe('become the target’s current solution'),
});

export const SiteFields = z.object({
  name,
  latitudeDeg: latitude(
    'geodetic latitude, degrees, north positive: a number, or text (-24.6, -24:37:38, -24°37′38″)',
  ),
  longitudeDeg: longitude(
    'longitude, degrees, east positive: a number, or text (-70.4, -70:24:10, -70°24′10″)',
  ).pipe(z.number().max(180, 'must lie in [-180, 180]°, east positive (x − 360 for x past 180)')),
  elevationM: z.number().min(-500).max(6000).describe('elevation above the ellipsoid, metres'),
  timeZone,
  longitudeZoneConfirmed: z
    .boolean()
    .default(false)
    .describe(
      'the longitude and the time zone disagree by more than 3 h, and that is meant; otherwise ' +
        'such a site is refused with the likely correction',
    ),
  lowestAltitudeDeg: z
    .number()
    .min(0)
    .max(89)
    .default(30)
    .describe('lowest usable altitude, degrees'),
  leastSunDistanceDeg: z
    .number()
    .min(0)
    .max(180)
    .default(45)
    .describe('closest allowed angle to the Sun, degrees'),
  pressureHpa: optionalNumber(
    z.number().min(300).max(1100).describe('typical pressure for refraction, hPa'),
  ),
  temperatureC: optionalNumber(
    z.number().min(-60).max(50).describe('typical night temperature, °C'),
  ),
  humidityPct: optionalNumber(
    z.number().min(0).max(100).describe('typical relative humidity for refraction, %; null: 50'),
  ),
  wavelengthUm: optionalNumber(
    z
      .number()
      .min(0.3)
      .max(100)
      .describe(
        'wavelength observed, for refraction, µm (V band 0.55, J 1.25, H 1.65, K 2.2); null: 2.2, the K band',
      ),
  ),
  // Shape only here; ranges and repeated azimuths are the sky engine's validateSite rules (422).
  horizonMask: z
    .array(
      z
        .object({
          azimuthDeg: z.number().describe('degrees from north through east, [0, 360)'),
          altitudeDeg: z
            .number()
            .describe('lowest usable refracted altitude there, degrees, [−5, 90)'),
        })
        .strict(),
    )
    .max(720)
    .default([])
    .describe(
      'azimuth-dependent horizon, interpolated linearly and wrapping through north; empty for a flat horizon',
    ),
  laserGuideStar: z.boolean().default(false).describe('the site runs a laser guide star'),
  // The site's precision model (plan/precision.ts): σ = zenith σ × (seeing / reference) × X^0.6.
  astrometrySigmaMas: optionalNumber(
    z
      .number()
      .positive()
      .max(1e6)
      .describe(
        'expected 1σ of each astrometric offset at the zenith, mas; null: the default 1 mas (a ' +
          'campaign’s precision overrides it)',
      ),
  ),
  spectroscopySigmaKmS: optionalNumber(
    z
      .number()
      .positive()
      .max(1e6)
      .describe(
        'expected 1σ of a radial velocity at the zenith, km/s; null: the default 5 km/s (a ' +
          'campaign’s precision overrides it)',
      ),
  ),
  referenceSeeingArcsec: optionalNumber(
    z
      .number()
      .positive()
      .max(10)
      .describe(
        'seeing FWHM the two zenith values hold for, arcsec; null: they hold for whatever seeing the night has',
      ),
  ),
  notes,
});

const minutesPerBlock = z.number().positive().max(720);
const perKind = <T extends z.ZodType>(v: T) =>
  z.object({ astrometry: v.optional(), spectroscopy: v.optional() }).strict();
const repeat = z
  .union([
    z.enum(['single', 'fill']),
    z
      .object({
        step: isoDuration(
          { atLeast: 'PT30M', atMost: 'PT12H' },
          'ISO 8601 duration between epochs, PT30M to PT12H, e.g. PT2H',
        ),
      })
      .strict(),
  ])
  .describe('epochs per night in a periapsis window: one, as many as fit, or one per step');

export const CampaignFields = z.object({
  name,
  startDate: localDate,
  endDate: localDate,
  goals: z
    .object({
      cadenceDays: z
        .number()
        .positive()
        .describe('wanted interval between epochs of a target, days'),
      wavelengthUm: z
        .number()
        .min(0.3)
        .max(100)
        .optional()
        .describe(
          'wavelength the campaign observes at, µm, for refraction (V 0.55, J 1.25, H 1.65, K ' +
            '2.2); absent: each site’s own; it overrides theirs',
        ),
      densifiedCadenceDays: z
        .number()
        .positive()
        .optional()
        .describe('interval near periapsis, days'),
      densifyWithinDays: z
        .number()
        .positive()
        .optional()
        .describe('how close to periapsis the dense cadence applies, days'),
      kinds: z.array(z.enum(BLOCK_KINDS)).min(1),
      blockMinutes: perKind(minutesPerBlock).optional().describe('block length per kind, minutes'),
      laserGuideStar: perKind(z.boolean())
        .optional()
        .describe('laser guide star use per kind where a site has one; absent: none'),
      periapsisRepeat: repeat.optional(),
      relativityGoal: z
        .boolean()
        .optional()
        .describe(
          'also choose epochs that most tighten the redshift and precession factors of targets ' +
            'with those terms on; default false',
        ),
      periapsisWindowSigma: z
        .number()
        .min(0.1)
        .max(10)
        .optional()
        .describe('half-width of the periapsis window in σ of the passage date; default 2'),
      coverageWithinDays: z
        .number()
        .min(0.01)
        .max(30)
        .optional()
        .describe('an epoch this close to the passage date (days) covers it; default 1'),
      precision: z
        .object({
          astrometryMas: z.number().positive().max(1e6).optional(),
          spectroscopyKmS: z.number().positive().max(1e6).optional(),
          referenceSeeingArcsec: z.number().positive().max(10).optional(),
        })
        .strict()
        .optional()
        .describe('expected 1σ at the zenith (mas, km/s) for a reference seeing (arcsec)'),
      targets: z
        .record(
          z.string().regex(/^[1-9]\d*$/, 'must be a target id'),
          z
            .object({
              priority: z.number().positive().max(1000).optional(),
              cadenceDays: z.number().positive().max(3650).optional(),
              blockMinutes: perKind(minutesPerBlock).optional(),
              laserGuideStar: perKind(z.boolean()).optional(),
              periapsisRepeat: repeat.optional(),
            })
            .strict(),
        )
        .optional()
        .describe('per-target settings by target id; each defaults to the campaign’s'),
    })
    .strict(),
  limits: z
    .object({
      highestAirmass: z.number().min(1).max(10).optional(),
      leastMoonDistanceDeg: z.number().min(0).max(180).optional(),
      darkness: z.enum(['civil', 'nautical', 'astronomical']).optional(),
    })
    .strict()
    .default({}),
  targetIds: z.array(id).default([]),
  siteIds: z.array(id).default([]),
  notes,
});
export const CampaignInput = CampaignFields.refine((c) => c.endDate >= c.startDate, {
  message: 'must not be before startDate',
  path: ['endDate'],
});

export const NightFields = z.object({
  siteId: id,
  campaignId: id.nullable().optional(),
  date: localDate,
  semester: lineText(40)
    .trim()
    .default('')
    .describe('label of the allocation the night came with (a semester, a run); empty when none'),
  notes,
});

export const BlockFields = z.object({
  nightId: id,
  targetId: id,
  kind: z.enum(BLOCK_KINDS),
  startUtc: epoch.describe('start, ISO 8601 UTC'),
  endUtc: epoch.describe('end, ISO 8601 UTC'),
  status: z.enum(BLOCK_STATUSES).default('planned'),
  laserGuideStar: z.boolean().default(false),
  pinned: z
    .boolean()
    .default(false)
    .describe('a person fixed this block where it is: no accepted plan replaces it'),
  overlapReason: freeText(500)
    .trim()
    .min(1)
    .nullable()
    .optional()
    .describe(
      'why this block may overlap another block of its site (two instruments, a shared field); ' +
        'without it an overlap is refused',
    ),
  notes,
});
/** The store's own input adds who made the block; over HTTP and the CLI that is always a person (`by-hand`). */
export const BlockInput = BlockFields.extend({ origin: z.enum(BLOCK_ORIGINS).default('by-hand') });

export const OutcomeInput = z.object({
  blockId: id,
  status: z.enum(BLOCK_STATUSES),
  exposureMinutes: optionalNumber(z.number().min(0).max(1440)),
  notes,
});

export const NightReportFields = z.object({
  nightId: id,
  seeingArcsec: optionalNumber(
    z.number().positive().max(20).describe('seeing FWHM at zenith, arcsec'),
  ),
  strehlRatio: optionalNumber(
    z.number().min(0).max(1).describe('adaptive-optics Strehl ratio, 0–1'),
  ),
  cloudCoverPct: optionalNumber(z.number().min(0).max(100)),
  humidityPct: optionalNumber(z.number().min(0).max(100)),
  windMS: optionalNumber(z.number().min(0).max(100).describe('wind speed, m/s')),
  temperatureC: optionalNumber(z.number().min(-60).max(50)),
  timeLostHours: z.number().min(0).max(24).default(0),
  timeLostReason: freeText(2000).default(''),
  notes,
  outcomes: z.array(OutcomeInput).default([]),
});

/** The value, uncertainty and correlation fields of every measurement kind, from its descriptor. */
function measuredFields(): Record<string, z.ZodType> {
  const shape: Record<string, z.ZodType> = {};
  const kinds = MEASUREMENT_KIND_NAMES.map(describeKind);
  for (const v of kinds.flatMap((d) => d.values)) {
    let n = z.number();
    if (v.min !== undefined) n = n.min(v.min);
    if (v.below !== undefined) n = n.lt(v.below);
    if (v.max !== undefined) n = n.max(v.max);
    shape[v.field] = optionalNumber(v.description ? n.describe(v.description) : n);
    const r = v.sigmaRange;
    shape[v.sigma] = optionalNumber(z.number().min(r.min).max(r.max).describe(r.description));
  }
  shape[CORRELATION_FIELD] = optionalNumber(
    z.number().min(-1).max(1).describe('correlation of the two astrometric errors'),
  );
  // Table order (db/schema.ts, the CSV layout): the descriptor's, not the loop's.
  return Object.fromEntries(MEASUREMENT_VALUE_FIELDS.map((f) => [f, shape[f]!]));
}

export const MeasurementFields = z.object({
  targetId: id,
  blockId: id.nullable().optional(),
  kind: z
    .enum(MEASUREMENT_KIND_NAMES)
    .describe('offsets Δα*, Δδ; separation and position angle; or radial velocity'),
  component: z
    .enum(MEASURED_COMPONENTS)
    .default('relative')
    .describe(
      'which body: "relative" (the secondary relative to the primary; a velocity with the primary ' +
        'at rest), or for a radial velocity "primary" / "secondary" about the barycentre',
    ),
  epoch,
  ...(measuredFields() as Record<MeasuredField, z.ZodOptional<z.ZodNullable<z.ZodNumber>>>),
  instrument: lineText(120).trim().min(1),
  notes,
});

/** A kind's own fields are required, other kinds' fields refused; `correlation` only where the kind has it. */
export const MeasurementInput = MeasurementFields.superRefine((m, ctx) => {
  const values = m as Record<string, unknown>;
  const present = (f: string) => values[f] !== undefined && values[f] !== null;
  const own = new Set(fieldsOfKind(m.kind));
  for (const kind of MEASUREMENT_KIND_NAMES) {
    for (const f of kind === m.kind ? [] : fieldsOfKind(kind)) {
      if (!own.has(f) && present(f))
        ctx.addIssue({ code: 'custom', path: [f], message: `does not belong to kind "${m.kind}"` });
    }
  }
  for (const f of own)
    if (!present(f))
      ctx.addIssue({ code: 'custom', path: [f], message: `is required for kind "${m.kind}"` });
  const components: readonly string[] = describeKind(m.kind).components;
  if (!components.includes(m.component))
    ctx.addIssue({
      code: 'custom',
      path: ['component'],
      message:
        `must be ${components.map((c) => JSON.stringify(c)).join(', ')} for kind "${m.kind}` +
        `" (positions are of the secondary relative to the primary)`,
    });
  if (!describeKind(m.kind).correlated && present(CORRELATION_FIELD)) {
    ctx.addIssue({
      code: 'custom',
      path: [CORRELATION_FIELD],
      message: 'applies to astrometric kinds only',
    });
  }
});

export const UserInput = z.object({
  name: lineText(80).trim().min(1),
  role: z.enum(ROLE_NAMES),
});
export type Role = z.infer<typeof UserInput>['role'];
