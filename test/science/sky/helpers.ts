/** Shared test helpers: a seeded random source and random sites, targets and nights. */
import { InputError } from '../../../server/science/errors.ts';
import {
  validateSite,
  validateTarget,
  type Site,
  type Target,
} from '../../../server/science/sky/index.ts';

/** Park–Miller minimal standard generator: reproducible across runs. */
export function seeded(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
}

const ZONES = [
  'UTC',
  'America/Santiago',
  'Europe/Madrid',
  'Pacific/Honolulu',
  'Australia/Sydney',
  'Asia/Kolkata',
  'Africa/Johannesburg',
];

export function randomSite(rnd: () => number, maxLat = 60): Site {
  return validateSite({
    name: 'random site',
    latitudeDeg: (2 * rnd() - 1) * maxLat,
    longitudeDeg: 360 * rnd() - 180,
    elevationM: 4500 * rnd(),
    timeZone: ZONES[Math.floor(rnd() * ZONES.length)]!,
    // constructed case: any longitude with any zone, on purpose (the zone only names local times)
    longitudeZoneConfirmed: true,
  });
}

export function randomTarget(rnd: () => number, name = 'random star'): Target {
  return validateTarget({
    name,
    raDeg: 360 * rnd(),
    decDeg: (Math.asin(2 * rnd() - 1) * 180) / Math.PI,
    pmRaMasYr: 400 * (rnd() - 0.5),
    pmDecMasYr: 400 * (rnd() - 0.5),
  });
}

export function randomDate(rnd: () => number, year = 2027): string {
  const d = new Date(Date.UTC(year, 0, 1) + Math.floor(rnd() * 365) * 86_400_000);
  return d.toISOString().slice(0, 10);
}

export function stats(errs: number[]): { worst: number; rms: number } {
  if (errs.length === 0) return { worst: 0, rms: 0 };
  return {
    worst: Math.max(...errs.map(Math.abs)),
    rms: Math.sqrt(errs.reduce((s, e) => s + e * e, 0) / errs.length),
  };
}

/** The InputError a call throws (the test fails when it throws none, or another error). */
export function inputError(f: () => unknown): InputError {
  try {
    f();
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
  throw new Error('no InputError thrown');
}
