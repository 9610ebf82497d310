/**
 * Targets: an ICRS catalogue position with proper motion at its epoch, or, for a star on an orbit,
 * its system primary's position plus the orbit's predicted offset on the date.
 */
import { DEG, JULIAN_YEAR_DAYS, MAS_PER_RAD } from '../constants.ts';
import { InputError, requireFinite } from '../errors.ts';
import { validateOrbit } from '../orbit/elements.ts';
import { predict } from '../orbit/predict.ts';
import type { Orbit, OrbitInput } from '../orbit/types.ts';
import { parseEpoch } from '../time/index.ts';
import { parseDeclination, parseRightAscension } from './coordinates.ts';
import { normalize, raDecFromVector, unitFromRaDec, type Vec3 } from './vectors.ts';

export interface TargetInput {
  name: string;
  /**
   * ICRS right ascension at `epoch`, degrees, [0, 360), or text in any form of README's "Input
   * forms" (`16:41:12.5` is hours). For an orbiting star: its primary's.
   */
  raDeg: number | string;
  /** ICRS declination at `epoch`, degrees, [−90, 90], or text (`-26:41:12`). */
  decDeg: number | string;
  /** Proper motion μα* = μα·cos δ, mas/yr, east positive; default 0. */
  pmRaMasYr?: number;
  /** Proper motion μδ, mas/yr, north positive; default 0. */
  pmDecMasYr?: number;
  /** Epoch of the position (ISO 8601, JD, MJD, J…, B…); default J2000.0. */
  epoch?: string;
  /** The star's orbit about the primary at (raDeg, decDeg): its offset is added on every date. */
  orbit?: OrbitInput;
}

export interface Target {
  name: string;
  raRad: number;
  decRad: number;
  pmRaRadYr: number;
  pmDecRadYr: number;
  epochJd: number;
  orbit: Orbit | null;
}

/** Check a target. @throws InputError naming the field. */
export function validateTarget(input: unknown, prefix = 'target'): Target {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new InputError(prefix, input, 'must be an object with name, raDeg and decDeg');
  }
  const t = input as Record<string, unknown>;
  if (typeof t.name !== 'string' || t.name.trim() === '' || t.name.length > 100) {
    throw new InputError(
      `${prefix}.name`,
      t.name,
      'must be a non-empty string of at most 100 characters',
    );
  }
  const ra = parseRightAscension(t.raDeg, `${prefix}.raDeg`);
  const dec = parseDeclination(t.decDeg, `${prefix}.decDeg`);
  const pm = (k: 'pmRaMasYr' | 'pmDecMasYr') => {
    if (t[k] === undefined) return 0;
    const x = requireFinite(`${prefix}.${k}`, t[k]);
    if (Math.abs(x) > 20_000)
      throw new InputError(`${prefix}.${k}`, t[k], 'must be at most 20000 mas/yr in size');
    return x / MAS_PER_RAD;
  };
  return {
    name: t.name.trim(),
    raRad: ra * DEG,
    decRad: dec * DEG,
    pmRaRadYr: pm('pmRaMasYr'),
    pmDecRadYr: pm('pmDecMasYr'),
    epochJd: t.epoch === undefined ? 2_451_545.0 : parseEpoch(t.epoch, `${prefix}.epoch`),
    orbit: t.orbit === undefined ? null : validateOrbit(t.orbit as OrbitInput, `${prefix}.orbit`),
  };
}

/** East (α) and north (δ) unit vectors of the tangent plane at a direction. */
function tangentBasis(raRad: number, decRad: number): { east: Vec3; north: Vec3 } {
  const sa = Math.sin(raRad),
    ca = Math.cos(raRad),
    sd = Math.sin(decRad),
    cd = Math.cos(decRad);
  return { east: [-sa, ca, 0], north: [-sd * ca, -sd * sa, cd] };
}

/**
 * Direction of a tangent-plane offset (ξ east, η north, radians) from a centre: the gnomonic
 * deprojection, exact for any offset.
 */
export function offsetDirection(centre: Vec3, xiRad: number, etaRad: number): Vec3 {
  const { raRad, decRad } = raDecFromVector(centre);
  const { east, north } = tangentBasis(raRad, decRad);
  return normalize([
    centre[0] + xiRad * east[0] + etaRad * north[0],
    centre[1] + xiRad * east[1] + etaRad * north[1],
    centre[2] + xiRad * east[2] + etaRad * north[2],
  ]);
}

/**
 * Absolute position of a star at offset (Δα* = Δα·cos δ, Δδ; mas) from its primary (degrees).
 * Returns ICRS right ascension in [0, 360) and declination, degrees.
 */
export function offsetPosition(
  primaryRaDeg: number,
  primaryDecDeg: number,
  dRaMas: number,
  dDecMas: number,
): { raDeg: number; decDeg: number } {
  const v = offsetDirection(
    unitFromRaDec(primaryRaDeg * DEG, primaryDecDeg * DEG),
    dRaMas / MAS_PER_RAD,
    dDecMas / MAS_PER_RAD,
  );
  const { raRad, decRad } = raDecFromVector(v);
  return { raDeg: raRad / DEG, decDeg: decRad / DEG };
}

/**
 * ICRS unit vector of a target at a Julian Date: proper motion applied along the tangent plane,
 * then the orbit offset.
 */
export function icrsDirection(target: Target, jd: number): Vec3 {
  const years = (jd - target.epochJd) / JULIAN_YEAR_DAYS;
  const base = unitFromRaDec(target.raRad, target.decRad);
  const primary = offsetDirection(base, target.pmRaRadYr * years, target.pmDecRadYr * years);
  if (target.orbit === null) return primary;
  const p = predict(target.orbit, jd);
  return offsetDirection(primary, p.dRaMas / MAS_PER_RAD, p.dDecMas / MAS_PER_RAD);
}

/** ICRS position of a target at a Julian Date, degrees. */
export function targetPositionAt(target: Target, jd: number): { raDeg: number; decDeg: number } {
  const { raRad, decRad } = raDecFromVector(icrsDirection(target, jd));
  return { raDeg: raRad / DEG, decDeg: decRad / DEG };
}
