/**
 * Site weather defaults from the elevation by a standard atmosphere. Refraction scales with pressure
 * over temperature, so a site at 2.6 km refracts about a quarter less than one at sea level.
 */

/** Sea-level pressure, hPa, of the ICAO / U.S. Standard Atmosphere (1976); its 15 °C is the 288.15 K below. */
export const SEA_LEVEL_PRESSURE_HPA = 1013.25;
/** Tropospheric lapse rate, K/m, same source. */
export const LAPSE_RATE_K_PER_M = 0.0065;
/** Barometric exponent g·M/(R·L) for the troposphere, same source. */
const BAROMETRIC_EXPONENT = 5.25588;

/**
 * Standard-atmosphere pressure (hPa) and temperature (°C) at an elevation in metres (valid in the
 * troposphere, −500 m to 11 km).
 */
export function standardAtmosphere(elevationM: number): {
  pressureHpa: number;
  temperatureC: number;
} {
  const tK = 288.15 - LAPSE_RATE_K_PER_M * elevationM;
  return {
    pressureHpa: SEA_LEVEL_PRESSURE_HPA * (tK / 288.15) ** BAROMETRIC_EXPONENT,
    temperatureC: tK - 273.15,
  };
}
