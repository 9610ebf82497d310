/**
 * ISO 8601 durations (ISO 8601-1:2019, 5.5.2.4 "duration", from memory): every accepted form reads
 * to the days its designators say and round-trips through the canonical form; every refused form
 * is named by its rule.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import {
  formatDuration,
  parseDurationDays,
  parseDurationMinutes,
} from '../../../server/science/time/index.ts';

// Days per unit: 1 W = 7 d, 1 d = 24 h = 1440 min = 86400 s (SI brochure, 9th ed., table 8: non-SI
// units accepted for use with the SI, from memory).
const ACCEPTED: [string, number][] = [
  ['P30D', 30],
  ['PT6H', 0.25],
  ['PT15M', 15 / 1440],
  ['PT90S', 90 / 86_400],
  ['P2W', 14],
  ['P1DT12H', 1.5],
  ['P1DT2H3M4S', 1 + 2 / 24 + 3 / 1440 + 4 / 86_400],
  ['PT0.5S', 0.5 / 86_400],
  ['PT1,5H', 1.5 / 24], // ISO 8601 allows the comma as the decimal sign
  ['P0.5D', 0.5],
  ['P1W2D', 9], // weeks combined with other components: allowed since ISO 8601-1:2019
  ['PT36H', 1.5], // components need not be carried over
  ['P365D', 365],
];

describe('ISO 8601 durations', () => {
  it.each(ACCEPTED)('reads %s and round-trips it', (text, days) => {
    const d = parseDurationDays(text);
    expect(Math.abs(d - days)).toBeLessThan(1e-12 * Math.max(1, days));
    const canonical = formatDuration(d);
    expect(Math.abs(parseDurationDays(canonical) - d)).toBeLessThan(1e-3 / 86_400); // to 1 ms
    expect(formatDuration(parseDurationDays(canonical))).toBe(canonical); // canonical is a fixed point
  });

  it('writes the canonical form with the largest units, zero components left out', () => {
    expect(formatDuration(30)).toBe('P30D');
    expect(formatDuration(1.5)).toBe('P1DT12H');
    expect(formatDuration(5 / 1440)).toBe('PT5M');
    expect(formatDuration(14)).toBe('P14D');
    expect(formatDuration(0.5 / 86_400)).toBe('PT0.5S');
    expect(formatDuration(0)).toBe('PT0S');
    expect(() => formatDuration(-1)).toThrow(RangeError);
  });

  it('gives minutes for fields the science takes in minutes', () => {
    expect(parseDurationMinutes('PT5M', 'step')).toBeCloseTo(5, 12);
    expect(parseDurationMinutes('PT0S', 'curveStep', { allowZero: true })).toBe(0);
  });

  const REFUSED: [unknown, RegExp][] = [
    ['30d', /ISO 8601 duration such as P30D/], // the short forms of earlier versions
    ['6h', /ISO 8601 duration such as/],
    ['15min', /ISO 8601 duration such as/],
    [30, /ISO 8601 duration such as/], // a bare number has no unit
    ['P1Y', /years and months have no fixed length/],
    ['P2M', /years and months have no fixed length/],
    ['-P1D', /positive ISO 8601 duration \(no sign\)/],
    ['P', /at least one component/],
    ['PT', /at least one component/],
    ['P1DT', /at least one component/],
    ['p1d', /upper-case designators/],
    ['P1.5DT2H', /only the last component may have a fraction/],
    ['P0D', /positive duration/],
    ['PT0S', /positive duration/],
    ['P1H', /ISO 8601 duration such as/], // hours belong after T
    ['', /ISO 8601 duration such as/],
  ];
  it.each(REFUSED)('refuses %j, naming the field and the rule', (value, rule) => {
    try {
      parseDurationDays(value, 'epochs.step');
      expect.unreachable(`${String(value)} was accepted`);
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).field).toBe('epochs.step');
      expect((e as InputError).message).toMatch(rule);
    }
  });
});

describe('duration bounds', () => {
  it('are exact in minutes and named when broken', () => {
    expect(parseDurationMinutes('PT30M', 'step', { atMost: 'PT30M' })).toBe(30); // exactly, no rounding
    expect(() => parseDurationMinutes('PT31M', 'step', { atMost: 'PT30M' })).toThrow(
      /at most PT30M/,
    );
    expect(() => parseDurationMinutes('PT30S', 'step', { atLeast: 'PT1M' })).toThrow(
      /at least PT1M/,
    );
  });
});
