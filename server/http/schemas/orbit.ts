/**
 * Request schemas for orbits and epochs. zod checks shapes and types (400 on failure); the orbit
 * engine's validateOrbit checks ranges and rules (422 naming field, value and rule), so each rule
 * is written once.
 */
import { z } from '@hono/zod-openapi';
import { COVARIANCE_PARAMETERS, THIELE_INNES_PARAMETERS } from '../../science/orbit/index.ts';
import { EVENT_KINDS } from '../../science/orbit/index.ts';

const epoch = z.string().openapi({
  description: 'ISO 8601 with zone, "JD …", "MJD …", "J2027.35" or "B1934.008"',
  example: '2027-03-01T00:00:00Z',
});

export const CampbellSchema = z
  .object({
    kind: z.literal('campbell').optional(),
    periodYears: z.number().openapi({ description: 'period P, Julian years' }),
    periapsis: epoch.openapi({ description: 'epoch of periapsis T' }),
    eccentricity: z.number(),
    semiMajorAxisArcsec: z.number().openapi({ description: 'angular semi-major axis a, arcsec' }),
    inclinationDeg: z.number(),
    ascendingNodeDeg: z
      .number()
      .openapi({ description: 'Ω, deg; the node where the star recedes' }),
    argPeriapsisDeg: z.number().openapi({ description: 'ω, deg' }),
  })
  .strict()
  .openapi('CampbellElements');

export const ThieleInnesSchema = z
  .object({
    kind: z.literal('thiele-innes'),
    periodYears: z.number(),
    periapsis: epoch,
    eccentricity: z.number(),
    aArcsec: z.number(),
    bArcsec: z.number(),
    fArcsec: z.number(),
    gArcsec: z.number(),
  })
  .strict()
  .openapi('ThieleInnesElements');

export const OrbitSchema = z
  .object({
    elements: z.union([ThieleInnesSchema, CampbellSchema]),
    distancePc: z.number().optional().openapi({ description: 'distance, parsec' }),
    systemicVelocityKmS: z
      .number()
      .optional()
      .openapi({ description: 'systemic velocity γ, km/s' }),
    relativity: z
      .object({
        romer: z.boolean().optional(),
        gravitationalRedshift: z.boolean().optional(),
        transverseDoppler: z.boolean().optional(),
        precession: z.boolean().optional(),
      })
      .strict()
      .optional(),
    relativityFactors: z
      .object({
        redshiftFactor: z.number().optional(),
        precessionFactor: z.number().optional(),
      })
      .strict()
      .optional()
      .openapi({
        description:
          'scale factors of the switched-on terms: 0 Newtonian, 1 general relativity (default)',
      }),
    massRatio: z.number().optional().openapi({
      description:
        'q = M₂/M₁ of a binary of comparable masses, 0 ≤ q ≤ 1000: predictions give each body’s velocity',
    }),
    lightFraction: z.number().optional().openapi({
      description:
        'β = L₂/(L₁+L₂), the secondary’s share of the light, 0 ≤ β ≤ 1: with q, the photocentre',
    }),
    covariance: z
      .object({
        parameters: z.array(z.enum([...COVARIANCE_PARAMETERS, ...THIELE_INNES_PARAMETERS])),
        matrix: z.array(z.array(z.number())),
      })
      .strict()
      .optional()
      .openapi({
        description:
          'covariance in the units of the parameter names (periapsisDays: T in days); with Thiele–Innes ' +
          'elements it may name aArcsec, bArcsec, fArcsec, gArcsec instead of a, i, Ω, ω, and is stored ' +
          'carried to those by first-order propagation',
      }),
  })
  .strict()
  .openapi('Orbit');

export const EpochRangeSchema = z
  .object({
    start: epoch,
    end: epoch,
    step: z.string().openapi({
      description: 'ISO 8601 duration between epochs, e.g. "P30D", "PT6H", "P1DT12H"',
      example: 'P30D',
    }),
  })
  .strict();

export const MonteCarloSchema = z
  .object({ draws: z.number().int(), seed: z.number().int() })
  .strict()
  .openapi({ description: 'Monte Carlo percentiles from seeded draws of the covariance' });

export const EpochSchema = epoch;
export const EventKindSchema = z.enum(EVENT_KINDS);
