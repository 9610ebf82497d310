/**
 * Validating orbits and converting between Campbell elements and Thiele–Innes constants.
 * Conventions (docs/DESIGN.md): Δδ = A·X + F·Y, Δα* = B·X + G·Y with X = cos E − e, Y = √(1−e²)·sin E.
 */
import { DEG, JULIAN_YEAR_DAYS } from '../constants.ts';
import { InputError, requireFinite } from '../errors.ts';
import { parseEpoch, jdToIso } from '../time/index.ts';
import { campbellCovariance } from './thiele-innes-covariance.ts';
import {
  COVARIANCE_PARAMETERS,
  THIELE_INNES_PARAMETERS,
  type CampbellInput,
  type Covariance,
  type CovarianceInput,
  type CovarianceParameter,
  type Orbit,
  type OrbitInput,
  type RelativityFactors,
  type RelativitySwitches,
  type ThieleInnesInput,
} from './types.ts';

export interface ThieleInnes {
  /** Thiele–Innes constants in the unit of the semi-major axis given. */
  A: number;
  B: number;
  F: number;
  G: number;
}

/** Campbell (a, i, Ω, ω in rad) → Thiele–Innes, same unit as a. */
export function campbellToThieleInnes(
  a: number,
  iRad: number,
  nodeRad: number,
  argRad: number,
): ThieleInnes {
  const cw = Math.cos(argRad),
    sw = Math.sin(argRad);
  const cn = Math.cos(nodeRad),
    sn = Math.sin(nodeRad);
  const ci = Math.cos(iRad);
  return {
    A: a * (cw * cn - sw * sn * ci),
    B: a * (cw * sn + sw * cn * ci),
    F: a * (-sw * cn - cw * sn * ci),
    G: a * (-sw * sn + cw * cn * ci),
  };
}

/**
 * Thiele–Innes → Campbell (angles in rad). Astrometry alone cannot tell Ω from Ω + 180° (with
 * ω + 180°): this returns Ω in [0, π), the usual convention until radial velocities decide.
 */
export function thieleInnesToCampbell(ti: ThieleInnes): {
  a: number;
  iRad: number;
  nodeRad: number;
  argRad: number;
} {
  const { A, B, F, G } = ti;
  const sum = Math.atan2(B - F, A + G); // ω + Ω
  const diff = Math.atan2(-B - F, A - G); // ω − Ω
  let node = 0.5 * (sum - diff);
  let arg = 0.5 * (sum + diff);
  node = mod(node, 2 * Math.PI);
  if (node >= Math.PI) {
    node -= Math.PI;
    arg += Math.PI;
  }
  arg = mod(arg, 2 * Math.PI);
  const u = (A * A + B * B + F * F + G * G) / 2;
  const v = A * G - B * F;
  const a = Math.sqrt(u + Math.sqrt(Math.max(0, (u + v) * (u - v))));
  // cos i from the combinations that stay well-conditioned for any Ω, ω.
  const cw = Math.cos(arg),
    sw = Math.sin(arg),
    cn = Math.cos(node),
    sn = Math.sin(node);
  // B·sw·cn − F·cw·sn ... use A,B,F,G projected: (B·cn − A·sn) = a·sw·ci, (G·cn − F·sn) = a·cw·ci.
  const ciSw = (B * cn - A * sn) / a;
  const ciCw = (G * cn - F * sn) / a;
  const ci = sw * ciSw + cw * ciCw;
  const iRad = Math.acos(Math.max(-1, Math.min(1, ci)));
  return { a, iRad, nodeRad: node, argRad: arg };
}

export function mod(x: number, m: number): number {
  const r = x % m;
  return r < 0 ? r + m : r;
}

const DEFAULT_RELATIVITY: RelativitySwitches = {
  romer: false,
  gravitationalRedshift: false,
  transverseDoppler: false,
  precession: false,
};

function positive(field: string, v: unknown): number {
  const x = requireFinite(field, v);
  if (!(x > 0)) throw new InputError(field, v, 'must be greater than 0');
  return x;
}

/**
 * Longest period taken, years: the widest bound binaries have periods of order 10⁶ years (from
 * memory); beyond, an orbit cannot be told from a straight line in any campaign and the planning
 * numerics lose all precision (a period of 1e308 years made season plans fail).
 */
export const MAX_PERIOD_YEARS = 1e7;

function bounded(field: string, v: unknown, max: number): number {
  const x = positive(field, v);
  if (x > max) throw new InputError(field, v, `must be at most ${max.toExponential(0)}`);
  return x;
}

/** Largest mass ratio M₂/M₁ taken: beyond, the "secondary" is the primary (common practice, no source). */
export const MAX_MASS_RATIO = 1000;

