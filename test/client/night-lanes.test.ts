/**
 * The night chart's geometry in node: lanes shared by one sky position, open stretches that are
 * the windows to the millisecond, closed stretches that tile the rest and name their limit, the
 * airmass fill, the Moon's time up, the clock's ticks and the rows of the layout.
 * Inputs are made-up samples; expected values follow from the rules stated beside them.
 */
import { describe, expect, test } from 'vitest';
import type { Limit, Visibility, Window } from '../../client/src/api/client.ts';
import { labelRows, nightLayout } from '../../client/src/plots/night-layout.ts';
import {
  airmassBins,
  binOf,
  binOpacity,
  laneGroups,
  laneSegments,
  leastMoonDistance,
  moonUpSpans,
  qualityCells,
  runs,
  visTargetOf,
  type LaneModel,
} from '../../client/src/plots/night-lanes.ts';
import { laneSentence } from '../../client/src/plots/night-text.ts';
import { clockAt, hourTicks, labelStep, offsetLabel } from '../../client/src/plots/time-axis.ts';

const MIN = 60_000;
const T0 = Date.parse('2027-06-19T22:00:00Z');
const iso = (ms: number) => new Date(ms).toISOString();
const win = (s: number, e: number, opensBy: Limit, closesBy: Limit) =>
  ({
    start: { utc: iso(s), local: '' },
    end: { utc: iso(e), local: '' },
    opensBy,
    closesBy,
  }) as Pick<Window, 'start' | 'end' | 'opensBy' | 'closesBy'>;

describe('laneGroups', () => {
  test('stars within 1″ of each other share a lane; 5″ apart they do not; RA wraps at 0h', () => {
    const at = (ra: number, dec: number) => ({ raOfDateDeg: ra, decOfDateDeg: dec });
    const a = at(264.26407, -21.73382);
    const b = at(264.26405, -21.73384); // 0.08″ away
    const c = at(264.26407, -21.73382 + 5 / 3600); // 5″ north
    const d = at(359.99999, 10);
    const e = at(0.00001, 10); // 0.07″ across RA 0
    expect(laneGroups([a, b, c, d, e])).toEqual([[a, b], [c], [d, e]]);
  });

  test('a stored target finds its report entry, named "name (system)"', () => {
    const vis = [{ name: 'Tern 1 (Vesper Core)' }, { name: 'Tern 10 (Vesper Core)' }];
    expect(visTargetOf(vis, 'Tern 1')).toBe(vis[0]);
    expect(visTargetOf(vis, 'Tern 10')).toBe(vis[1]);
    expect(visTargetOf(vis, 'Tern')).toBeUndefined();
  });
});

