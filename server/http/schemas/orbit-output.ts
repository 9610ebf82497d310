/**
 * Response schemas of the orbit engine's answers: the orbit in both element forms with its
 * physical quantities, ephemeris rows with their uncertainties, and events. Units as in
 * server/science/orbit/ (JSON turns a NaN into null).
 */
import { z } from '@hono/zod-openapi';
import { EVENT_KINDS, PERCENTILES } from '../../science/orbit/index.ts';
import { CampbellSchema, ThieleInnesSchema } from './orbit.ts';

const num = (description: string) => z.number().openapi({ description });
const orNull = (description: string) => z.number().nullable().openapi({ description });

export const PhysicalSchema = z
  .object({
    semiMajorAxisAu: z.number(),
    massSolar: num(
      'mass by Kepler’s third law, M☉: the primary’s, or a binary’s total (M₁ + M₂) when the orbit has a mass ratio',
    ),
    schwarzschildRadiusAu: z.number(),
    schwarzschildRadiusKm: z.number(),
    periapsisAu: z.number(),
    periapsisSchwarzschildRadii: z.number(),
    apoapsisAu: z.number(),
    periapsisSpeedKmS: z.number(),
    periapsisSpeedFractionC: num('periapsis speed over c'),
    semiAmplitudeKmS: num('radial-velocity semi-amplitude K, km/s'),
    precessionArcminPerOrbit: num('Schwarzschild precession, arcmin per orbit'),
    gravitationalRedshiftAtPeriapsisKmS: z.number(),
    transverseDopplerAtPeriapsisKmS: z.number(),
    romerDelayRangeDays: num(
      'range of the Rømer delay over the orbit (nearest to farthest point on the line of sight), days',
    ),
    largestRomerDelayDays: num('largest Rømer delay over the orbit (farthest point), days'),
  })
  .strict()
  .openapi('PhysicalQuantities');

export const RelativitySwitchesSchema = z
  .object({
    romer: z.boolean(),
    gravitationalRedshift: z.boolean(),
    transverseDoppler: z.boolean(),
    precession: z.boolean(),
  })
  .strict()
  .openapi('RelativitySwitches');

export const BinarySchema = z
  .object({
    massRatio: num('q = M₂/M₁'),
    lightFraction: orNull('β = L₂/(L₁+L₂), the secondary’s share of the light; null if not known'),
    primaryMassSolar: orNull('M₁ = M/(1+q), M☉; null without a distance'),
    secondaryMassSolar: orNull('M₂ = qM/(1+q), M☉; null without a distance'),
    primarySemiAmplitudeKmS: orNull('K₁ = K·q/(1+q), km/s; null without a distance'),
    secondarySemiAmplitudeKmS: orNull('K₂ = K/(1+q), km/s; null without a distance'),
  })
  .strict()
  .openapi('BinaryQuantities');

export const OrbitDescriptionSchema = z
  .object({
    campbell: CampbellSchema,
    thieleInnes: ThieleInnesSchema,
    physical: PhysicalSchema.nullable().openapi({ description: 'null without a distance' }),
    relativity: RelativitySwitchesSchema,
    relativityFactors: z
      .object({ redshiftFactor: z.number(), precessionFactor: z.number() })
      .strict()
      .openapi({ description: 'scale factors of the switched-on terms (1: general relativity)' }),
    binary: BinarySchema.nullable().openapi({
      description: 'a binary of comparable masses (the orbit has a mass ratio); null otherwise',
    }),
  })
  .strict()
  .openapi('OrbitDescription');