/** An optional number in [0, max], or null when absent. */
function optionalFraction(field: string, v: unknown, max: number, what: string): number | null {
  if (v === undefined || v === null) return null;
  const x = requireFinite(field, v);
  if (!(x >= 0 && x <= max)) throw new InputError(field, v, `must satisfy 0 ≤ ${what} ≤ ${max}`);
  return x;
}

function eccentricity(field: string, v: unknown): number {
  const x = requireFinite(field, v);
  if (!(x >= 0 && x < 1))
    throw new InputError(field, v, 'must satisfy 0 ≤ e < 1 (bound orbits only)');
  return x;
}

/**
 * Validate an orbit as given by a user and bring it to internal units.
 * @throws InputError naming the field (dotted path under `prefix`), the value and the rule
 */
export function validateOrbit(input: OrbitInput, prefix = 'orbit'): Orbit {
  if (typeof input !== 'object' || input === null)
    throw new InputError(prefix, input, 'must be an object');
  const el = input.elements as unknown as Record<string, unknown> | undefined;
  const p = `${prefix}.elements`;
  if (typeof el !== 'object' || el === null)
    throw new InputError(p, el, 'must be an object with the orbital elements');
  const kind = el.kind ?? 'campbell';
  if (kind !== 'campbell' && kind !== 'thiele-innes') {
    throw new InputError(`${p}.kind`, kind, 'must be "campbell" or "thiele-innes"');
  }
  const periodDays =
    bounded(`${p}.periodYears`, el.periodYears, MAX_PERIOD_YEARS) * JULIAN_YEAR_DAYS;
  const periapsisJd = parseEpoch(el.periapsis, `${p}.periapsis`);
  const e = eccentricity(`${p}.eccentricity`, el.eccentricity);
  const { aMas, iRad, nodeRad, argRad, thieleInnes } = orbitGeometry(el, kind, p);
  const distancePc =
    input.distancePc === undefined || input.distancePc === null
      ? null
      : positive(`${prefix}.distancePc`, input.distancePc);
  const gammaKmS =
    input.systemicVelocityKmS === undefined
      ? 0
      : requireFinite(`${prefix}.systemicVelocityKmS`, input.systemicVelocityKmS);
  const relativity = relativitySwitches(input.relativity, distancePc, prefix);
  const factors = validateFactors(input.relativityFactors, `${prefix}.relativityFactors`);
  const massRatio = optionalFraction(`${prefix}.massRatio`, input.massRatio, MAX_MASS_RATIO, 'q');
  const lightFraction = optionalFraction(`${prefix}.lightFraction`, input.lightFraction, 1, 'β');
  const covariance =
    input.covariance === undefined
      ? null
      : validateCovariance(input.covariance, `${prefix}.covariance`, thieleInnes);
  const absent = covariance?.parameters.find(
    (n) =>
      (n === 'massRatio' && massRatio === null) ||
      (n === 'lightFraction' && lightFraction === null),
  );
  if (absent)
    throw new InputError(`${prefix}.${absent}`, null, `is needed: the covariance names ${absent}`);
  return {
    periodDays,
    periapsisJd,
    e,
    aMas,
    iRad,
    nodeRad,
    argRad,
    distancePc,
    gammaKmS,
    relativity,
    factors,
    massRatio,
    lightFraction,
    covariance,
  };
}

/** The orbit's size and orientation from either element set: a in mas, angles in radians. */
function orbitGeometry(
  el: Record<string, unknown>,
  kind: 'campbell' | 'thiele-innes',
  p: string,
): {
  aMas: number;
  iRad: number;
  nodeRad: number;
  argRad: number;
  /** The constants and the elements they give, for a covariance over A, B, F, G. */
  thieleInnes: Parameters<typeof campbellCovariance>[1] | null;
} {
  if (kind === 'campbell') {
    const aMas = positive(`${p}.semiMajorAxisArcsec`, el.semiMajorAxisArcsec) * 1000;
    const iDeg = requireFinite(`${p}.inclinationDeg`, el.inclinationDeg);
    if (!(iDeg >= 0 && iDeg <= 180))
      throw new InputError(`${p}.inclinationDeg`, iDeg, 'must satisfy 0 ≤ i ≤ 180');
    return {
      aMas,
      iRad: iDeg * DEG,
      nodeRad: mod(requireFinite(`${p}.ascendingNodeDeg`, el.ascendingNodeDeg), 360) * DEG,
      argRad: mod(requireFinite(`${p}.argPeriapsisDeg`, el.argPeriapsisDeg), 360) * DEG,
      thieleInnes: null,
    };
  }
  const ti = {
    A: requireFinite(`${p}.aArcsec`, el.aArcsec),
    B: requireFinite(`${p}.bArcsec`, el.bArcsec),
    F: requireFinite(`${p}.fArcsec`, el.fArcsec),
    G: requireFinite(`${p}.gArcsec`, el.gArcsec),
  };
  const c = thieleInnesToCampbell(ti);
  const aMas = c.a * 1000;
  if (!(aMas > 0))
    throw new InputError(
      `${p}.aArcsec`,
      ti.A,
      'with bArcsec, fArcsec, gArcsec must describe an orbit of non-zero size',
    );
  return {
    aMas,
    iRad: c.iRad,
    nodeRad: c.nodeRad,
    argRad: c.argRad,
    thieleInnes: { ti, campbell: c },
  };
}

