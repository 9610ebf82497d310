/**
 * Physical quantities of an orbit once its distance is known: size in au, the central mass by
 * Kepler's third law, the Schwarzschild radius, periapsis distance and speed, K, and the sizes of
 * the relativistic terms at periapsis.
 */
import { AU_M, C_KM_PER_S, GM_SUN_M3_PER_S2, SECONDS_PER_DAY } from '../constants.ts';
import { InputError } from '../errors.ts';
import {
  gravitationalRedshiftKmS,
  precessionPerOrbitRad,
  romerDelayDays,
  schwarzschildRadiusM,
  transverseDopplerKmS,
} from './relativity.ts';
import type { Orbit } from './types.ts';

/** Semi-major axis in au: a[″] × d[pc] (1″ at 1 pc subtends 1 au, by the definition of the parsec). */
export function semiMajorAxisAu(aMas: number, distancePc: number): number {
  return (aMas / 1000) * distancePc;
}

/** Total mass parameter G(M₁+M₂), m³/s², from Kepler's third law: GM = 4π²a³/P². */
export function massParameterM3S2(aAu: number, periodDays: number): number {
  const aM = aAu * AU_M;
  const pS = periodDays * SECONDS_PER_DAY;
  return (4 * Math.PI * Math.PI * aM * aM * aM) / (pS * pS);
}

/**
 * Mass in solar masses from a (au) and P (days): M = 4π²a³/(GM☉·P²) with the IAU 2015 nominal GM☉.
 * This is the one mass convention of the project (a³/P² in au and Julian years differs by 4e-5).
 */
export function massSolar(aAu: number, periodDays: number): number {
  return massParameterM3S2(aAu, periodDays) / GM_SUN_M3_PER_S2;
}

/** The inverse of `massSolar`: a in au for a total mass (M☉) and a period (days). */
export function semiMajorAxisAuFromMass(massSolarValue: number, periodDays: number): number {
  const pS = periodDays * SECONDS_PER_DAY;
  return Math.cbrt((massSolarValue * GM_SUN_M3_PER_S2 * pS * pS) / (4 * Math.PI * Math.PI)) / AU_M;
}

/**
 * The extremes of the line-of-sight position z = r·sin i·sin(ν + ω) over an orbit, au (positive
 * away from us). dz/dν = 0 where cos(ν + ω) = −e·cos ω, which gives
 * z_max = a(1 − e²)·sin i / (s + e·sin ω) and z_min = −a(1 − e²)·sin i / (s − e·sin ω),
 * s = √(1 − e²cos²ω); their difference is 2a·sin i·s.
 */
export function lineOfSightExtremesAu(
  aAu: number,
  e: number,
  iRad: number,
  argRad: number,
): { nearestAu: number; farthestAu: number } {
  const s = Math.sqrt(1 - e * e * Math.cos(argRad) ** 2);
  const es = e * Math.sin(argRad);
  const pSinI = aAu * (1 - e * e) * Math.sin(iRad);
  return { nearestAu: -pSinI / (s - es), farthestAu: pSinI / (s + es) };
}

/** Velocity semi-amplitude K, km/s: 2π·a·sin i / (P·√(1−e²)). */
export function semiAmplitudeKmS(aAu: number, periodDays: number, e: number, iRad: number): number {
  return (
    (2 * Math.PI * aAu * AU_M * Math.sin(iRad)) /
    (periodDays * SECONDS_PER_DAY * Math.sqrt(1 - e * e)) /
    1000
  );
}

/**
 * A binary's total mass and relative semi-amplitude shared between its bodies by the mass ratio
 * q = M₂/M₁ (q ≥ 0): M₁ = M/(1+q), M₂ = qM/(1+q); K₁ = K·q/(1+q), K₂ = K/(1+q), so K₁/K₂ = q.
 */
export function binaryShares(
  massSolar: number,
  relativeKmS: number,
  q: number,
): {
  primaryMassSolar: number;
  secondaryMassSolar: number;
  primaryKmS: number;
  secondaryKmS: number;
} {
  return {
    primaryMassSolar: massSolar / (1 + q),
    secondaryMassSolar: (massSolar * q) / (1 + q),
    primaryKmS: (relativeKmS * q) / (1 + q),
    secondaryKmS: relativeKmS / (1 + q),
  };
}

