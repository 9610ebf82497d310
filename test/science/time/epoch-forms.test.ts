import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import {
  formatEpoch,
  jdToIso,
  jdToJulianEpoch,
  jdToMjd,
  parseEpoch,
} from '../../../server/science/time/index.ts';

// JD 2086302.5 … 2816787.5 is our documented range, the years 1000–3000 (README "Input forms")
const jd = fc.double({ min: 2_100_000, max: 2_800_000, noNaN: true });

describe('epochs as astronomers type them', () => {
  it('reads ISO 8601 with any offset: Z, ±hh, ±hh:mm, ±hhmm', () => {
    // 02:00 at UTC−3 is 05:00 UTC; 10:00 at UTC+5:30 is 04:30 UTC (ISO 8601 zone designators)
    expect(jdToIso(parseEpoch('2027-08-06T02:00-03'))).toBe('2027-08-06T05:00:00.000Z');
    expect(jdToIso(parseEpoch('2027-08-06T02:00-0300'))).toBe('2027-08-06T05:00:00.000Z');
    expect(jdToIso(parseEpoch('2027-03-01T10:00+05:30'))).toBe('2027-03-01T04:30:00.000Z');
    expect(jdToIso(parseEpoch('2027-03-01T04:30z'))).toBe('2027-03-01T04:30:00.000Z');
    // ISO 8601 allows a comma before the fraction of a second (ISO 8601-1:2019, 3.2.6, from memory)
    expect(jdToIso(parseEpoch('2027-03-01T04:30:15,25Z'))).toBe('2027-03-01T04:30:15.250Z');
  });

  it('reads bare Julian Dates and decimal years', () => {
    // J2000.0 = JD 2451545.0 (IAU, from memory); a bare number ≥ 1e6 is a JD (our rule, README)
    expect(parseEpoch('2451545.0')).toBe(2451545.0);
    expect(parseEpoch('2000.0')).toBe(2451545.0);
    // J2027.6 = 2451545 + 27.6 × 365.25 = 2461625.9 (Julian year of 365.25 d, IAU, from memory)
    expect(parseEpoch('2027.6')).toBeCloseTo(2461625.9, 9);
    expect(parseEpoch('2461234.5')).toBe(2461234.5);
    expect(parseEpoch('MJD 61234')).toBe(2461234.5); // MJD = JD − 2400000.5 (IAU 1973)
    // a bare number from 10000 up to 1e6 is an MJD (our rule, README "Input forms")
    expect(parseEpoch('61234')).toBe(2461234.5);
    expect(parseEpoch('10000')).toBe(2410000.5);
  });

  it('refuses zoneless times, decimal commas and bare numbers that are neither', () => {
    const refused: [string, RegExp][] = [
      ['2027-03-01T04:30', /add Z \(UTC\) or an offset/],
      ['2027,6', /use a decimal point: 2027\.6/],
      ['JD 2461234,5', /use a decimal point: JD 2461234\.5/],
      ['-2027', /is not a Julian Date/],
      ['9999.5', /is not a Julian Date/],
      ['2027-03-01T04:30+24:00', /at most ±23:59/],
      ['2027-03-01T04:30+05:60', /at most ±23:59/],
      ['3000.5', /is not a Julian Date/],
      ['99999999', /years 1000 and 3000/],
    ];
    for (const [v, rule] of refused) {
      try {
        parseEpoch(v, 'observedAt');
        expect.fail(`accepted ${v}`);
      } catch (e) {
        expect(e, v).toBeInstanceOf(InputError);
        expect((e as InputError).field).toBe('observedAt');
        expect((e as InputError).rule, v).toMatch(rule);
      }
    }
  });

  it('round-trips every form within 1e-9 of its own unit', () => {
    const forms: [string, (x: number) => string, (x: number) => number][] = [
      ['JD', (x) => `JD ${x}`, (x) => x],
      ['bare JD', (x) => String(x), (x) => x],
      ['MJD', (x) => `MJD ${jdToMjd(x)}`, jdToMjd],
      ['Julian epoch', (x) => `J${jdToJulianEpoch(x)}`, jdToJulianEpoch],
      ['decimal year', (x) => String(jdToJulianEpoch(x)), jdToJulianEpoch],
    ];
    for (const [name, write, unit] of forms) {
      fc.assert(
        fc.property(jd, (x) => {
          const text = write(x);
          expect(Math.abs(unit(parseEpoch(text)) - unit(x)), `${name}: ${text}`).toBeLessThan(1e-9);
        }),
      );
    }
    // a bare MJD from 10000 (JD 2410000.5, 1886) on: constructed case, MJD = JD − 2400000.5
    fc.assert(
      fc.property(jd, (x) => {
        const mjd = Math.max(jdToMjd(x), 10_000);
        expect(Math.abs(jdToMjd(parseEpoch(String(mjd))) - mjd), String(mjd)).toBeLessThan(1e-9);
      }),
    );
    // ISO to the millisecond (its written precision): 1 ms = 1.16e-8 d
    const offsets = ['Z', '-03', '+05:30', '-0930', '+14:00'];
    fc.assert(
      fc.property(jd, fc.constantFrom(...offsets), (x, zone) => {
        const utc = jdToIso(x);
        const text = zone === 'Z' ? utc : withOffset(utc, zone);
        expect(Math.abs(parseEpoch(text) - parseEpoch(utc)), text).toBeLessThan(1e-9);
        expect(Math.abs(parseEpoch(utc) - x)).toBeLessThan(1e-8);
      }),
    );
    fc.assert(
      fc.property(jd, (x) => {
        expect(Math.abs(parseEpoch(formatEpoch(x, 'jd')) - x)).toBeLessThan(1e-6);
      }),
    );
  });
});

/** The same instant written in local time at `zone` (±hh, ±hhmm or ±hh:mm). */
function withOffset(utcIso: string, zone: string): string {
  const m = /^([+-])(\d{2}):?(\d{2})?$/.exec(zone)!;
  const minutes = (m[1] === '-' ? -1 : 1) * (Number(m[2]) * 60 + Number(m[3] ?? 0));
  const local = new Date(Date.parse(utcIso) + minutes * 60_000).toISOString();
  return local.replace('Z', zone);
}
