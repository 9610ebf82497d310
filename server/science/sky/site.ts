/**
 * Observing sites: where the telescope stands, its clock's zone, its weather for refraction, and
 * where it may point (a minimum altitude, a horizon mask for mountains and domes, a Sun-avoidance
 * angle). `validateSite` is the one gate every caller (HTTP, CLI, store) passes a site through.
 */
import { Observer } from 'astronomy-engine';
import { InputError, requireFinite } from '../errors.ts';
import { standardAtmosphere } from './atmosphere.ts';
import { parseLatitude, parseLongitude } from './coordinates.ts';
import { DEFAULT_HUMIDITY, DEFAULT_WAVELENGTH_UM } from './refraction.ts';
import { checkTimeZone, describeMismatch, longitudeZoneMismatch } from './zones.ts';

/** One point of a horizon mask: below `altitudeDeg` at `azimuthDeg` the view is blocked. */
export interface HorizonPoint {
  /** Azimuth, degrees from north through east, [0, 360). */
  azimuthDeg: number;
  /** Lowest usable (refracted) altitude in that direction, degrees, [−5, 90). */
  altitudeDeg: number;
}

/** A site as callers give it. Units are in the names. */
export interface SiteInput {
  name?: string;
  /** Geodetic latitude, degrees, [−90, 90], north positive; a number or text (`-24:37:38`). */
  latitudeDeg: number | string;
  /** Longitude, degrees east of Greenwich, [−180, 360); a number or text (`-70°24′10″`). */
  longitudeDeg: number | string;
  /** Height above sea level, metres, [−500, 6000]. */
  elevationM: number;
  /** IANA time zone for local times, e.g. "America/Santiago". */
  timeZone: string;
  /**
   * The longitude and the zone disagree by more than a few hours and that is meant (a station
   * keeping another country's time): without it such a site is refused with the likely correction.
   */
  longitudeZoneConfirmed?: boolean;
  /** Air pressure, hPa, [0, 1100]; default from the elevation by the standard atmosphere; 0 turns refraction off. */
  pressureHpa?: number;
  /** Air temperature, °C, [−80, 60]; default from the elevation by the standard atmosphere. */
  temperatureC?: number;
  /** Relative humidity for refraction, %, [0, 100]; default 50. */
  humidityPct?: number;
  /** Wavelength observed, for refraction, µm, [0.3, 100]; default 2.2 (K band). */
  wavelengthUm?: number;
  /** Lowest altitude the telescope may point at, degrees, [−5, 89]; default 0. */
  lowestAltitudeDeg?: number;
  /** Azimuth-dependent horizon, linearly interpolated (wrapping through north). */
  horizonMask?: HorizonPoint[];
  /** Closest the telescope may point to the Sun, degrees, [0, 180); default 45. */
  leastSunDistanceDeg?: number;
}

/** Where a site's refraction wavelength came from; a campaign's band overrides the site's own. */
export const WAVELENGTH_SOURCES = ['campaign', 'site', 'default'] as const;
export type WavelengthSource = (typeof WAVELENGTH_SOURCES)[number];

const SOURCE_WORDS: Record<WavelengthSource, string> = {
  campaign: "the campaign's band",
  site: "the site's setting",
  default: 'no band set, the default',
};
/** Photometric bands by their usual effective wavelengths, µm (common practice, no source). */
const BANDS = [
  ['V', 0.55],
  ['J', 1.25],
  ['H', 1.65],
  ['K', 2.2],
] as const;

/** The weather and light a site's refraction is computed for, in words ("2.2 µm (K band; …), 50 % humidity, …"). */
export function refractionWords(site: Site): string {
  const band = BANDS.find(([, um]) => Math.abs(site.wavelengthUm / um - 1) < 0.02)?.[0];
  if (site.pressureHpa === 0) return 'no refraction (pressure 0 hPa)';
  return (
    `refraction at ${site.wavelengthUm} µm (${band ? `${band} band; ` : ''}` +
    `${SOURCE_WORDS[site.wavelengthFrom]}), ${site.humidityPct.toFixed(0)} % humidity, ` +
    `${site.pressureHpa.toFixed(0)} hPa, ${site.temperatureC.toFixed(1)} °C`
  );
}

/** A validated site: every default filled in. */
export interface Site {
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
  timeZone: string;
  pressureHpa: number;
  temperatureC: number;
  humidityPct: number;
  wavelengthUm: number;
  /** Where the wavelength came from: a campaign's band, the site's own setting, or the default (K band). */
  wavelengthFrom: WavelengthSource;
  lowestAltitudeDeg: number;
  /** Sorted by azimuth, no duplicates; empty for a flat horizon. */
  horizonMask: HorizonPoint[];
  leastSunDistanceDeg: number;
  /** astronomy-engine's observer for the same place. */
  observer: Observer;
}

/**
 * The same site with its astronomy-engine observer made again: a site that crossed a thread
 * boundary (structured clone) keeps its fields but loses the Observer's class.
 */
export function reviveSite(site: Site): Site {
  return site.observer instanceof Observer
    ? site
    : { ...site, observer: new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM) };
}

/** Sun-avoidance default, degrees (common practice, no source: a typical telescope interlock). */
export const DEFAULT_SUN_AVOIDANCE_DEG = 45;

function numberIn(field: string, value: unknown, lo: number, hi: number, hiOpen = false): number {
  const x = requireFinite(field, value);
  if (x < lo || (hiOpen ? x >= hi : x > hi)) {
    throw new InputError(field, value, `must lie in [${lo}, ${hi}${hiOpen ? ')' : ']'}`);
  }
  return x;
}

