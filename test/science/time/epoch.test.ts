import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import {
  epochRange,
  jdToIso,
  parseDurationDays,
  parseEpoch,
} from '../../../server/science/time/index.ts';

describe('epochs', () => {
  it('reads J2000.0 as JD 2451545.0', () => {
    // IAU: the J2000.0 epoch is JD 2451545.0 (definition of the Julian epoch)
    expect(parseEpoch('J2000.0')).toBe(2451545.0);
    expect(parseEpoch('JD 2451545.0')).toBe(2451545.0);
  });

  it('reads B1950.0 as JD 2433282.4235 and B1900.0 as JD 2415020.3135', () => {
    // Lieske, A&A 73, 282 (1979): B1950.0 = JD 2433282.4235, B1900.0 = JD 2415020.3135 (from memory)
    expect(parseEpoch('B1950.0')).toBeCloseTo(2433282.4235, 4);
    expect(parseEpoch('B1900')).toBeCloseTo(2415020.3135, 4);
  });

  it('reads MJD and ISO 8601 in UTC, with offsets and date-only forms', () => {
    // MJD = JD − 2400000.5 (IAU 1973 convention); the Unix epoch is JD 2440587.5 (common practice, no source)
    expect(parseEpoch('MJD 0')).toBe(2400000.5);
    expect(parseEpoch('1970-01-01T00:00:00Z')).toBe(2440587.5);
    expect(parseEpoch('1970-01-01')).toBe(2440587.5);
    expect(parseEpoch('1970-01-01T02:00+02:00')).toBe(2440587.5);
    expect(jdToIso(parseEpoch('2027-03-01T04:30:15.250Z'))).toBe('2027-03-01T04:30:15.250Z');
  });

  it('refuses ambiguous or impossible epochs, naming the field and the rule', () => {
    const bad = ['2027-03-01T04:30', '2027-02-30', 'yesterday', 'J', 'JD abc', 'J9999', ''];
    for (const b of bad) {
      expect(() => parseEpoch(b, 'epochs.0')).toThrow(InputError);
    }
    try {
      parseEpoch('2027-03-01T04:30', 'start');
    } catch (e) {
      expect((e as InputError).field).toBe('start');
      expect((e as InputError).message).toMatch(/time zone/);
    }
    expect(() => parseEpoch(2451545 as unknown, 'at')).toThrow(/epoch string/);
  });

  it('holds every form to the one range, years 1000–3000 (the ISO form included)', () => {
    // the range is ours (documented in README); JD 0 is 4713 BC (Meeus, Astronomical Algorithms, ch. 7)
    const outside = [
      '9999-01-01T00:00:00Z',
      '0999-12-31',
      '0050-01-01',
      'JD 0',
      'MJD -1e6',
      'J3001',
      'B999',
    ];
    for (const b of outside) expect(() => parseEpoch(b, 'epoch'), b).toThrow(/years 1000 and 3000/);
    expect(jdToIso(parseEpoch('1000-01-01T00:00:00Z'))).toBe('1000-01-01T00:00:00.000Z');
    expect(jdToIso(parseEpoch('2999-12-31T00:00:00Z'))).toBe('2999-12-31T00:00:00.000Z');
  });

  it('builds ranges', () => {
    expect(parseDurationDays('PT6H')).toBe(0.25); // 6 h = 1/4 d (definition of the hour)
    expect(Array.from(epochRange(10, 12, 1))).toEqual([10, 11, 12]);
    expect(() => epochRange(0, 1e9, 1)).toThrow(/at most/);
  });
});
