/**
 * The exact path: a target's topocentric place at one instant, through astronomy-engine.
 *
 * ICRS direction → annual + diurnal aberration (Earth's barycentric velocity plus the observer's
 * rotation velocity, first order in v/c) → precession-nutation to the true equator and equinox of
 * date → altitude and azimuth for the site (Greenwich apparent sidereal time) → refraction for the
 * site's weather. Gravitational light deflection by the Sun (under 0.03″ beyond 15° from it) and
 * polar motion are left out.
 */
import {
  AstroTime,
  BaryState,
  Body,
  Horizon,
  ObserverState,
  Rotation_EQJ_EQD,
  SiderealTime,
  type RotationMatrix,
} from 'astronomy-engine';
import { AU_M, C_M_PER_S, DEG, JD_J2000, SECONDS_PER_DAY } from '../constants.ts';
import { apparentAltitudeDeg, siteRefraction } from './refraction.ts';
import type { Site } from './site.ts';
import { useLeapSecondTimeScale } from './time-scale.ts';
import { normalize, raDecFromVector, wrapPi, type Vec3 } from './vectors.ts';

/** Speed of light in au/day. */
export const C_AU_PER_DAY = (C_M_PER_S * SECONDS_PER_DAY) / AU_M;

/** astronomy-engine time for a UTC Julian Date (full precision, unlike a Date). */
export function astroTime(jdUtc: number): AstroTime {
  useLeapSecondTimeScale();
  return new AstroTime(jdUtc - JD_J2000);
}

/** Apply aberration for an observer velocity (units of c) to a unit vector: first order, renormalised. */
export function aberrate(p: Vec3, beta: Vec3): Vec3 {
  const pb = p[0] * beta[0] + p[1] * beta[1] + p[2] * beta[2];
  return normalize([
    p[0] + beta[0] - pb * p[0],
    p[1] + beta[1] - pb * p[1],
    p[2] + beta[2] - pb * p[2],
  ]);
}

/** Row-major 3×3 from astronomy-engine's rotation (which stores the transpose). */
export function rowMajor(r: RotationMatrix): number[][] {
  const m = r.rot;
  return [0, 1, 2].map((i) => [m[0]![i]!, m[1]![i]!, m[2]![i]!]);
}

/**
 * Observer velocity in units of c, J2000 equator: Earth's barycentric velocity, plus the site's
 * rotation when given.
 */
export function observerBeta(time: AstroTime, site?: Site): Vec3 {
  const e = BaryState(Body.Earth, time);
  let vx = e.vx,
    vy = e.vy,
    vz = e.vz;
  if (site) {
    const o = ObserverState(time, site.observer, false);
    vx += o.vx;
    vy += o.vy;
    vz += o.vz;
  }
  return [vx / C_AU_PER_DAY, vy / C_AU_PER_DAY, vz / C_AU_PER_DAY];
}

/** Apparent direction of date (true equator and equinox), unit vector, for an ICRS direction. */
export function apparentOfDate(icrs: Vec3, time: AstroTime, site?: Site): Vec3 {
  const p = aberrate(icrs, observerBeta(time, site));
  const m = Rotation_EQJ_EQD(time).rot;
  return [
    m[0]![0]! * p[0] + m[1]![0]! * p[1] + m[2]![0]! * p[2],
    m[0]![1]! * p[0] + m[1]![1]! * p[1] + m[2]![1]! * p[2],
    m[0]![2]! * p[0] + m[1]![2]! * p[1] + m[2]![2]! * p[2],
  ];
}

/** Where a target stands in a site's sky at one instant. Angles in degrees. */
export interface SkyPlace {
  /** Refracted (observed) altitude; equals `trueAltitudeDeg` when the site's pressure is 0. */
  altitudeDeg: number;
  /** Geometric altitude, no refraction. */
  trueAltitudeDeg: number;
  /** Azimuth from north through east, [0, 360). */
  azimuthDeg: number;
  /** Local apparent hour angle, (−180, 180], positive west of the meridian. */
  hourAngleDeg: number;
  /** Apparent right ascension and declination of date (topocentric aberration included). */
  raOfDateDeg: number;
  decOfDateDeg: number;
  /** Parallactic angle: position angle of the zenith direction at the target, (−180, 180]. */
  parallacticAngleDeg: number;
}

/** Local apparent sidereal time, radians, at a UTC Julian Date. */
export function localSiderealRad(time: AstroTime, longitudeDeg: number): number {
  return (SiderealTime(time) * 15 + longitudeDeg) * DEG;
}

/** Parallactic angle q (radians) for hour angle H, declination δ and latitude φ (radians). */
export function parallacticAngleRad(haRad: number, decRad: number, latRad: number): number {
  return Math.atan2(
    Math.sin(haRad),
    Math.tan(latRad) * Math.cos(decRad) - Math.sin(decRad) * Math.cos(haRad),
  );
}

/** The exact topocentric place of an ICRS direction for a site at a UTC Julian Date. */
export function skyPlaceExact(icrs: Vec3, jdUtc: number, site: Site): SkyPlace {
  const time = astroTime(jdUtc);
  const { raRad, decRad } = raDecFromVector(apparentOfDate(icrs, time, site));
  return skyPlaceOfDate(raRad, decRad, time, site);
}

/** The topocentric place of an apparent place of date (α, δ in radians) through astronomy-engine's Horizon. */
export function skyPlaceOfDate(
  raRad: number,
  decRad: number,
  time: AstroTime,
  site: Site,
): SkyPlace {
  const hor = Horizon(time, site.observer, raRad / (15 * DEG), decRad / DEG);
  const ha = wrapPi(localSiderealRad(time, site.longitudeDeg) - raRad);
  return {
    altitudeDeg: apparentAltitudeDeg(hor.altitude, siteRefraction(site)),
    trueAltitudeDeg: hor.altitude,
    azimuthDeg: hor.azimuth,
    hourAngleDeg: ha / DEG,
    raOfDateDeg: raRad / DEG,
    decOfDateDeg: decRad / DEG,
    parallacticAngleDeg: parallacticAngleRad(ha, decRad, site.latitudeDeg * DEG) / DEG,
  };
}
