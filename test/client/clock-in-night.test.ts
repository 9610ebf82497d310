/** Clock times typed for a night land on the right day of the night's noon-to-noon span. */
import { describe, expect, test } from 'vitest';
import { clockInNight, clockOf } from '../../client/src/lib/time.ts';

// America/Mazatlan keeps UTC−7 all year (IANA tzdata, no daylight saving since 2022; from memory).
const zone = 'America/Mazatlan';
const start = Date.parse('2026-11-27T19:00:00Z'); // local noon of 2026-11-27
const end = Date.parse('2026-11-28T19:00:00Z');

describe('clockInNight', () => {
  test('evening times fall on the night’s date, morning times on the next day (constructed case)', () => {
    expect(clockInNight('22:40', zone, start, end)).toEqual({ iso: '2026-11-28T05:40:00Z' });
    expect(clockInNight('0510', zone, start, end)).toEqual({ iso: '2026-11-28T12:10:00Z' });
    expect(clockInNight('05:10:30', zone, start, end)).toEqual({ iso: '2026-11-28T12:10:30Z' });
    expect(clockInNight('12:00', zone, start, end)).toEqual({ iso: '2026-11-27T19:00:00Z' });
    expect(clockInNight('05:40', 'UTC', start, end)).toEqual({ iso: '2026-11-28T05:40:00Z' });
  });

  test('the hour skipped by a daylight-saving change does not exist (constructed case)', () => {
    // Europe/Berlin springs forward at 02:00 local on 2027-03-28 (EU rule: last Sunday of March, from memory).
    const s = Date.parse('2027-03-27T11:00:00Z');
    const e = Date.parse('2027-03-28T10:00:00Z');
    expect(clockInNight('02:30', 'Europe/Berlin', s, e)).toMatchObject({ rule: /skipped hour/ });
    expect(clockInNight('03:30', 'Europe/Berlin', s, e)).toEqual({ iso: '2027-03-28T01:30:00Z' });
  });

  test('text that is not a clock time is refused with the form to use', () => {
    for (const t of ['25:00', '22:61', '22h40', '', 'late'])
      expect(clockInNight(t, zone, start, end)).toMatchObject({ rule: /not a clock time/ });
  });

  test('clockOf reads back what clockInNight wrote', () => {
    expect(clockOf('2026-11-28T12:10:30Z', zone)).toBe('05:10:30');
    expect(clockOf('2026-11-28T05:40:00Z', zone)).toBe('22:40');
  });
});
