/**
 * The relativistic terms that matter for a star near periapsis around a compact object, each as a
 * small pure function with SI units. First order in GM/(rc²) and v/c: enough for stars that stay
 * thousands of Schwarzschild radii away.
 */
import { C_KM_PER_S, C_M_PER_S, SECONDS_PER_DAY, AU_M } from '../constants.ts';

/** Schwarzschild radius 2GM/c², metres, for a mass parameter GM in m³/s². */
export function schwarzschildRadiusM(gmM3S2: number): number {
  return (2 * gmM3S2) / (C_M_PER_S * C_M_PER_S);
}

/** Schwarzschild periapsis advance per orbit, radians: Δω = 6πGM / (c²·a·(1 − e²)), a in metres. */
export function precessionPerOrbitRad(gmM3S2: number, aM: number, e: number): number {
  return (6 * Math.PI * gmM3S2) / (C_M_PER_S * C_M_PER_S * aM * (1 - e * e));
}

/** Gravitational redshift expressed as a velocity, km/s: GM/(r·c), r in metres. */
export function gravitationalRedshiftKmS(gmM3S2: number, rM: number): number {
  return gmM3S2 / (rM * C_M_PER_S) / 1000;
}

/** Transverse (second-order) Doppler shift as a velocity, km/s: v²/(2c), v in km/s. */
export function transverseDopplerKmS(speedKmS: number): number {
  return (speedKmS * speedKmS) / (2 * C_KM_PER_S);
}

/** Rømer delay, days: the light-travel time across a line-of-sight offset z (au, positive away from us). */
export function romerDelayDays(zAu: number): number {
  return (zAu * AU_M) / C_M_PER_S / SECONDS_PER_DAY;
}
