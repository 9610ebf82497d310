/**
 * The parameter vector of a fit: which parameters exist for a request, their internal units, how
 * they show at the interface, and which are free. Internal units: P in days, T in JD, a and
 * Thiele–Innes constants in mas, angles in rad, distance in pc, mass in M☉, γ in km/s, frame
 * offsets in mas and drifts in mas/yr.
 *
 * Orientation per star: an astrometric-only star in a single-star fit uses the Thiele–Innes
 * constants (linear, defined for face-on orbits too); a star with radial velocities, or in a joint
 * fit, uses Campbell i, Ω, ω (the radial velocity tells Ω from Ω + 180°). In a joint fit the
 * semi-major axes follow from the shared mass and distance by Kepler's third law, in the one mass
 * convention of the project (`massSolar`: 4π²a³/(GM☉P²), IAU 2015 nominal GM☉).
 */
import { DEG, JULIAN_YEAR_DAYS } from '../../constants.ts';
import { InputError } from '../../errors.ts';
import { GENERAL_RELATIVITY, thieleInnesToCampbell } from '../elements.ts';
import { semiMajorAxisAuFromMass } from '../physical.ts';
import type { Orbit, RelativitySwitches } from '../types.ts';
import { componentCount, type Observation } from './measurements.ts';

export const SYSTEM_KEYS = [
  'distancePc',
  'massSolar',
  'systemicVelocityKmS',
  'offsetRaMas',
  'offsetDecMas',
  'driftRaMasYr',
  'driftDecMasYr',
  'redshiftFactor',
  'precessionFactor',
] as const;
export type SystemKey = (typeof SYSTEM_KEYS)[number];
export const STAR_KEYS = [
  'periodYears',
  'periapsisDays',
  'eccentricity',
  'semiMajorAxisArcsec',
  'inclinationDeg',
  'ascendingNodeDeg',
  'argPeriapsisDeg',
  'aArcsec',
  'bArcsec',
  'fArcsec',
  'gArcsec',
  'massRatio',
  'lightFraction',
] as const;
export type StarKey = (typeof STAR_KEYS)[number];

const SCALE: Record<SystemKey | StarKey, { scale: number; unit: string; angle?: true }> = {
  distancePc: { scale: 1, unit: 'pc' },
  massSolar: { scale: 1, unit: 'M☉' },
  systemicVelocityKmS: { scale: 1, unit: 'km/s' },
  offsetRaMas: { scale: 1, unit: 'mas' },
  offsetDecMas: { scale: 1, unit: 'mas' },
  driftRaMasYr: { scale: 1, unit: 'mas/yr' },
  driftDecMasYr: { scale: 1, unit: 'mas/yr' },
  redshiftFactor: { scale: 1, unit: '' },
  precessionFactor: { scale: 1, unit: '' },
  periodYears: { scale: 1 / JULIAN_YEAR_DAYS, unit: 'yr' },
  periapsisDays: { scale: 1, unit: 'JD (σ in days)' },
  eccentricity: { scale: 1, unit: '' },
  semiMajorAxisArcsec: { scale: 1e-3, unit: 'arcsec' },
  inclinationDeg: { scale: 1 / DEG, unit: 'deg', angle: true },
  ascendingNodeDeg: { scale: 1 / DEG, unit: 'deg', angle: true },
  argPeriapsisDeg: { scale: 1 / DEG, unit: 'deg', angle: true },
  aArcsec: { scale: 1e-3, unit: 'arcsec' },
  bArcsec: { scale: 1e-3, unit: 'arcsec' },
  fArcsec: { scale: 1e-3, unit: 'arcsec' },
  gArcsec: { scale: 1e-3, unit: 'arcsec' },
  massRatio: { scale: 1, unit: 'M₂/M₁' },
  lightFraction: { scale: 1, unit: 'L₂/(L₁+L₂)' },
};

export interface ParamDesc {
  /** Reported name: a system key, or `<star>.<key>`. */
  name: string;
  key: SystemKey | StarKey;
  star: number | null;
  /** interface value = internal value × scale. */
  scale: number;
  unit: string;
  angle: boolean;
}