function optional(
  field: string,
  value: unknown,
  lo: number,
  hi: number,
  fallback: number,
  hiOpen = false,
): number {
  return value === undefined || value === null ? fallback : numberIn(field, value, lo, hi, hiOpen);
}

/** Check a site and fill its defaults. @throws InputError naming the first bad field. */
export function validateSite(input: unknown, prefix = 'site'): Site {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new InputError(
      prefix,
      input,
      'must be an object with latitudeDeg, longitudeDeg, elevationM and timeZone',
    );
  }
  const s = input as Record<string, unknown>;
  const f = (k: string) => `${prefix}.${k}`;
  const name = s.name === undefined ? 'site' : s.name;
  if (typeof name !== 'string' || name.trim() === '' || name.length > 100) {
    throw new InputError(f('name'), s.name, 'must be a non-empty string of at most 100 characters');
  }
  const latitudeDeg = parseLatitude(s.latitudeDeg, f('latitudeDeg'));
  let longitudeDeg = parseLongitude(s.longitudeDeg, f('longitudeDeg'));
  if (longitudeDeg > 180) longitudeDeg -= 360;
  const elevationM = numberIn(f('elevationM'), s.elevationM, -500, 6000);
  const timeZone = checkTimeZone(s.timeZone, f('timeZone'));
  if (s.longitudeZoneConfirmed !== undefined && typeof s.longitudeZoneConfirmed !== 'boolean') {
    throw new InputError(
      f('longitudeZoneConfirmed'),
      s.longitudeZoneConfirmed,
      'must be a boolean',
    );
  }
  const mismatch = longitudeZoneMismatch(latitudeDeg, longitudeDeg, timeZone);
  if (mismatch && s.longitudeZoneConfirmed !== true) {
    throw new InputError(
      f('longitudeDeg'),
      s.longitudeDeg,
      describeMismatch(mismatch, longitudeDeg, timeZone),
    );
  }
  const std = standardAtmosphere(elevationM);
  const pressureHpa = optional(f('pressureHpa'), s.pressureHpa, 0, 1100, std.pressureHpa);
  const temperatureC = optional(f('temperatureC'), s.temperatureC, -80, 60, std.temperatureC);
  const humidityPct = optional(f('humidityPct'), s.humidityPct, 0, 100, DEFAULT_HUMIDITY * 100);
  const wavelengthUm = optional(f('wavelengthUm'), s.wavelengthUm, 0.3, 100, DEFAULT_WAVELENGTH_UM);
  const lowestAltitudeDeg = optional(f('lowestAltitudeDeg'), s.lowestAltitudeDeg, -5, 89, 0);
  const leastSunDistanceDeg = optional(
    f('leastSunDistanceDeg'),
    s.leastSunDistanceDeg,
    0,
    180,
    DEFAULT_SUN_AVOIDANCE_DEG,
    true,
  );
  const horizonMask = validateMask(f('horizonMask'), s.horizonMask);
  return {
    name: name.trim(),
    latitudeDeg,
    longitudeDeg,
    elevationM,
    timeZone,
    pressureHpa,
    temperatureC,
    humidityPct,
    wavelengthUm,
    wavelengthFrom: s.wavelengthUm === undefined || s.wavelengthUm === null ? 'default' : 'site',
    lowestAltitudeDeg,
    horizonMask,
    leastSunDistanceDeg,
    observer: new Observer(latitudeDeg, longitudeDeg, elevationM),
  };
}

function validateMask(field: string, value: unknown): HorizonPoint[] {
  if (value === undefined || value === null) return [];
  if (!Array.isArray(value) || value.length > 720) {
    throw new InputError(
      field,
      value,
      'must be an array of at most 720 { azimuthDeg, altitudeDeg } points',
    );
  }
  const points = value.map((p: unknown, i) => {
    if (typeof p !== 'object' || p === null)
      throw new InputError(`${field}.${i}`, p, 'must be an object { azimuthDeg, altitudeDeg }');
    const q = p as Record<string, unknown>;
    return {
      azimuthDeg: numberIn(`${field}.${i}.azimuthDeg`, q.azimuthDeg, 0, 360, true),
      altitudeDeg: numberIn(`${field}.${i}.altitudeDeg`, q.altitudeDeg, -5, 90, true),
    };
  });
  points.sort((a, b) => a.azimuthDeg - b.azimuthDeg);
  for (let i = 1; i < points.length; i++) {
    if (points[i]!.azimuthDeg === points[i - 1]!.azimuthDeg) {
      throw new InputError(field, value, `must not give azimuth ${points[i]!.azimuthDeg}° twice`);
    }
  }
  return points;
}

/** Mask altitude (degrees) at an azimuth (degrees), interpolated linearly with wrap-around; −90 without a mask. */
export function maskAltitudeDeg(mask: readonly HorizonPoint[], azimuthDeg: number): number {
  const n = mask.length;
  if (n === 0) return -90;
  if (n === 1) return mask[0]!.altitudeDeg;
  let hi = 0;
  while (hi < n && mask[hi]!.azimuthDeg <= azimuthDeg) hi++;
  const a = mask[(hi - 1 + n) % n]!;
  const b = mask[hi % n]!;
  let span = b.azimuthDeg - a.azimuthDeg;
  let off = azimuthDeg - a.azimuthDeg;
  if (span <= 0) span += 360;
  if (off < 0) off += 360;
  return a.altitudeDeg + ((b.altitudeDeg - a.altitudeDeg) * off) / span;
}

/** Highest altitude anywhere on the mask, degrees (−90 without a mask). */
export function maskMaxAltitudeDeg(mask: readonly HorizonPoint[]): number {
  return mask.reduce((m, p) => Math.max(m, p.altitudeDeg), -90);
}
