/**
 * What a fit takes and what it returns. Interface units (mas, km/s, degrees, years, epochs as
 * strings or JD) in the inputs and the reported values; internal units live in layout.ts.
 */
import type { MeasuredComponent } from '../../../../descriptors/measurement-kinds.ts';
import type { CampbellInput, RelativityFactors, RelativitySwitches } from '../types.ts';

export type RelativityFactorName = keyof RelativityFactors;

/** A starting orbit: Campbell elements, with the distance and γ when known. */
export interface StartInput {
  elements: CampbellInput;
  distancePc?: number;
  systemicVelocityKmS?: number;
  /** q = M₂/M₁, for a fit with velocities of a body about the barycentre. */
  massRatio?: number;
}

/** An astrometric offset of the star from the primary's reference point. */
export interface OffsetInput {
  kind: 'offsets';
  /** Epoch: ISO 8601, "JD …", "MJD …", "J2027.35", "B1934.008", or a JD number. */
  epoch: string | number;
  /** Δα* = Δα·cos δ, east positive, mas. */
  dRaMas: number;
  /** Δδ, north positive, mas. */
  dDecMas: number;
  sigmaDRaMas: number;
  sigmaDDecMas: number;
  /** Correlation of the Δα* and Δδ errors, −1 < ρ < 1. Default 0. */
  correlation?: number;
  /**
   * `relative` (default): the secondary from the primary. `photocentre`: the unresolved pair's light
   * centre from the barycentre, (β − B)·r with B = q/(1+q), fitted with q and the light fraction β.
   */
  component?: 'relative' | 'photocentre';
  /** The caller's identifier, echoed in the residuals. */
  id?: string;
}

/** An astrometric position as separation and position angle. */
export interface SeparationInput {
  kind: 'separation';
  epoch: string | number;
  separationMas: number;
  /** Position angle, north through east, degrees. */
  positionAngleDeg: number;
  sigmaSeparationMas: number;
  sigmaPositionAngleDeg: number;
  /** Correlation of the ρ and θ errors, −1 < ρ < 1. Default 0. */
  correlation?: number;
  component?: 'relative';
  id?: string;
}

/** A radial velocity of the star, km/s, positive receding. */
export interface VelocityInput {
  kind: 'radial-velocity';
  epoch: string | number;
  radialVelocityKmS: number;
  sigmaRadialVelocityKmS: number;
  /**
   * Whose velocity: `relative` (default; the star with the primary at rest, as around a compact
   * object), or `primary` / `secondary` about the barycentre, fitted with the mass ratio q.
   */
  component?: MeasuredComponent;
  id?: string;
}

export type MeasurementInput = OffsetInput | SeparationInput | VelocityInput;

/** A range or a single value to search around. */
export interface RangeHint {
  min: number;
  max: number;
}

/** Where the global search looks for one star; every field optional. */
export interface StarHints {
  /** Period range, Julian years. Default: half the span of the epochs to twenty spans. */
  periodYears?: RangeHint;
  /** Eccentricity range inside [0, 0.99]. Default: the whole of it. */
  eccentricity?: RangeHint;
  /** An orbit to start from as well as the search's best nodes (e.g. the current solution); the lower χ² wins. */
  start?: StartInput;
  /**
   * Start from `start` alone, without the search: for measurements known to lie close to it (a
   * refit after a few measurements changed). The answer is the minimum LM reaches from there, with
   * its covariance; a start far from the best minimum can end in another one.
   */
  startOnly?: boolean;
}

export interface StarInput {
  /** A short name, unique in the request (letters, digits, - _ .). */
  name: string;
  measurements: MeasurementInput[];
  hints?: StarHints;
  /** This star's relativistic terms, over the request's `relativity` (e.g. its stored solution's). */
  relativity?: Partial<RelativitySwitches>;
}

/** A Gaussian prior on one parameter, in the parameter's interface unit. */
export interface PriorInput {
  mean: number;
  sigma: number;
}