/** Index of each of a star's parameters in the vector, −1 when the star does not have it. */
export type StarSlots = Record<
  'P' | 'T' | 'e' | 'a' | 'i' | 'node' | 'arg' | 'A' | 'B' | 'F' | 'G' | 'q' | 'beta',
  number
>;

export interface StarLayout {
  name: string;
  obs: Observation[];
  jd: Float64Array;
  hasRv: boolean;
  /** Velocities of a body about the barycentre, or photocentre positions: the mass ratio is a parameter. */
  barycentric: boolean;
  hasAstrometry: boolean;
  relativity: RelativitySwitches;
  orientation: 'thiele-innes' | 'campbell';
  slots: StarSlots;
  /** First residual component of this star in the component vector. */
  firstComponent: number;
}

export interface Layout {
  params: ParamDesc[];
  stars: StarLayout[];
  sys: Record<'d' | 'M' | 'gamma' | 'x0' | 'y0' | 'vx' | 'vy' | 'fz' | 'fw', number>;
  /** Joint fit: a shared mass, and each a from Kepler's third law. */
  massMode: boolean;
  frameEpochJd: number;
  relativity: RelativitySwitches;
  components: number;
}

export interface LayoutStar {
  name: string;
  obs: Observation[];
  /** The star's own relativistic terms. */
  relativity: RelativitySwitches;
}

export interface LayoutOptions {
  relativity: RelativitySwitches;
  frameOffset: boolean;
  frameDrift: boolean;
  frameEpochJd: number;
  /** A distance fixed or given a prior by the user: keep it in the vector even without velocities. */
  distanceWanted: boolean;
  /** Relativity factors that are parameters (shared by all stars: they belong to the primary). */
  freeFactors: { redshiftFactor: boolean; precessionFactor: boolean };
}

export function buildLayout(stars: LayoutStar[], o: LayoutOptions): Layout {
  const params: ParamDesc[] = [];
  const add = (key: SystemKey | StarKey, star: number | null, prefix: string): number => {
    const s = SCALE[key];
    params.push({
      name: prefix + key,
      key,
      star,
      scale: s.scale,
      unit: s.unit,
      angle: s.angle === true,
    });
    return params.length - 1;
  };
  const massMode = stars.length > 1;
  const anyRv = stars.some((s) => s.obs.some((m) => m.kind === 'radial-velocity'));
  const anyRel = Object.values(o.relativity).some((v) => v);
  const needD = anyRv || anyRel || massMode || o.distanceWanted;
  const sys = {
    d: needD ? add('distancePc', null, '') : -1,
    M: massMode ? add('massSolar', null, '') : -1,
    gamma: anyRv ? add('systemicVelocityKmS', null, '') : -1,
    x0: o.frameOffset ? add('offsetRaMas', null, '') : -1,
    y0: o.frameOffset ? add('offsetDecMas', null, '') : -1,
    vx: o.frameDrift ? add('driftRaMasYr', null, '') : -1,
    vy: o.frameDrift ? add('driftDecMasYr', null, '') : -1,
    fz: o.freeFactors.redshiftFactor ? add('redshiftFactor', null, '') : -1,
    fw: o.freeFactors.precessionFactor ? add('precessionFactor', null, '') : -1,
  };
  let first = 0;
  const starLayouts = stars.map((s, k): StarLayout => {
    const prefix = `${s.name}.`;
    const hasRv = s.obs.some((m) => m.kind === 'radial-velocity');
    const barycentric = s.obs.some((m) => m.component !== 'relative');
    const orientation = !massMode && !hasRv && !anyRel ? 'thiele-innes' : 'campbell';
    const ti = orientation === 'thiele-innes';
    const slots: StarSlots = {
      P: add('periodYears', k, prefix),
      T: add('periapsisDays', k, prefix),
      e: add('eccentricity', k, prefix),
      a: !ti && !massMode ? add('semiMajorAxisArcsec', k, prefix) : -1,
      i: ti ? -1 : add('inclinationDeg', k, prefix),
      node: ti ? -1 : add('ascendingNodeDeg', k, prefix),
      arg: ti ? -1 : add('argPeriapsisDeg', k, prefix),
      A: ti ? add('aArcsec', k, prefix) : -1,
      B: ti ? add('bArcsec', k, prefix) : -1,
      F: ti ? add('fArcsec', k, prefix) : -1,
      G: ti ? add('gArcsec', k, prefix) : -1,
      q: barycentric ? add('massRatio', k, prefix) : -1,
      beta: s.obs.some((m) => m.component === 'photocentre') ? add('lightFraction', k, prefix) : -1,
    };
    const components = s.obs.reduce((n, m) => n + componentCount(m), 0);
    const out: StarLayout = {
      name: s.name,
      obs: s.obs,
      jd: Float64Array.from(s.obs, (m) => m.jd),
      hasRv,
      barycentric,
      hasAstrometry: s.obs.some((m) => m.kind !== 'radial-velocity'),
      relativity: s.relativity,
      orientation,
      slots,
      firstComponent: first,
    };
    first += components;
    return out;
  });
  return {
    params,
    stars: starLayouts,
    sys,
    massMode,
    frameEpochJd: o.frameEpochJd,
    relativity: o.relativity,
    components: first,
  };
}