/** The relativistic switches, each a known name with a boolean; any one on needs the distance. */
function relativitySwitches(
  input: unknown,
  distancePc: number | null,
  prefix: string,
): RelativitySwitches {
  const relativity = { ...DEFAULT_RELATIVITY };
  if (input !== undefined) {
    if (typeof input !== 'object' || input === null)
      throw new InputError(`${prefix}.relativity`, input, 'must be an object of switches');
    for (const [key, value] of Object.entries(input)) {
      if (!(key in DEFAULT_RELATIVITY))
        throw new InputError(
          `${prefix}.relativity.${key}`,
          value,
          `is not a switch; known: ${Object.keys(DEFAULT_RELATIVITY).join(', ')}`,
        );
      if (typeof value !== 'boolean')
        throw new InputError(`${prefix}.relativity.${key}`, value, 'must be true or false');
      relativity[key as keyof RelativitySwitches] = value;
    }
  }
  if (distancePc === null) {
    const on = Object.entries(relativity).find(([, v]) => v);
    if (on)
      throw new InputError(
        `${prefix}.relativity.${on[0]}`,
        true,
        'needs the distance (distancePc) to know the orbit in au',
      );
  }
  return relativity;
}

export const GENERAL_RELATIVITY: RelativityFactors = { redshiftFactor: 1, precessionFactor: 1 };

function validateFactors(input: unknown, field: string): RelativityFactors {
  const out = { ...GENERAL_RELATIVITY };
  if (input === undefined) return out;
  if (typeof input !== 'object' || input === null)
    throw new InputError(field, input, 'must be an object of scale factors');
  for (const [key, value] of Object.entries(input)) {
    if (!(key in GENERAL_RELATIVITY))
      throw new InputError(
        `${field}.${key}`,
        value,
        `is not a factor; known: ${Object.keys(GENERAL_RELATIVITY).join(', ')}`,
      );
    const x = requireFinite(`${field}.${key}`, value);
    if (Math.abs(x) > 100)
      throw new InputError(`${field}.${key}`, x, 'must lie within ±100 (1 is general relativity)');
    out[key as keyof RelativityFactors] = x;
  }
  return out;
}

/**
 * A covariance checked for names, shape, symmetry and range; one that names Thiele–Innes constants
 * (allowed with Thiele–Innes elements, `thieleInnes` the solution) comes back over a, i, Ω, ω.
 */
function validateCovariance(
  input: CovarianceInput,
  field: string,
  thieleInnes: Parameters<typeof campbellCovariance>[1] | null,
): Covariance {
  const { parameters, matrix } = input;
  const known: readonly string[] = thieleInnes
    ? [...COVARIANCE_PARAMETERS, ...THIELE_INNES_PARAMETERS]
    : COVARIANCE_PARAMETERS;
  if (!Array.isArray(parameters) || parameters.length === 0)
    throw new InputError(
      `${field}.parameters`,
      parameters,
      'must be a non-empty list of parameter names',
    );
  const seen = new Set<string>();
  parameters.forEach((name, k) => {
    if (!known.includes(name)) {
      throw new InputError(
        `${field}.parameters.${k}`,
        name,
        (THIELE_INNES_PARAMETERS as readonly string[]).includes(name)
          ? 'is a Thiele–Innes constant: a covariance names it only with Thiele–Innes elements'
          : `must be one of ${known.join(', ')}`,
      );
    }
    if (seen.has(name)) throw new InputError(`${field}.parameters.${k}`, name, 'appears twice');
    seen.add(name);
  });
  const n = parameters.length;
  if (!Array.isArray(matrix) || matrix.length !== n)
    throw new InputError(`${field}.matrix`, matrix, `must have ${n} rows, one per parameter`);
  matrix.forEach((row, r) => {
    if (!Array.isArray(row) || row.length !== n)
      throw new InputError(`${field}.matrix.${r}`, row, `must have ${n} columns`);
    row.forEach((v, c) => {
      requireFinite(`${field}.matrix.${r}.${c}`, v);
    });
  });
  for (let r = 0; r < n; r++) {
    if (matrix[r]![r]! < 0)
      throw new InputError(
        `${field}.matrix.${r}.${r}`,
        matrix[r]![r],
        'is a variance and must be ≥ 0',
      );
    for (let c = 0; c < r; c++) {
      const x = matrix[r]![c]!,
        y = matrix[c]![r]!;
      if (Math.abs(x - y) > 1e-9 * Math.max(Math.abs(x), Math.abs(y), Number.MIN_VALUE)) {
        throw new InputError(
          `${field}.matrix.${r}.${c}`,
          x,
          `must equal matrix.${c}.${r} (${y}): a covariance is symmetric`,
        );
      }
      const limit = Math.sqrt(matrix[r]![r]! * matrix[c]![c]!);
      if (Math.abs(x) > limit * (1 + 1e-9))
        throw new InputError(
          `${field}.matrix.${r}.${c}`,
          x,
          `makes a correlation beyond ±1 (|cov| must be ≤ ${limit})`,
        );
    }
  }
  if (
    thieleInnes &&
    parameters.some((p) => (THIELE_INNES_PARAMETERS as readonly string[]).includes(p))
  )
    return campbellCovariance(input, thieleInnes, field);
  return {
    parameters: [...parameters] as CovarianceParameter[],
    matrix: matrix.map((row) => [...row]),
  };
}

