/** Small 3-vector and angle helpers for unit direction vectors (radians inside). */
import { TWO_PI } from '../constants.ts';

export type Vec3 = [number, number, number];

/** Unit vector of right ascension α and declination δ, radians. */
export function unitFromRaDec(raRad: number, decRad: number): Vec3 {
  const cd = Math.cos(decRad);
  return [cd * Math.cos(raRad), cd * Math.sin(raRad), Math.sin(decRad)];
}

/** α in [0, 2π) and δ in [−π/2, π/2] of any non-zero vector. */
export function raDecFromVector(v: Vec3): { raRad: number; decRad: number } {
  const ra = Math.atan2(v[1], v[0]);
  return { raRad: ra < 0 ? ra + TWO_PI : ra, decRad: Math.atan2(v[2], Math.hypot(v[0], v[1])) };
}

export function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

export function normalize(v: Vec3): Vec3 {
  const r = Math.hypot(v[0], v[1], v[2]);
  return [v[0] / r, v[1] / r, v[2] / r];
}

/** Angle between two unit vectors, radians, accurate at small and large angles. */
export function separationRad(a: Vec3, b: Vec3): number {
  const cx = a[1] * b[2] - a[2] * b[1];
  const cy = a[2] * b[0] - a[0] * b[2];
  const cz = a[0] * b[1] - a[1] * b[0];
  return Math.atan2(Math.hypot(cx, cy, cz), dot(a, b));
}

/** 3×3 matrix (row-major rows) times vector. */
export function rotate(m: readonly (readonly number[])[], v: Vec3): Vec3 {
  const r0 = m[0]!,
    r1 = m[1]!,
    r2 = m[2]!;
  return [
    r0[0]! * v[0] + r0[1]! * v[1] + r0[2]! * v[2],
    r1[0]! * v[0] + r1[1]! * v[1] + r1[2]! * v[2],
    r2[0]! * v[0] + r2[1]! * v[1] + r2[2]! * v[2],
  ];
}

/** Angle wrapped to (−π, π]. */
export function wrapPi(x: number): number {
  let y = x % TWO_PI;
  if (y <= -Math.PI) y += TWO_PI;
  else if (y > Math.PI) y -= TWO_PI;
  return y;
}