/** Semi-major axis in mas of star k: its own parameter, or from M and d by Kepler's third law. */
export function semiMajorAxisMas(L: Layout, theta: ArrayLike<number>, k: number): number {
  const s = L.stars[k]!.slots;
  if (s.a >= 0) return theta[s.a]!;
  if (s.A >= 0)
    return thieleInnesToCampbell({ A: theta[s.A]!, B: theta[s.B]!, F: theta[s.F]!, G: theta[s.G]! })
      .a;
  return (1000 * semiMajorAxisAuFromMass(theta[L.sys.M]!, theta[s.P]!)) / theta[L.sys.d]!;
}

/** The Orbit (engine units) of star k at parameter vector theta. */
export function starOrbit(
  L: Layout,
  theta: ArrayLike<number>,
  k: number,
  relativity: RelativitySwitches = L.stars[k]!.relativity,
): Orbit {
  const s = L.stars[k]!.slots;
  let aMas: number, iRad: number, nodeRad: number, argRad: number;
  if (s.A >= 0) {
    const c = thieleInnesToCampbell({
      A: theta[s.A]!,
      B: theta[s.B]!,
      F: theta[s.F]!,
      G: theta[s.G]!,
    });
    ({ a: aMas, iRad, nodeRad, argRad } = c);
  } else {
    aMas = semiMajorAxisMas(L, theta, k);
    iRad = theta[s.i]!;
    nodeRad = theta[s.node]!;
    argRad = theta[s.arg]!;
  }
  return {
    periodDays: theta[s.P]!,
    periapsisJd: theta[s.T]!,
    e: theta[s.e]!,
    aMas,
    iRad,
    nodeRad,
    argRad,
    distancePc: L.sys.d >= 0 ? theta[L.sys.d]! : null,
    gammaKmS: L.sys.gamma >= 0 ? theta[L.sys.gamma]! : 0,
    relativity,
    factors: {
      redshiftFactor: L.sys.fz >= 0 ? theta[L.sys.fz]! : GENERAL_RELATIVITY.redshiftFactor,
      precessionFactor: L.sys.fw >= 0 ? theta[L.sys.fw]! : GENERAL_RELATIVITY.precessionFactor,
    },
    massRatio: s.q >= 0 ? theta[s.q]! : null,
    lightFraction: s.beta >= 0 ? theta[s.beta]! : null,
    covariance: null,
  };
}

/** Resolve a user's parameter name (single-star fits may leave out the star prefix). */
export function findParameter(L: Layout, name: string, field: string): number {
  let idx = L.params.findIndex((p) => p.name === name);
  if (idx < 0 && L.stars.length === 1)
    idx = L.params.findIndex((p) => p.name === `${L.stars[0]!.name}.${name}`);
  if (idx < 0)
    throw new InputError(
      field,
      name,
      `is not a parameter of this fit; known: ${L.params.map((p) => p.name).join(', ')}`,
    );
  return idx;
}
