/**
 * Atmospheric refraction scaled to the site's pressure and temperature.
 *
 * Sæmundsson's formula (Sky & Telescope 72, 70, 1986; Meeus, Astronomical Algorithms, eq. 16.4)
 * gives the refraction for a true altitude at 1010 hPa and 10 °C; it scales with P/T
 * (Meeus, ch. 16). Below −1° the lift tapers linearly to zero at the nadir so that the mapping
 * stays monotonic, as astronomy-engine does.
 */
import { DEG } from '../constants.ts';

/** Reference conditions of Sæmundsson's formula. */
const REF_PRESSURE_HPA = 1010;
const REF_TEMPERATURE_K = 283;

/** Scale of refraction for the weather, relative to the formula's reference (0 when pressure is 0). */
export function refractionScale(pressureHpa: number, temperatureC: number): number {
  return (pressureHpa / REF_PRESSURE_HPA) * (REF_TEMPERATURE_K / (273 + temperatureC));
}

/**
 * Refraction for a true (geometric) altitude, degrees; add it to get the apparent altitude.
 * @param trueAltDeg true altitude, degrees, [−90, 90]
 * @param scale from `refractionScale` (1 at 1010 hPa, 10 °C)
 */
export function refractionDeg(trueAltDeg: number, scale: number): number {
  if (scale === 0) return 0;
  const h = Math.max(trueAltDeg, -1);
  let r = 1.02 / Math.tan((h + 10.3 / (h + 5.11)) * DEG) / 60;
  if (trueAltDeg < -1) r *= (trueAltDeg + 90) / 89;
  return r * scale;
}

/** Apparent altitude of a true altitude, degrees. */
export function apparentAltitudeDeg(trueAltDeg: number, scale: number): number {
  return trueAltDeg + refractionDeg(trueAltDeg, scale);
}

/** True altitude that appears at `apparentAltDeg` (inverse of `apparentAltitudeDeg`), degrees. */
export function trueAltitudeDeg(apparentAltDeg: number, scale: number): number {
  let h = apparentAltDeg - refractionDeg(apparentAltDeg, scale);
  for (let i = 0; i < 30; i++) {
    const next = apparentAltDeg - refractionDeg(h, scale);
    if (Math.abs(next - h) < 1e-10) return next;
    h = next;
  }
  return h;
}