/** An orbit's value of a covariance parameter, in that parameter's unit. */
export function getParameter(orbit: Orbit, name: CovarianceParameter): number {
  switch (name) {
    case 'periodYears':
      return orbit.periodDays / JULIAN_YEAR_DAYS;
    case 'periapsisDays':
      return orbit.periapsisJd;
    case 'eccentricity':
      return orbit.e;
    case 'semiMajorAxisArcsec':
      return orbit.aMas / 1000;
    case 'inclinationDeg':
      return orbit.iRad / DEG;
    case 'ascendingNodeDeg':
      return orbit.nodeRad / DEG;
    case 'argPeriapsisDeg':
      return orbit.argRad / DEG;
    case 'distancePc':
      return orbit.distancePc ?? Number.NaN;
    case 'systemicVelocityKmS':
      return orbit.gammaKmS;
    case 'massRatio':
      return orbit.massRatio ?? Number.NaN;
    case 'lightFraction':
      return orbit.lightFraction ?? Number.NaN;
  }
}

/** A copy of the orbit with one parameter set (unit as in COVARIANCE_PARAMETERS). No validation: for perturbations. */
export function withParameter(orbit: Orbit, name: CovarianceParameter, value: number): Orbit {
  const o = { ...orbit };
  switch (name) {
    case 'periodYears':
      o.periodDays = value * JULIAN_YEAR_DAYS;
      break;
    case 'periapsisDays':
      o.periapsisJd = value;
      break;
    case 'eccentricity':
      o.e = value;
      break;
    case 'semiMajorAxisArcsec':
      o.aMas = value * 1000;
      break;
    case 'inclinationDeg':
      o.iRad = value * DEG;
      break;
    case 'ascendingNodeDeg':
      o.nodeRad = value * DEG;
      break;
    case 'argPeriapsisDeg':
      o.argRad = value * DEG;
      break;
    case 'distancePc':
      o.distancePc = value;
      break;
    case 'systemicVelocityKmS':
      o.gammaKmS = value;
      break;
    case 'massRatio':
      o.massRatio = value;
      break;
    case 'lightFraction':
      o.lightFraction = value;
      break;
  }
  return o;
}

/** The orbit's Campbell elements in interface units (what a user would type back in). */
export function toCampbellInput(orbit: Orbit): Required<CampbellInput> {
  return {
    kind: 'campbell',
    periodYears: orbit.periodDays / JULIAN_YEAR_DAYS,
    periapsis: jdToIso(orbit.periapsisJd),
    eccentricity: orbit.e,
    semiMajorAxisArcsec: orbit.aMas / 1000,
    inclinationDeg: orbit.iRad / DEG,
    ascendingNodeDeg: orbit.nodeRad / DEG,
    argPeriapsisDeg: orbit.argRad / DEG,
  };
}

/** The orbit's Thiele–Innes form in interface units (arcsec). */
export function toThieleInnesInput(orbit: Orbit): Required<ThieleInnesInput> {
  const ti = campbellToThieleInnes(orbit.aMas / 1000, orbit.iRad, orbit.nodeRad, orbit.argRad);
  return {
    kind: 'thiele-innes',
    periodYears: orbit.periodDays / JULIAN_YEAR_DAYS,
    periapsis: jdToIso(orbit.periapsisJd),
    eccentricity: orbit.e,
    aArcsec: ti.A,
    bArcsec: ti.B,
    fArcsec: ti.F,
    gArcsec: ti.G,
  };
}
