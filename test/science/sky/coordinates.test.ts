import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import {
  formatDecDms,
  formatRaHms,
  parseDeclination,
  parseLatitude,
  parseLongitude,
  parseRightAscension,
} from '../../../server/science/sky/index.ts';

/** Whole units, whole minutes and seconds with 10 decimals: exact enough for a 1e-9° round trip. */
function parts(x: number): [number, number, string] {
  const a = Math.abs(x);
  const whole = Math.floor(a);
  const minutes = Math.floor((a - whole) * 60);
  const seconds = (a - whole - minutes / 60) * 3600;
  return [whole, minutes, Math.max(0, seconds).toFixed(10)];
}

const raForms: [string, (deg: number) => string][] = [
  ['degrees', (d) => String(d)],
  ['degrees with d', (d) => `${d}d`],
  ['degrees with °', (d) => `${d}°`],
  ['hours with h', (d) => `${d / 15}h`],
  ['h:m:s', (d) => parts(d / 15).join(':')],
  ['h m s', (d) => parts(d / 15).join(' ')],
  ['XhYmZs', (d) => `${parts(d / 15)[0]}h${parts(d / 15)[1]}m${parts(d / 15)[2]}s`],
];

const sign = (d: number) => (d < 0 ? '-' : '+');
const decForms: [string, (deg: number) => string][] = [
  ['degrees', (d) => String(d)],
  ['degrees with d', (d) => `${d}d`],
  ['±d:m:s', (d) => sign(d) + parts(d).join(':')],
  ['±d m s', (d) => sign(d) + parts(d).join(' ')],
  ['±d°m′s″', (d) => `${sign(d)}${parts(d)[0]}°${parts(d)[1]}′${parts(d)[2]}″`],
  ['±dDmMsS', (d) => `${sign(d)}${parts(d)[0]}d${parts(d)[1]}m${parts(d)[2]}s`],
  ['Unicode minus', (d) => (d < 0 ? `\u2212${-d}` : String(d))],
];

const ra = fc.double({ min: 0, max: 359.999999, noNaN: true });
const dec = fc.double({ min: -90, max: 90, noNaN: true });