export const PredictionSchema = z
  .object({
    epoch: z.string().openapi({ description: 'observed instant, ISO 8601 UTC' }),
    jd: z.number(),
    lightTimeIncluded: z.boolean().openapi({
      description:
        'true: epoch is an observed time, light-time across the orbit (Rømer delay) included',
    }),
    emissionEpoch: z.string().openapi({
      description: 'when the light left the star, ISO 8601 UTC (= epoch without Rømer delay)',
    }),
    emissionJd: z.number(),
    meanAnomalyDeg: z.number(),
    eccentricAnomalyDeg: z.number(),
    trueAnomalyDeg: z.number(),
    dRaMas: num('Δα* = Δα·cos δ, east positive, mas'),
    dDecMas: num('Δδ, north positive, mas'),
    separationMas: z.number(),
    positionAngleDeg: num('north through east, [0, 360) deg'),
    vRaMasYr: z.number(),
    vDecMasYr: z.number(),
    separation3dAu: orNull('null without a distance'),
    speedKmS: orNull('null without a distance'),
    lineOfSightAu: orNull('positive behind the primary, au'),
    radialVelocityKmS: orNull('with γ and every switched-on relativistic term, km/s'),
    keplerianRvKmS: orNull('the Keplerian part alone, km/s'),
    primaryRadialVelocityKmS: orNull(
      'the primary about the barycentre, γ − q/(1+q)·v (Newtonian), km/s; null without a mass ratio or distance',
    ),
    secondaryRadialVelocityKmS: orNull(
      'the secondary about the barycentre, γ + v/(1+q) (Newtonian), km/s; null without a mass ratio or distance',
    ),
    photocentreDRaMas: orNull(
      'Δα* of the unresolved pair’s photocentre from the barycentre, (β − q/(1+q))·Δα*, mas; null without q and β',
    ),
    photocentreDDecMas: orNull(
      'Δδ of the photocentre from the barycentre, mas; null without q and β',
    ),
    romerDelayDays: orNull('size of the term, included only when switched on'),
    gravitationalRedshiftKmS: orNull('size of the term, included only when switched on'),
    transverseDopplerKmS: orNull('size of the term, included only when switched on'),
    precessionDeg: orNull('precession of ω accumulated since T by the angle swept, deg'),
  })
  .strict()
  .openapi('Prediction');

const uncertain = <S extends z.ZodType>(value: S) =>
  z
    .object({
      dRaMas: value.optional(),
      dDecMas: value.optional(),
      separationMas: value.optional(),
      positionAngleDeg: value.optional(),
      radialVelocityKmS: value.optional(),
      primaryRadialVelocityKmS: value.optional(),
      secondaryRadialVelocityKmS: value.optional(),
      photocentreDRaMas: value.optional(),
      photocentreDDecMas: value.optional(),
    })
    .strict();

export const EphemerisRowSchema = PredictionSchema.extend({
  sigma: uncertain(z.number())
    .optional()
    .openapi({ description: 'linear 1σ per quantity (same unit); only with a covariance' }),
  percentiles: uncertain(z.array(z.number()))
    .optional()
    .openapi({ description: `Monte Carlo percentiles ${PERCENTILES.join(', ')}; on request` }),
})
  .strict()
  .openapi('EphemerisRow');

export const OrbitEventSchema = z
  .object({
    kind: z.enum(EVENT_KINDS),
    jd: z.number(),
    epoch: z.string().openapi({ description: 'observed instant, ISO 8601 UTC' }),
    lightTimeIncluded: z
      .boolean()
      .openapi({ description: 'whether epoch includes the Rømer delay' }),
    emissionEpoch: z
      .string()
      .openapi({ description: 'when the light left the star, ISO 8601 UTC' }),
    orbitNumber: num('0 is the orbit whose periapsis is the elements’ T'),
    state: PredictionSchema,
    sigmaDays: num('linear 1σ of the date, days; only with a covariance').optional(),
    percentileEpochs: z
      .array(z.string())
      .optional()
      .openapi({ description: `Monte Carlo percentiles ${PERCENTILES.join(', ')} of the date` }),
    missingDraws: num('draws in which the event had no counterpart').optional(),
  })
  .strict()
  .openapi('OrbitEvent');

export const EphemerisAnswer = z
  .object({ orbit: OrbitDescriptionSchema, predictions: z.array(EphemerisRowSchema) })
  .strict();

export const EventsAnswer = z
  .object({ orbit: OrbitDescriptionSchema, events: z.array(OrbitEventSchema) })
  .strict();
