/**
 * Airmass and the seeing it implies. Kasten & Young (1989) by default; the plane-parallel sec z,
 * Hardie (1962) and Pickering (2002) on request. Each formula takes the zenith distance it was
 * published for, so callers pass both the true and the apparent altitude.
 */
import { DEG } from '../constants.ts';
import { apparentAltitudeDeg, type RefractionModel } from './refraction.ts';

export const AIRMASS_FORMULAS = ['kasten-young', 'secant', 'hardie', 'pickering'] as const;
export type AirmassFormula = (typeof AIRMASS_FORMULAS)[number];

/**
 * Airmass, dimensionless (≥ ~1), or Infinity when the formula has no value (below its horizon).
 * @param trueAltDeg true (unrefracted) altitude, degrees
 * @param apparentAltDeg refracted altitude, degrees
 */
export function airmass(
  formula: AirmassFormula,
  trueAltDeg: number,
  apparentAltDeg: number,
): number {
  switch (formula) {
    case 'kasten-young': {
      // Kasten & Young, Applied Optics 28, 4735 (1989): z is the true zenith distance, degrees.
      const z = 90 - trueAltDeg;
      if (z >= 96.07995) return Infinity;
      return 1 / (Math.cos(z * DEG) + 0.50572 * (96.07995 - z) ** -1.6364);
    }
    case 'secant':
      return apparentAltDeg > 0 ? 1 / Math.sin(apparentAltDeg * DEG) : Infinity;
    case 'hardie': {
      // Hardie, in Astronomical Techniques (1962): a polynomial in sec z − 1, apparent z, valid to z ≈ 85°.
      if (apparentAltDeg <= 0) return Infinity;
      const s = 1 / Math.sin(apparentAltDeg * DEG) - 1;
      return s + 1 - 0.0018167 * s - 0.002875 * s * s - 0.0008083 * s * s * s;
    }
    case 'pickering': {
      // Pickering, DIO 12, 3 (2002): apparent altitude h in degrees.
      const h = apparentAltDeg;
      if (h <= 0) return Infinity;
      return 1 / Math.sin((h + 244 / (165 + 47 * h ** 1.1)) * DEG);
    }
  }
}

/**
 * The apparent altitude (degrees) at which a formula reaches `highestAirmass` (> 1): the lowest usable
 * altitude for that airmass limit. Found by bisection on the true altitude (airmass falls as it rises).
 */
export function altitudeForAirmass(
  formula: AirmassFormula,
  highestAirmass: number,
  refraction: RefractionModel,
): number {
  let lo = -1,
    hi = 90;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    const x = airmass(formula, mid, apparentAltitudeDeg(mid, refraction));
    if (x > highestAirmass) lo = mid;
    else hi = mid;
  }
  return apparentAltitudeDeg(hi, refraction);
}

/** Seeing FWHM at an airmass from the zenith FWHM (any angular unit): FWHM ∝ X^0.6 (Roddier 1981). */
export function seeingAtAirmass(zenithFwhm: number, airmassValue: number): number {
  return zenithFwhm * airmassValue ** 0.6;
}