describe('laneSegments', () => {
  // Samples every 10 min over 10 h; dark from +60 min to +540 min (made up).
  const t = Array.from({ length: 61 }, (_, k) => T0 + k * 10 * MIN);
  const dark: [number, number][] = [[T0 + 63 * MIN, T0 + 537 * MIN]];
  const closedBy: (Limit | null)[] = t.map((ms) => {
    const m = (ms - T0) / MIN;
    if (m < 63 || m > 537) return 'darkness';
    if (m < 121.5) return 'altitude';
    if (m <= 300.5) return null;
    if (m < 361) return 'moon';
    if (m <= 482) return null;
    return 'horizon-mask';
  });
  const windows = [
    win(T0 + 121.5 * MIN, T0 + 300.5 * MIN, 'altitude', 'moon'),
    win(T0 + 361 * MIN, T0 + 482 * MIN, 'moon', 'horizon-mask'),
  ];
  const segs = laneSegments(T0, T0 + 600 * MIN, windows, t, closedBy, dark);

  test('open stretches are the windows, to the millisecond', () => {
    const open = segs.filter((s) => s.limit === null);
    expect(open.map((s) => [s.startMs, s.endMs])).toEqual(
      windows.map((w) => [Date.parse(w.start.utc), Date.parse(w.end.utc)]),
    );
  });

  test('the stretches tile the span in order, without gaps or overlaps', () => {
    expect(segs[0]!.startMs).toBe(T0);
    expect(segs[segs.length - 1]!.endMs).toBe(T0 + 600 * MIN);
    for (let k = 1; k < segs.length; k++) expect(segs[k]!.startMs).toBe(segs[k - 1]!.endMs);
  });

  test('closed stretches name their limit; darkness meets another limit at the darkness edge', () => {
    expect(segs.map((s) => s.limit)).toEqual([
      'darkness',
      'altitude',
      null,
      'moon',
      null,
      'horizon-mask',
      'darkness',
    ]);
    // The darkness edge is exact (63 and 537 min), not a sample midpoint.
    expect(segs[1]!.startMs).toBe(T0 + 63 * MIN);
    expect(segs[6]!.startMs).toBe(T0 + 537 * MIN);
  });

  test('a night without windows is closed throughout', () => {
    const none = laneSegments(T0, T0 + 600 * MIN, [], t, closedBy, dark);
    expect(none.every((s) => s.limit !== null)).toBe(true);
    expect(none[0]!.startMs).toBe(T0);
    expect(none[none.length - 1]!.endMs).toBe(T0 + 600 * MIN);
  });

  test('the fill covers each window edge to edge, in airmass bins', () => {
    const airmass = t.map((ms) => 1 + Math.abs((ms - T0) / MIN - 200) / 200); // 1 at +200 min
    const edges = airmassBins(2);
    const cells = qualityCells(segs, t, airmass, edges);
    const first = cells.filter((c) => c.startMs < T0 + 301 * MIN);
    expect(first[0]!.startMs).toBe(T0 + 121.5 * MIN);
    expect(first[first.length - 1]!.endMs).toBe(T0 + 300.5 * MIN);
    for (let k = 1; k < first.length; k++) expect(first[k]!.startMs).toBe(first[k - 1]!.endMs);
    // The sample at +200 min has airmass 1: the best bin.
    expect(cells.find((c) => c.startMs <= T0 + 200 * MIN && c.endMs > T0 + 200 * MIN)!.bin).toBe(0);
    for (const c of cells) expect(binOf(c.lo, edges)).toBe(c.bin);
  });
});

describe('airmass bins', () => {
  test('run from 1 to the highest airmass; values beyond go in the last bin', () => {
    expect(airmassBins(1.8)).toEqual([1, 1.1, 1.2, 1.3, 1.5, 1.75, 1.8]);
    expect(airmassBins(2)).toEqual([1, 1.1, 1.2, 1.3, 1.5, 1.75, 2]);
    const e = airmassBins(2);
    expect(binOf(1.0, e)).toBe(0);
    expect(binOf(1.1, e)).toBe(1);
    expect(binOf(1.99, e)).toBe(5);
    expect(binOf(2.4, e)).toBe(5);
    expect(binOpacity(0, 6)).toBeCloseTo(0.9, 12);
    expect(binOpacity(5, 6)).toBeCloseTo(0.22, 12);
  });
});

describe('the Moon lane', () => {
  test('rise and set fall at the linear crossings of 0°', () => {
    // −10° → +10° across 0–100: crossing at 50; +20° → −20° across 300–400: crossing at 350.
    expect(moonUpSpans([0, 100, 200, 300, 400], [-10, 10, 30, 20, -20])).toEqual([[50, 350]]);
    expect(moonUpSpans([0, 100], [5, 6])).toEqual([[0, 100]]);
    expect(moonUpSpans([0, 100], [-5, -6])).toEqual([]);
  });

  test('the least Moon distance counts only samples with the Moon up in darkness', () => {
    const t = [0, 1, 2, 3];
    expect(leastMoonDistance(t, [10, 20, 30, 40], [5, 5, -1, 5], [[1, 3]])).toBe(20);
    expect(leastMoonDistance(t, [10, 20, 30, 40], [-5, -5, -1, -5], [[0, 3]])).toBeNull();
  });

  test('runs of true samples, at either end too', () => {
    const on = [true, true, false, false, true, false, true];
    expect(runs(on.length, (k) => on[k]!)).toEqual([
      [0, 1],
      [4, 4],
      [6, 6],
    ]);
  });
});

