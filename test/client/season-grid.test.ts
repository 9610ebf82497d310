/**
 * The season chart's geometry in node: hour classes and their runs, strips shared by identical
 * nights, nights on the site's clock, periapsis ± σ as instants, rows that do not overlap.
 * Inputs are made up; expected values follow from the rules stated beside them.
 */
import { describe, expect, test } from 'vitest';
import {
  HOUR_EDGES,
  hourClass,
  hourOpacity,
  hourRuns,
  localNoonMs,
  nightIndex,
  periapsisSpan,
  seasonAxis,
  seasonLayout,
  stripGroups,
} from '../../client/src/plots/season-grid.ts';

describe('hour classes', () => {
  test('no hour is blank; classes follow the edges; beyond the last edge is the last class', () => {
    expect(hourClass(0)).toBe(-1);
    expect(hourClass(0.5)).toBe(0);
    expect(hourClass(1)).toBe(1);
    expect(hourClass(3.9)).toBe(2);
    expect(hourClass(9)).toBe(HOUR_EDGES.length - 2);
    expect(hourClass(11)).toBe(HOUR_EDGES.length - 1);
    expect(hourOpacity(0)).toBeCloseTo(0.18, 12);
    expect(hourOpacity(HOUR_EDGES.length - 1)).toBeCloseTo(0.95, 12);
  });

  test('runs join consecutive nights of one class and leave blank nights out', () => {
    expect(hourRuns([0, 0.5, 0.7, 3, 3.5, 0, 9])).toEqual([
      { first: 1, last: 2, cls: 0, lo: 0.5, hi: 0.7 },
      { first: 3, last: 4, cls: 2, lo: 3, hi: 3.5 },
      { first: 6, last: 6, cls: 5, lo: 9, hi: 9 },
    ]);
  });
});

describe('strips', () => {
  test('rows with the same hours every night (to 0.01 h) share a strip, in first-seen order', () => {
    const a = { name: 'a', hoursPerNight: [1, 2, 3] };
    const b = { name: 'b', hoursPerNight: [1.005, 2, 3] };
    const c = { name: 'c', hoursPerNight: [1, 2.5, 3] };
    expect(stripGroups([a, c, b])).toEqual([[a, b], [c]]);
  });

  test('rows stack without overlap, a track per member', () => {
    const lay = seasonLayout([4, 1]);
    expect(lay.strips[0]!.tracks).toHaveLength(4);
    expect(lay.strips[0]!.tracks[0]).toBeGreaterThanOrEqual(lay.strips[0]!.y + lay.strips[0]!.h);
    expect(lay.strips[1]!.y).toBeGreaterThan(lay.strips[0]!.bottom);
    expect(lay.keyY).toBeGreaterThan(lay.strips[1]!.bottom);
  });
});

describe('the year on the site clock', () => {
  test('night i spans local noon of its date to the next: an instant maps inside its cell', () => {
    // Chile keeps UTC−3 in its summer (IANA tz database, America/Santiago, from memory): noon is 15:00 UTC.
    expect(localNoonMs('2027-01-01', 'America/Santiago')).toBe(Date.parse('2027-01-01T15:00:00Z'));
    const ax = seasonAxis(2027, 365, 'America/Santiago', 100, 830);
    expect(ax.cellW).toBe(2);
    expect(ax.cell(0)).toBe(100);
    // 2027-03-10T03:00Z is 00:00 on Mar 10 local, the night of Mar 09 (index 67): inside that cell.
    const x = ax.at(Date.parse('2027-03-10T03:00:00Z'));
    expect(x).toBeGreaterThan(ax.cell(nightIndex('2027-03-09', 2027)));
    expect(x).toBeLessThan(ax.cell(nightIndex('2027-03-10', 2027)));
    expect(nightIndex('2027-03-09', 2027)).toBe(67);
    expect(nightIndex('2028-01-01', 2027)).toBe(365);
  });

  test('periapsis ± σ is T ∓ σ days; without σ a single instant', () => {
    const s = periapsisSpan('2027-06-14T16:17:27Z', 2.5);
    expect(s.hi - s.t).toBe(2.5 * 86_400_000);
    expect(s.t - s.lo).toBe(2.5 * 86_400_000);
    const none = periapsisSpan('2027-06-14T16:17:27Z', undefined);
    expect(none.sigmaDays).toBeNull();
    expect(none.lo).toBe(none.hi);
  });
});
