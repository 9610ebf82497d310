/**
 * Atmospheric refraction from the weather and the wavelength observed.
 *
 * Above 15° true altitude: R = A·tan z + B·tan³ z (z the observed zenith distance), with A and B
 * from pressure, temperature, relative humidity and wavelength by the published formulas that
 * ERFA's `refco` also uses: the refractivity of moist air with its dispersion (Hohenkerk &
 * Sinclair, HM Nautical Almanac Office NAO Technical Note 63, 1985; the saturation vapour pressure
 * of Gill, Atmosphere–Ocean Dynamics, 1982, Appendix 4), the ratio of the scale height to the
 * Earth's radius β = 4.4474e-6·T (Stone, PASP 108, 1051, 1996) and the constants
 * A = γ(1 − β), B = −γ(β − γ/2) (Green, Spherical Astronomy, 1987, §4.31). From the true zenith
 * distance z the refraction follows by one Newton step of z_obs + R(z_obs) = z, as ERFA's `atioq`
 * takes it. All from memory; checked against ERFA in test/science/sky/refraction-band.test.ts.
 *
 * Below 15°, where the tan z series fails, Sæmundsson's formula (Sky & Telescope 72, 70, 1986;
 * Meeus, Astronomical Algorithms, eq. 16.4) gives the shape, scaled to meet the series at 15°, so
 * the mapping is continuous; within 2 % of ERFA down to 5° (LOWEST_CHECKED_ALTITUDE_DEG). Below
 * −1° the lift tapers linearly to zero at the nadir so that the
 * mapping stays monotonic, as astronomy-engine does.
 */
import { DEG } from '../constants.ts';

/** Relative humidity a site is given when none is stored, 0–1 (a middle value). */
export const DEFAULT_HUMIDITY = 0.5;
/** Wavelength a site observes at when none is stored, µm: the K band these stars are followed in. */
export const DEFAULT_WAVELENGTH_UM = 2.2;

/** The weather and the light that refraction depends on. */
export interface RefractionConditions {
  /** Air pressure at the telescope, hPa, ≥ 0 (0: no atmosphere). */
  pressureHpa: number;
  /** Air temperature, °C. */
  temperatureC: number;
  /** Relative humidity, 0–1. */
  humidity: number;
  /** Effective wavelength, µm, 0.3–100 (the optical/infrared branch of the formulas). */
  wavelengthUm: number;
}

/** A site's refraction, prepared once: the constants of the series and the scale of the low part. */
export interface RefractionModel {
  /** A and B of R = A·tan z + B·tan³ z, radians. */
  aRad: number;
  bRad: number;
  /** Sæmundsson's refraction (1010 hPa, 10 °C) times this meets the series at the seam. */
  lowScale: number;
}

export const NO_REFRACTION: RefractionModel = { aRad: 0, bRad: 0, lowScale: 0 };

/**
 * The lowest true altitude (degrees) where the model is checked against an outside one: ERFA's
 * refraction agrees within 2 % (6″; 1.8 %, 5.5″ worst over 240 cases) from here to 15°
 * (test/science/sky/refraction-band.test.ts).
 * Below it only Bennett's horizon value checks the shape; altitudes there are low-trust.
 */
export const LOWEST_CHECKED_ALTITUDE_DEG = 5;

/** Where the series hands over to the scaled Sæmundsson shape, true altitude in degrees. */
export const SERIES_LOWEST_ALTITUDE_DEG = 15;

/** A and B (radians) of R = A·tan z + B·tan³ z for the conditions (formulas in the module comment). */
export function refractionConstants(c: RefractionConditions): { aRad: number; bRad: number } {
  const p = c.pressureHpa,
    t = c.temperatureC,
    rh = c.humidity,
    wl = c.wavelengthUm;
  if (!(p > 0)) return { aRad: 0, bRad: 0 };
  // Saturation vapour pressure over water (Gill 1982) with the enhancement factor for moist air.
  const ps =
    10 ** ((0.7859 + 0.03477 * t) / (1 + 0.00412 * t)) * (1 + p * (4.5e-6 + 6e-10 * t * t));
  const pw = (rh * ps) / (1 - ((1 - rh) * ps) / p);
  const tk = t + 273.15;
  const wl2 = wl * wl;
  const gamma = ((77.53484e-6 + (4.39108e-7 + 3.666e-9 / wl2) / wl2) * p - 11.2684e-6 * pw) / tk;
  const beta = 4.4474e-6 * tk;
  return { aRad: gamma * (1 - beta), bRad: -gamma * (beta - gamma / 2) };
}

/** The series' refraction for a true zenith distance (radians), by one Newton step. */
function seriesRad(aRad: number, bRad: number, zRad: number): number {
  const c = Math.cos(zRad),
    tz = Math.sin(zRad) / c,
    w = bRad * tz * tz;
  return ((aRad + w) * tz) / (1 + (aRad + 3 * w) / (c * c));
}

/** Sæmundsson's refraction at 1010 hPa, 10 °C for a true altitude, degrees. */
function saemundssonDeg(trueAltDeg: number): number {
  const h = Math.max(trueAltDeg, -1);
  let r = 1.02 / Math.tan((h + 10.3 / (h + 5.11)) * DEG) / 60;
  if (trueAltDeg < -1) r *= (trueAltDeg + 90) / 89;
  return r;
}

/** The refraction model for the conditions. */
export function refractionModel(c: RefractionConditions): RefractionModel {
  const { aRad, bRad } = refractionConstants(c);
  if (aRad === 0) return NO_REFRACTION;
  const seamZ = (90 - SERIES_LOWEST_ALTITUDE_DEG) * DEG;
  const lowScale = seriesRad(aRad, bRad, seamZ) / DEG / saemundssonDeg(SERIES_LOWEST_ALTITUDE_DEG);
  return { aRad, bRad, lowScale };
}

/** A site's model: its pressure and temperature, humidity in %, wavelength in µm. */
export function siteRefraction(site: {
  pressureHpa: number;
  temperatureC: number;
  humidityPct: number;
  wavelengthUm: number;
}): RefractionModel {
  return refractionModel({
    pressureHpa: site.pressureHpa,
    temperatureC: site.temperatureC,
    humidity: site.humidityPct / 100,
    wavelengthUm: site.wavelengthUm,
  });
}

/**
 * Refraction for a true (geometric) altitude, degrees; add it to get the apparent altitude.
 * @param trueAltDeg true altitude, degrees, [−90, 90]
 */
export function refractionDeg(trueAltDeg: number, model: RefractionModel): number {
  if (model.aRad === 0) return 0;
  if (trueAltDeg >= SERIES_LOWEST_ALTITUDE_DEG)
    return seriesRad(model.aRad, model.bRad, (90 - trueAltDeg) * DEG) / DEG;
  return saemundssonDeg(trueAltDeg) * model.lowScale;
}

/** Apparent altitude of a true altitude, degrees. */
export function apparentAltitudeDeg(trueAltDeg: number, model: RefractionModel): number {
  return trueAltDeg + refractionDeg(trueAltDeg, model);
}

/** True altitude that appears at `apparentAltDeg` (inverse of `apparentAltitudeDeg`), degrees. */
export function trueAltitudeDeg(apparentAltDeg: number, model: RefractionModel): number {
  let h = apparentAltDeg - refractionDeg(apparentAltDeg, model);
  for (let i = 0; i < 30; i++) {
    const next = apparentAltDeg - refractionDeg(h, model);
    if (Math.abs(next - h) < 1e-10) return next;
    h = next;
  }
  return h;
}
