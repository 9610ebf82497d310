/**
 * A sampler answers "where are the target, the Sun and the Moon at this instant?" for one target
 * and one night. The window search runs on either: the exact one (astronomy-engine per instant,
 * the reference) or the fast one (the night's tables).
 */
import { Body } from 'astronomy-engine';
import { DEG } from '../constants.ts';
import { skyPlaceExact } from './apparent.ts';
import {
  altitudeOfVectorRad,
  apparentInFrame,
  lastAt,
  moonAt,
  sunAt,
  type NightFrame,
} from './frame.ts';
import { apparentAltitudeDeg } from './refraction.ts';
import type { Site } from './site.ts';
import { bodyPlace } from './sun-moon.ts';
import { icrsDirection, type Target } from './target.ts';
import { separationRad, unitFromRaDec, wrapPi, type Vec3 } from './vectors.ts';

export interface SkySample {
  /** Refracted altitude of the target, degrees. */
  altitudeDeg: number;
  trueAltitudeDeg: number;
  azimuthDeg: number;
  hourAngleRad: number;
  /** Geometric altitude of the Sun's and the Moon's centres, degrees. */
  sunAltitudeDeg: number;
  moonAltitudeDeg: number;
  moonSeparationDeg: number;
  sunSeparationDeg: number;
}

export type Sampler = (jd: number) => SkySample;

/** Exact: every quantity from astronomy-engine at the instant. */
export function exactSampler(site: Site, target: Target): Sampler {
  return (jd) => {
    const p = skyPlaceExact(icrsDirection(target, jd), jd, site);
    const dir = unitFromRaDec(p.raOfDateDeg * DEG, p.decOfDateDeg * DEG);
    const sun = bodyPlace(Body.Sun, site, jd);
    const moon = bodyPlace(Body.Moon, site, jd);
    return {
      altitudeDeg: p.altitudeDeg,
      trueAltitudeDeg: p.trueAltitudeDeg,
      azimuthDeg: p.azimuthDeg,
      hourAngleRad: p.hourAngleDeg * DEG,
      sunAltitudeDeg: sun.altitudeDeg,
      moonAltitudeDeg: moon.altitudeDeg,
      moonSeparationDeg: separationRad(dir, moon.ofDate) / DEG,
      sunSeparationDeg: separationRad(dir, sun.ofDate) / DEG,
    };
  };
}

/** A target reduced to its apparent place of date for one night (at the night's middle). */
export interface FrameTarget {
  raRad: number;
  decRad: number;
  sinDec: number;
  cosDec: number;
  dir: Vec3;
}

export function frameTarget(frame: NightFrame, target: Target): FrameTarget {
  const { raRad, decRad } = apparentInFrame(frame, icrsDirection(target, frame.midJd));
  return {
    raRad,
    decRad,
    sinDec: Math.sin(decRad),
    cosDec: Math.cos(decRad),
    dir: unitFromRaDec(raRad, decRad),
  };
}

/** Fast: closed-form altitude and azimuth from the night's tables. */
export function fastSampler(frame: NightFrame, t: FrameTarget): Sampler {
  return (jd) => {
    const h = lastAt(frame, jd) - t.raRad;
    const ch = Math.cos(h),
      sh = Math.sin(h);
    const alt = Math.asin(frame.sinLat * t.sinDec + frame.cosLat * t.cosDec * ch) / DEG;
    let az =
      Math.atan2(-t.cosDec * sh, frame.cosLat * t.sinDec - frame.sinLat * t.cosDec * ch) / DEG;
    if (az < 0) az += 360;
    const sun = sunAt(frame, jd);
    const moon = moonAt(frame, jd);
    return {
      altitudeDeg: apparentAltitudeDeg(alt, frame.refraction),
      trueAltitudeDeg: alt,
      azimuthDeg: az,
      hourAngleRad: wrapPi(h),
      sunAltitudeDeg: altitudeOfVectorRad(frame, sun, jd) / DEG,
      moonAltitudeDeg: altitudeOfVectorRad(frame, moon, jd) / DEG,
      moonSeparationDeg: separationRad(t.dir, moon) / DEG,
      sunSeparationDeg: separationRad(t.dir, sun) / DEG,
    };
  };
}

/**
 * Refracted altitudes (degrees) of many targets at many instants of one night, fast path, in one
 * Float64Array: row t (target), column k (instant), index t·n + k.
 */
export function altitudeGrid(
  frame: NightFrame,
  targets: readonly FrameTarget[],
  jd: Float64Array,
): Float64Array {
  const n = jd.length;
  const out = new Float64Array(targets.length * n);
  const last = Float64Array.from(jd, (t) => lastAt(frame, t));
  for (let i = 0; i < targets.length; i++) {
    const t = targets[i]!;
    const a = frame.sinLat * t.sinDec,
      b = frame.cosLat * t.cosDec;
    for (let k = 0; k < n; k++) {
      const alt = Math.asin(a + b * Math.cos(last[k]! - t.raRad)) / DEG;
      out[i * n + k] = apparentAltitudeDeg(alt, frame.refraction);
    }
  }
  return out;
}
