/**
 * The orbit as users give it (input types, interface units) and as the engine uses it (internal units).
 * Interface: degrees, arcsec, years, epochs as strings. Inside: radians, mas, days, Julian Dates.
 */

/** Campbell elements of the relative orbit of a star about its primary. */
export interface CampbellInput {
  kind?: 'campbell';
  /** Period P, Julian years, > 0. */
  periodYears: number;
  /** Epoch of periapsis T: ISO 8601, "JD …", "MJD …", "J2027.35" or "B1934.008". */
  periapsis: string;
  /** Eccentricity e, 0 ≤ e < 1. */
  eccentricity: number;
  /** Angular semi-major axis a, arcsec, > 0. */
  semiMajorAxisArcsec: number;
  /** Inclination i, degrees, 0 ≤ i ≤ 180 (i > 90: clockwise on the sky). */
  inclinationDeg: number;
  /** Position angle of the ascending node Ω (where the star recedes), degrees, normalised to [0, 360). */
  ascendingNodeDeg: number;
  /** Argument of periapsis ω from the ascending node, degrees, normalised to [0, 360). */
  argPeriapsisDeg: number;
}

/** Thiele–Innes constants (arcsec) with P, T, e: Δδ = A·X + F·Y, Δα* = B·X + G·Y. */
export interface ThieleInnesInput {
  kind: 'thiele-innes';
  periodYears: number;
  periapsis: string;
  eccentricity: number;
  aArcsec: number;
  bArcsec: number;
  fArcsec: number;
  gArcsec: number;
}

export type ElementsInput = CampbellInput | ThieleInnesInput;

/** Which relativistic terms a prediction includes. All off by default (the usual case for binaries). */
export interface RelativitySwitches {
  /** Light-travel time across the orbit (observed time = emission time + z/c). */
  romer: boolean;
  /** Gravitational redshift GM/(rc) added to the radial velocity. */
  gravitationalRedshift: boolean;
  /** Transverse (second-order) Doppler shift v²/(2c) added to the radial velocity. */
  transverseDoppler: boolean;
  /**
   * Schwarzschild precession of ω, Δω = 6πGM/(c²a(1−e²)) per orbit, applied with the angle swept:
   * ω = ω₀ + Δω·ν_total/2π, ν_total the true anomaly counted on across orbits from the passage T.
   */
  precession: boolean;
}

/**
 * Scale factors of the relativistic terms (DESIGN.md): 0 Newtonian, 1 general relativity. They act
 * only on terms that are switched on. Default 1.
 */
export interface RelativityFactors {
  /** Scales the gravitational redshift and the transverse Doppler shift together. */
  redshiftFactor: number;
  /** Scales the Schwarzschild periapsis advance Δω. */
  precessionFactor: number;
}

/** Parameters a covariance matrix may cover, in these units. */
export const COVARIANCE_PARAMETERS = [
  'periodYears',
  'periapsisDays',
  'eccentricity',
  'semiMajorAxisArcsec',
  'inclinationDeg',
  'ascendingNodeDeg',
  'argPeriapsisDeg',
  'distancePc',
  'systemicVelocityKmS',
  'massRatio',
  'lightFraction',
] as const;
export type CovarianceParameter = (typeof COVARIANCE_PARAMETERS)[number];
/**
 * Thiele–Innes constants, arcsec, which a covariance may name when the elements are Thiele–Innes
 * constants; validateOrbit carries such a covariance to a, i, Ω, ω (thiele-innes-covariance.ts).
 */
export const THIELE_INNES_PARAMETERS = ['aArcsec', 'bArcsec', 'fArcsec', 'gArcsec'] as const;
export type ThieleInnesParameter = (typeof THIELE_INNES_PARAMETERS)[number];

export interface CovarianceInput {
  /**
   * Names of the rows/columns, each once, from COVARIANCE_PARAMETERS (periapsisDays: T in days),
   * or with Thiele–Innes elements also THIELE_INNES_PARAMETERS in place of a, i, Ω, ω.
   */
  parameters: (CovarianceParameter | ThieleInnesParameter)[];
  /** Symmetric positive semi-definite matrix in the parameters' units. */
  matrix: number[][];
}

export interface OrbitInput {
  elements: ElementsInput;
  /** Distance to the system, parsec, > 0. Needed for physical sizes, radial velocity and relativity. */
  distancePc?: number;
  /** Systemic (primary's) radial velocity γ, km/s. Default 0. */
  systemicVelocityKmS?: number;
  relativity?: Partial<RelativitySwitches>;
  /** Scale factors of the switched-on terms; default 1 (general relativity). */
  relativityFactors?: Partial<RelativityFactors>;
  /**
   * Mass ratio q = M₂/M₁ of a binary of comparable masses, 0 ≤ q ≤ 1000. With it (and a distance)
   * each body's velocity about the barycentre is predicted; absent: the primary is taken at rest.
   */
  massRatio?: number;
  /**
   * Fraction of the pair's light from the secondary, β = L₂/(L₁+L₂), 0 ≤ β ≤ 1, in the band of the
   * astrometry. With the mass ratio it places the photocentre of an unresolved pair.
   */
  lightFraction?: number;
  covariance?: CovarianceInput;
}

export interface Covariance {
  parameters: CovarianceParameter[];
  /** Row-major, n×n. */
  matrix: number[][];
}

/** A validated orbit in internal units. Immutable by convention: derive new ones with `withParameter`. */
export interface Orbit {
  periodDays: number;
  periapsisJd: number;
  e: number;
  aMas: number;
  iRad: number;
  nodeRad: number;
  argRad: number;
  distancePc: number | null;
  gammaKmS: number;
  relativity: RelativitySwitches;
  factors: RelativityFactors;
  /** q = M₂/M₁, or null when the primary is taken at rest (no mass ratio known). */
  massRatio: number | null;
  /** β = L₂/(L₁+L₂), or null when not known. */
  lightFraction: number | null;
  covariance: Covariance | null;
}