export interface SamplerOptions {
  /** Members of the ensemble, even, ≥ 2 × free parameters. Default: 4 × free parameters. */
  ensembleSize?: number;
  /** Rounds kept (each moves every member once), 100 … 100000. Default 2000. */
  rounds?: number;
  /** Rounds run and thrown away first. Default: rounds / 2. */
  discardRounds?: number;
  /** Seed of the random source; the same seed gives the same percentiles. */
  seed: number;
}

export interface FitRequest {
  stars: StarInput[];
  /** Relativistic terms in the model (all off by default). They need the distance. */
  relativity?: Partial<RelativitySwitches>;
  /**
   * Relativity factors fitted as parameters (fixed at 1 otherwise): `redshiftFactor` scales the
   * gravitational redshift and transverse Doppler shift together (and switches both on),
   * `precessionFactor` the Schwarzschild precession (and switches it on). 0 Newtonian, 1 GR.
   */
  freeFactors?: RelativityFactorName[];
  /**
   * Where `relativity` came from, said in the output (e.g. "the stored solution's switches").
   * Default "the request".
   */
  relativityOrigin?: string;
  /** Fit the primary's offset (x0, y0) and drift (vx, vy) on the sky. Default: neither. */
  frame?: { offset?: boolean; drift?: boolean };
  /** Reference epoch of the frame drift. Default: the mean astrometric epoch. */
  frameEpoch?: string | number;
  /** Parameters held at a value, by reported name (e.g. "distancePc", "Ilex.eccentricity"). */
  fixed?: Record<string, number>;
  /** Gaussian priors, by reported name. */
  priors?: Record<string, PriorInput>;
  /** `huber` downweights residuals beyond 2σ (Huber 1964); default `gaussian`. */
  loss?: 'gaussian' | 'huber';
  /** Derived dates (next periapsis) are counted from here. Default: the latest epoch. */
  asOf?: string | number;
  /** Posterior sampling by an affine-invariant ensemble (Goodman & Weare 2010). */
  posterior?: SamplerOptions;
}

/** One fitted parameter in its interface unit. */
export interface FittedParameter {
  name: string;
  value: number;
  /** 1σ from the covariance; 0 for a fixed parameter. */
  sigma: number;
  unit: string;
  fixed: boolean;
  /** Posterior percentiles (2.5, 16, 50, 84, 97.5) when the sampler ran. */
  percentiles?: number[];
}

/** The residual of one measurement: observed − model, in the measurement's units and in σ. */
export interface Residual {
  star: string;
  index: number;
  id?: string;
  kind: MeasurementInput['kind'];
  /** Which body the measurement is of. */
  component: MeasuredComponent;
  jd: number;
  epoch: string;
  /** Observed − model per component: [Δα*, Δδ] mas, [ρ mas, θ deg], or [v km/s]. */
  residual: number[];
  /** Residual / σ per component (without the correlation). */
  normalized: number[];
  /** |whitened residual| > 5 in any component. */
  outlier: boolean;
}

export interface DerivedQuantity {
  name: string;
  value: number;
  sigma: number;
  unit: string;
  percentiles?: number[];
}

/** A fitted relativity factor: its value, σ, and how far it departs from 0 and from 1 in σ. */
export interface FactorTest {
  name: RelativityFactorName;
  value: number;
  sigma: number;
  /** |value|/σ: the significance of the effect's detection (departure from Newtonian 0). */
  detectionSigma: number;
  /** |value − 1|/σ: the departure from general relativity. */
  departureFromGrSigma: number;
}

/** Which relativistic terms a fit had on, why, and the factors (fitted ones with their tests). */
export interface RelativitySettings {
  terms: RelativitySwitches;
  /** Per term: "on" or "off", and why (for the request as a whole). */
  reasons: Record<keyof RelativitySwitches, string>;
  /** Each star's own terms and reasons (a joint fit respects each star's switches). */
  stars: {
    name: string;
    terms: RelativitySwitches;
    reasons: Record<keyof RelativitySwitches, string>;
  }[];
  /** Every factor: fitted (with σ and significances) or fixed at 1. */
  factors: (FactorTest & { fitted: boolean })[];
}