describe('the clock', () => {
  test('ticks on the site clock’s whole hours, named with its offset', () => {
    // Chile keeps UTC−4 in its winter (IANA tz database, America/Santiago, from memory).
    const ticks = hourTicks(T0 - 10 * MIN, T0 + 125 * MIN, 'America/Santiago');
    expect(ticks.map((k) => k.label)).toEqual(['18', '19', '20']);
    expect(ticks[0]!.ms).toBe(T0);
    expect(offsetLabel(T0, 'America/Santiago')).toBe('UTC−04:00');
    expect(clockAt(T0, 'America/Santiago')).toBe('18:00');
    expect(offsetLabel(T0, 'UTC')).toBe('UTC');
  });

  test('a half-hour zone ticks at half past the UTC hour', () => {
    // India keeps UTC+05:30 all year (IANA tz database, Asia/Kolkata, from memory).
    const ticks = hourTicks(T0, T0 + 3 * 60 * MIN, 'Asia/Kolkata');
    expect(new Date(ticks[0]!.ms).getUTCMinutes()).toBe(30);
    expect(offsetLabel(T0, 'Asia/Kolkata')).toBe('UTC+05:30');
  });

  test('the hour repeated when summer time ends shows twice', () => {
    // EU summer time ends on the last Sunday of October at 01:00 UTC (Directive 2000/84/EC, from memory): 2027-10-31.
    const a = Date.parse('2027-10-30T22:00:00Z');
    const labels = hourTicks(a, a + 4 * 60 * MIN, 'Europe/Berlin').map((k) => k.label);
    expect(labels).toEqual(['00', '01', '02', '02', '03']);
  });

  test('labels thin out on a narrow chart', () => {
    expect(labelStep(60)).toBe(1);
    expect(labelStep(20)).toBe(2);
    expect(labelStep(9)).toBe(4);
  });
});

describe('layout', () => {
  test('lanes stack without overlap; a proposal adds a track to every lane', () => {
    for (const withProposal of [false, true]) {
      const L = nightLayout([T0, T0 + 600 * MIN], 3, withProposal, 1100);
      expect(L.moon.y).toBeGreaterThan(L.dark.notchY + 9); // two rows of Sun labels fit above the Moon
      L.lanes.forEach((b, i) => {
        expect(b.blockY).toBeGreaterThanOrEqual(b.y + b.fillH);
        if (i) expect(b.y).toBeGreaterThan(L.lanes[i - 1]!.bottom);
        expect(b.proposedY !== null).toBe(withProposal);
      });
      expect(L.keyY).toBeGreaterThan(L.lanes[2]!.bottom);
      expect(L.x(T0)).toBe(L.left);
      expect(L.x(T0 + 600 * MIN)).toBe(L.right);
    }
  });

  test('labels closer than the gap move to the next row', () => {
    expect(labelRows([0, 20, 40, 60, 100], 30)).toEqual([0, 1, 0, 1, 0]);
    expect(labelRows([100, 0], 30)).toEqual([0, 0]);
  });
});

describe('the text twin', () => {
  test('reads each stretch on the site clock, an open one with UTC too, and names the limit', () => {
    const vis = {
      site: { name: 'Test', timeZone: 'America/Santiago' },
      darkness: { limit: 'astronomical (Sun below -18°)', intervals: [], hours: 0 },
      limits: { altitudeLimitDeg: 33.68, highestAirmass: 1.8, leastSunDistanceDeg: 45 },
    } as unknown as Visibility;
    const lane = {
      members: [{ name: 'Star A (Made-up)' }, { name: 'Star B (Made-up)' }],
      segments: [
        { startMs: T0, endMs: T0 + 60 * MIN, limit: 'altitude' },
        { startMs: T0 + 60 * MIN, endMs: T0 + 120 * MIN, limit: null },
      ],
      cells: [],
      moonLeastDeg: 48.4,
      bestAirmass: 1.234,
    } as unknown as LaneModel;
    // T0 is 18:00 at the site (UTC−4, see the clock tests) and 22:00 UTC.
    expect(laneSentence(lane, vis)).toBe(
      'Star A, Star B: best airmass 1.23; the Moon stays at least 48° away; ' +
        'closed 18:00–19:00 site — below 33.7°, the lowest altitude, with airmass at most 1.8; ' +
        'open 19:00 site (23:00 UTC) to 20:00 site (00:00 UTC).',
    );
  });
});