/**
 * What multiplies the relative orbit's velocity in the radial velocity of a body, and its
 * derivative by q: 1 for `relative` (the primary at rest), 1/(1+q) for the secondary, −q/(1+q) for
 * the primary about the barycentre (q = M₂/M₁).
 */
export function velocityShare(
  component: 'relative' | 'primary' | 'secondary' | 'photocentre',
  q: number,
): [number, number] {
  if (component !== 'primary' && component !== 'secondary') return [1, 0];
  const dq = -1 / ((1 + q) * (1 + q));
  return component === 'secondary' ? [1 / (1 + q), dq] : [-q / (1 + q), dq];
}

/**
 * What multiplies the relative orbit (secondary from primary) in the photocentre's offset from the
 * barycentre, and its derivatives by q and β: β − B, with B = q/(1+q) the secondary's fraction of
 * the mass and β = L₂/(L₁+L₂) its fraction of the light. The photocentre orbit's semi-major axis is
 * α = a·|B − β| (van de Kamp, Principles of Astrometry (1967), photocentric orbit, from memory).
 */
export function photocentreShare(
  q: number,
  beta: number,
): { share: number; dq: number; dBeta: number } {
  return { share: beta - q / (1 + q), dq: -1 / ((1 + q) * (1 + q)), dBeta: 1 };
}

export interface PhysicalQuantities {
  semiMajorAxisAu: number;
  massSolar: number;
  schwarzschildRadiusAu: number;
  schwarzschildRadiusKm: number;
  periapsisAu: number;
  periapsisSchwarzschildRadii: number;
  apoapsisAu: number;
  periapsisSpeedKmS: number;
  /** Periapsis speed as a fraction of c. */
  periapsisSpeedFractionC: number;
  semiAmplitudeKmS: number;
  /** Schwarzschild precession, arcmin per orbit. */
  precessionArcminPerOrbit: number;
  gravitationalRedshiftAtPeriapsisKmS: number;
  transverseDopplerAtPeriapsisKmS: number;
  /** Range of the Rømer delay over the orbit (light time from the nearest to the farthest point), days. */
  romerDelayRangeDays: number;
  /**
   * Largest Rømer delay over the orbit (light time from the primary's plane of the sky to the
   * farthest point), days.
   */
  largestRomerDelayDays: number;
}

/** The physical quantities of an orbit with a distance. @throws InputError when the distance is missing. */
export function physicalQuantities(orbit: Orbit): PhysicalQuantities {
  if (orbit.distancePc === null)
    throw new InputError('orbit.distancePc', null, 'is needed for physical quantities');
  const aAu = semiMajorAxisAu(orbit.aMas, orbit.distancePc);
  const gm = massParameterM3S2(aAu, orbit.periodDays);
  const rsM = schwarzschildRadiusM(gm);
  const periAu = aAu * (1 - orbit.e);
  // Vis-viva at periapsis: v² = GM(2/r − 1/a).
  const vPeri = Math.sqrt(gm * (2 / (periAu * AU_M) - 1 / (aAu * AU_M))) / 1000;
  const z = lineOfSightExtremesAu(aAu, orbit.e, orbit.iRad, orbit.argRad);
  return {
    semiMajorAxisAu: aAu,
    massSolar: gm / GM_SUN_M3_PER_S2,
    schwarzschildRadiusAu: rsM / AU_M,
    schwarzschildRadiusKm: rsM / 1000,
    periapsisAu: periAu,
    periapsisSchwarzschildRadii: (periAu * AU_M) / rsM,
    apoapsisAu: aAu * (1 + orbit.e),
    periapsisSpeedKmS: vPeri,
    periapsisSpeedFractionC: vPeri / C_KM_PER_S,
    semiAmplitudeKmS: semiAmplitudeKmS(aAu, orbit.periodDays, orbit.e, orbit.iRad),
    precessionArcminPerOrbit: (precessionPerOrbitRad(gm, aAu * AU_M, orbit.e) * 180 * 60) / Math.PI,
    gravitationalRedshiftAtPeriapsisKmS: gravitationalRedshiftKmS(gm, periAu * AU_M),
    transverseDopplerAtPeriapsisKmS: transverseDopplerKmS(vPeri),
    romerDelayRangeDays: romerDelayDays(z.farthestAu - z.nearestAu),
    largestRomerDelayDays: romerDelayDays(z.farthestAu),
  };
}
