/**
 * A site's zone: a typo gets the nearest valid names; a longitude that contradicts its zone by
 * more than ZONE_LONGITUDE_TOLERANCE_HOURS is refused with the likely correction, unless confirmed.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  checkTimeZone,
  longitudeZoneMismatch,
  nearestZones,
  validateSite,
} from '../../../server/science/sky/index.ts';
import { inputError } from './helpers.ts';

describe('time zone names', () => {
  it('offers the intended zone first for slips of case, spelling and region', () => {
    // constructed cases: each typo is one or two edits from a real IANA name
    expect(nearestZones('America/Santigo')[0]).toBe('America/Santiago');
    expect(nearestZones('america/santiago')[0]).toBe('America/Santiago');
    expect(nearestZones('Pacific/Honululu')[0]).toBe('Pacific/Honolulu');
    expect(nearestZones('America/Argentina/SanJuan')[0]).toBe('America/Argentina/San_Juan');
    expect(nearestZones('Europe/Santiago')[0]).toBe('America/Santiago');
    const e = inputError(() => checkTimeZone('America/Santigo', 'site.timeZone'));
    expect(e.field).toBe('site.timeZone');
    expect(e.rule).toMatch(/nearest valid names: "America\/Santiago"/);
  });
});

describe('longitude against time zone', () => {
  const site = { name: 'Cerro Valdrin', latitudeDeg: -31.8, elevationM: 2500 };

  it('refuses a wrong-signed longitude and names the flipped one', () => {
    // the sign slips of the report: +68.93° in San Juan (UTC−3), +155.31° in Honolulu (UTC−10);
    // mean solar time = longitude / 15° per hour (common practice, no source)
    for (const [lon, zone, fixed] of [
      [68.93, 'America/Argentina/San_Juan', '-68.9300'],
      [155.31, 'Pacific/Honolulu', '-155.3100'],
    ] as const) {
      const e = inputError(() => validateSite({ ...site, longitudeDeg: lon, timeZone: zone }));
      expect(e.field).toBe('site.longitudeDeg');
      expect(e.value).toBe(lon);
      expect(e.rule).toContain(`longitude ${fixed}°`);
      expect(e.rule).toMatch(/longitudeZoneConfirmed/);
      const kept = validateSite({
        ...site,
        longitudeDeg: lon,
        timeZone: zone,
        longitudeZoneConfirmed: true,
      });
      expect(kept.longitudeDeg).toBe(lon);
    }
  });

  it('names a zone near the longitude when flipping the sign does not help', () => {
    const m = longitudeZoneMismatch(-31.8, 20, 'Pacific/Honolulu');
    expect(m?.correction).toMatch(/a zone near UTC\+1\.0 h/);
  });

  it('accepts sites in wide single-zone countries, UTC at any longitude, and polar stations', () => {
    // from memory: far-western China keeps UTC+8 at about 76° E (2.9 h off), Galicia keeps CET at
    // about 9° W (1.6 h off in winter), Kiribati's Line Islands keep UTC+14 at 157° W (0.5 h off)
    expect(longitudeZoneMismatch(39.5, 76, 'Asia/Shanghai')).toBeNull();
    expect(longitudeZoneMismatch(42.9, -9.3, 'Europe/Madrid')).toBeNull();
    expect(longitudeZoneMismatch(1.9, -157.4, 'Pacific/Kiritimati')).toBeNull();
    expect(longitudeZoneMismatch(-24.6, 120, 'UTC')).toBeNull();
    expect(longitudeZoneMismatch(-89.9, 0, 'Pacific/Auckland')).toBeNull();
  });

  it('accepts every longitude within 2.5 h of its fixed-offset zone, refuses the antipodal ones', () => {
    // constructed case: Etc/GMT±N are fixed offsets of ∓N hours (IANA tz database, from memory);
    // the antipodal longitude is 12 h from the zone, less the 2.5 h of the draw
    const wrap = (deg: number) => ((((deg + 180) % 360) + 360) % 360) - 180;
    fc.assert(
      fc.property(
        // Etc/GMT itself is UTC, exempt from the check
        fc.integer({ min: -11, max: 11 }).filter((n) => n !== 0),
        fc.double({ min: -1, max: 1, noNaN: true }),
        (n, f) => {
          const zone = `Etc/GMT${n > 0 ? '-' : '+'}${Math.abs(n)}`;
          const near = wrap(n * 15 + f * 37.5);
          expect(longitudeZoneMismatch(0, near, zone), `${near} in ${zone}`).toBeNull();
          const far = wrap(n * 15 + 180 + f * 37.5);
          expect(longitudeZoneMismatch(0, far, zone), `${far} in ${zone}`).not.toBeNull();
        },
      ),
    );
  });
});
