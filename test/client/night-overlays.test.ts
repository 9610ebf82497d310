/**
 * The night chart's overlays: the Moon's curve starts and ends at its interpolated horizon crossings,
 * and the horizon-mask areas cover exactly the stretches where the mask stands above the limit while
 * the target is up.
 * Inputs are made-up samples; the expected crossings follow from linear interpolation between them.
 */
import { describe, expect, test } from 'vitest';
import { maskAboveLimitPaths, moonAbovePath, runs } from '../../client/src/plots/night-overlays.ts';

const id = (v: number) => v;
const points = (d: string) =>
  d
    .split(/[MLZ]/)
    .filter(Boolean)
    .map((p) => p.split(',').map(Number) as [number, number]);

describe('runs', () => {
  test('finds each stretch of true samples, including one at either end', () => {
    const on = [true, true, false, false, true, false, true];
    expect(runs(on.length, (k) => on[k]!)).toEqual([
      [0, 1],
      [4, 4],
      [6, 6],
    ]);
    expect(runs(3, () => false)).toEqual([]);
  });
});

describe('Moon curve above the horizon', () => {
  test('rises between samples: the piece starts at the linear crossing of 0°', () => {
    // −10° at t=0 and +10° at t=100: the crossing lies halfway, at t=50 (linear interpolation).
    const d = moonAbovePath([0, 100, 200, 300], [-10, 10, 30, 20], id, id);
    expect(d.startsWith('M')).toBe(true);
    expect(points(d)).toEqual([
      [50, 0],
      [100, 10],
      [200, 30],
      [300, 20],
    ]);
  });

  test('sets and rises again: two pieces, each closed at its crossing', () => {
    // +30° → −10° crosses at 3/4 of the step; −10° → +10° at 1/2 (linear interpolation).
    const d = moonAbovePath([0, 40, 80, 120], [30, -10, 10, 20], id, id);
    expect(d.match(/M/g)).toHaveLength(2);
    expect(points(d)).toEqual([
      [0, 30],
      [30, 0],
      [60, 0],
      [80, 10],
      [120, 20],
    ]);
  });

  test('a Moon below the horizon all night draws nothing', () => {
    expect(moonAbovePath([0, 1, 2], [-5, -20, -40], id, id)).toBe('');
  });
});

describe('horizon mask above the altitude limit', () => {
  test('one closed area from the crossing up, along the mask, and back down to the limit', () => {
    // Limit 30°: the mask 20 → 40 crosses it halfway (t=50), 40 → 20 halfway again (t=250).
    const [d, ...rest] = maskAboveLimitPaths(
      [0, 100, 200, 300],
      [20, 40, 40, 20],
      [50, 50, 50, 50],
      30,
      id,
      id,
    );
    expect(rest).toEqual([]);
    expect(d!.endsWith('Z')).toBe(true);
    expect(points(d!)).toEqual([
      [50, 30],
      [100, 40],
      [200, 40],
      [250, 30],
    ]);
  });

  test('a mask everywhere at or below the limit draws nothing', () => {
    expect(maskAboveLimitPaths([0, 1, 2], [30, 10, 29.9], [50, 50, 50], 30, id, id)).toEqual([]);
  });

  test('nothing while the target is below the horizon; an edge set by its setting stops at its last sample up', () => {
    // The mask stays at 40° (above the 30° limit) but the target sets between t=100 and t=200.
    const [d, ...rest] = maskAboveLimitPaths(
      [0, 100, 200, 300],
      [20, 40, 40, 40],
      [60, 10, -5, -20],
      30,
      id,
      id,
    );
    expect(rest).toEqual([]);
    expect(points(d!)).toEqual([
      [50, 30],
      [100, 40],
      [100, 30],
    ]);
  });
});
