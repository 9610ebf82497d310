import { describe, expect, it } from 'vitest';
import { nowIso, nowMs } from '../server/clock.ts';

describe('the clock', () => {
  it('is frozen by EPOCHWRIGHT_NOW, and the system clock without it', () => {
    expect(nowIso({ EPOCHWRIGHT_NOW: '2027-05-01T03:00:00+02:00' })).toBe(
      '2027-05-01T01:00:00.000Z',
    );
    const before = Date.now();
    const t = nowMs({});
    expect(t).toBeGreaterThanOrEqual(before);
    expect(t).toBeLessThanOrEqual(Date.now());
  });

  it('refuses an instant without its zone, or not an instant at all, naming the variable', () => {
    expect(() => nowMs({ EPOCHWRIGHT_NOW: '2027-05-01T03:00' })).toThrow(
      /EPOCHWRIGHT_NOW: "2027-05-01T03:00" must be an ISO 8601 instant with its zone/,
    );
    expect(() => nowMs({ EPOCHWRIGHT_NOW: 'tomorrow' })).toThrow(/EPOCHWRIGHT_NOW/);
  });

  it('is the frozen test instant inside the unit suite (vitest.config.ts)', () => {
    expect(nowIso()).toBe('2026-12-01T12:00:00.000Z');
  });
});