describe('right ascension and declination as typed', () => {
  it('reads 16h41m12.5s as 250.302083…° in every hour form', () => {
    // sexagesimal arithmetic: (16 + 41/60 + 12.5/3600) × 15 = 250.3020833… (common practice, no source)
    const expected = (16 + 41 / 60 + 12.5 / 3600) * 15;
    expect(expected).toBeCloseTo(250.3020833333, 9);
    for (const s of ['16:41:12.5', '16 41 12.5', '16h41m12.5s', '16h 41m 12.5s', ' 16:41:12.5 ']) {
      expect(parseRightAscension(s), s).toBeCloseTo(expected, 10);
    }
    // 16.69 h × 15 °/h = 250.35° (common practice, no source); a bare decimal stays degrees
    expect(parseRightAscension('16.69h')).toBeCloseTo(250.35, 10);
    expect(parseRightAscension('16.69')).toBe(16.69);
    expect(parseRightAscension('250.3d')).toBe(250.3);
    expect(parseRightAscension(250.3)).toBe(250.3);
    expect(parseRightAscension('16:41.5')).toBeCloseTo((16 + 41.5 / 60) * 15, 10);
  });

  it('reads a declination sign as applying to the whole value', () => {
    // −(26 + 41/60 + 12/3600) = −26.686666…° (common practice, no source)
    const expected = -(26 + 41 / 60 + 12 / 3600);
    for (const s of [
      '-26:41:12',
      '-26 41 12',
      '-26°41′12″',
      `-26°41'12"`,
      '-26d41m12s',
      '−26:41:12',
    ]) {
      expect(parseDeclination(s), s).toBeCloseTo(expected, 10);
    }
    // −00:30:00 is −0.5°, the sign on a zero degree field (common practice, no source)
    expect(parseDeclination('-00:30:00')).toBe(-0.5);
    expect(parseDeclination('+00:30:00')).toBe(0.5);
    expect(parseDeclination('-26.5°')).toBe(-26.5);
    expect(parseDeclination('90')).toBe(90);
    expect(parseDeclination(-90)).toBe(-90);
  });

  it('round-trips every right ascension and declination form within 1e-9°', () => {
    // Site latitude and longitude take the declination's forms (constructed case: own round trip).
    const lon = fc.double({ min: -180, max: 180, noNaN: true });
    const cases = [
      [raForms, ra, parseRightAscension],
      [decForms, dec, parseDeclination],
      [decForms, dec, parseLatitude],
      [decForms, lon, parseLongitude],
    ] as const;
    for (const [forms, values, parse] of cases) {
      for (const [name, form] of forms) {
        fc.assert(
          fc.property(values, (d) => {
            const text = form(d);
            expect(Math.abs(parse(text, 'coordinate') - d), `${name}: ${text}`).toBeLessThan(1e-9);
          }),
        );
      }
    }
  });

  it('formats back to sexagesimal that parses to the same value', () => {
    // 250.3020833…° = 16h41m12.50s (same arithmetic as above, common practice, no source)
    expect(formatRaHms(250.30208333333334)).toBe('16:41:12.50');
    expect(formatDecDms(-0.5)).toBe('-00:30:00.0');
    expect(formatRaHms(359.9999999999)).toBe('00:00:00.00');
    expect(formatDecDms(-26.999999999)).toBe('-27:00:00.0');
    fc.assert(
      fc.property(ra, dec, (r, d) => {
        expect(Math.abs(parseRightAscension(formatRaHms(r, 9)) - (r % 360))).toBeLessThan(1e-8);
        expect(Math.abs(parseDeclination(formatDecDms(d, 9)) - d)).toBeLessThan(1e-9);
      }),
    );
  });

  it('refuses malformed or out-of-range values, naming the field', () => {
    const refusedRa: [string | number, RegExp][] = [
      ['250,3', /use a decimal point: 250\.3/],
      ['16:41:12,5', /use a decimal point: 16:41:12\.5/],
      ['360', /\[0, 360\)/],
      ['24:00:00', /\[0, 24\) h/],
      ['24h', /\[0, 24\) h/],
      ['16:60:00', /minutes in \[0, 60\)/],
      ['16:41:60', /seconds in \[0, 60\)/],
      ['16:41.5:12', /last component/],
      ['-1', /negative/],
      ['164112.5', /\[0, 360\)/],
      ['abc', /is not a right ascension/],
      ['', /is not a right ascension/],
      [Number.NaN, /finite/],
    ];
    for (const [v, rule] of refusedRa) {
      try {
        parseRightAscension(v, 'targets.0.raDeg');
        expect.fail(`accepted ${String(v)}`);
      } catch (e) {
        expect(e, String(v)).toBeInstanceOf(InputError);
        expect((e as InputError).field).toBe('targets.0.raDeg');
        expect((e as InputError).rule, String(v)).toMatch(rule);
      }
    }
    const refusedDec: [unknown, RegExp][] = [
      ['-26,5', /use a decimal point: -26\.5/],
      ['90:00:01', /\[-90, 90\]/],
      ['-91', /\[-90, 90\]/],
      ['-26:61:00', /minutes in \[0, 60\)/],
      ['16h41m', /is not a declination/],
      [null, /string or number/],
    ];
    for (const [v, rule] of refusedDec) {
      expect(() => parseDeclination(v, 'decDeg'), String(v)).toThrow(rule);
    }
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9 }), fc.integer({ min: 0, max: 9 }), (a, b) => {
        expect(() => parseDeclination(`${a},${b}`, 'decDeg')).toThrow(/decDeg.*decimal point/);
        expect(() => parseRightAscension(`${a},${b}`, 'raDeg')).toThrow(/raDeg.*decimal point/);
      }),
    );
  });
});
