/**
 * The night chart's geometry as plain data (unit-tested in node): which targets share a lane,
 * where each lane is open (the sky engine's windows, to the second) and which limit closes it
 * elsewhere, the airmass bins that fill the open parts, and the Moon's time above the horizon.
 */
import type { Limit, Visibility, VisTarget, Window } from '../api/client.ts';
import { ms } from '../lib/time.ts';

/** A stretch of a lane: open (limit null) or closed by one named limit. Times in ms (UTC). */
export interface Segment {
  startMs: number;
  endMs: number;
  limit: Limit | null;
}

/** Targets closer than this on the sky share a lane: 1″ moves a window's edges by well under a second. */
export const SHARED_LANE_ARCSEC = 1;

/**
 * Targets grouped by sky position (apparent place of date), in first-seen order. Stars of one
 * system within an arcsecond of their primary have the same windows and airmass to the chart's
 * precision, so one lane serves them all.
 */
export function laneGroups<T extends Pick<VisTarget, 'raOfDateDeg' | 'decOfDateDeg'>>(
  targets: readonly T[],
  toleranceArcsec = SHARED_LANE_ARCSEC,
): T[][] {
  const groups: T[][] = [];
  const close = (a: T, b: T) => {
    const cosDec = Math.cos((a.decOfDateDeg * Math.PI) / 180);
    let dRa = Math.abs(a.raOfDateDeg - b.raOfDateDeg);
    if (dRa > 180) dRa = 360 - dRa;
    return Math.hypot(dRa * cosDec, a.decOfDateDeg - b.decOfDateDeg) * 3600 < toleranceArcsec;
  };
  for (const t of targets) {
    const g = groups.find((m) => close(m[0]!, t));
    if (g) g.push(t);
    else groups.push([t]);
  }
  return groups;
}

/** The visibility entry of a stored target: the report names it "name (system)". */
export function visTargetOf<T extends { name: string }>(
  targets: readonly T[],
  name: string,
): T | undefined {
  return targets.find((v) => v.name === name || v.name.startsWith(`${name} (`));
}

/** Runs of samples where `keep(k)` holds, as [first, last] index pairs. */
export function runs(n: number, keep: (k: number) => boolean): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  for (let k = 0; k <= n; k++) {
    const on = k < n && keep(k);
    if (on && start < 0) start = k;
    if (!on && start >= 0) {
      out.push([start, k - 1]);
      start = -1;
    }
  }
  return out;
}

/** Where a darkness edge falls in [a, b], if one does. */
function darkEdgeIn(a: number, b: number, dark: readonly [number, number][]): number | null {
  for (const [s, e] of dark) {
    if (s >= a && s <= b) return s;
    if (e >= a && e <= b) return e;
  }
  return null;
}

/**
 * A lane's open and closed stretches over [t0Ms, t1Ms].
 * Open stretches are the windows themselves (edges to the second). Each closed stretch between
 * them is cut by the per-sample limit (`closedBy`), with the window's own opening or closing limit
 * at its ends; where two limits meet between samples the boundary is the darkness edge if one lies
 * there, else the midpoint (half a sampling step at most).
 */
export function laneSegments(
  t0Ms: number,
  t1Ms: number,
  windows: readonly Pick<Window, 'start' | 'end' | 'opensBy' | 'closesBy'>[],
  sampleMs: readonly number[],
  closedBy: readonly (Limit | null)[],
  dark: readonly [number, number][],
): Segment[] {
  const open = windows
    .map((w) => ({ s: Math.max(t0Ms, ms(w.start.utc)), e: Math.min(t1Ms, ms(w.end.utc)), w }))
    .filter((o) => o.e > o.s)
    .sort((a, b) => a.s - b.s);
  const out: Segment[] = [];
  const gap = (a: number, b: number, before: Limit | null, after: Limit | null) => {
    if (b <= a) return;
    const pts: { t: number; limit: Limit }[] = [];
    if (before) pts.push({ t: a, limit: before });
    sampleMs.forEach((t, i) => {
      const l = closedBy[i];
      if (t > a && t < b && l) pts.push({ t, limit: l });
    });
    if (after) pts.push({ t: b, limit: after });
    if (!pts.length) return void out.push({ startMs: a, endMs: b, limit: 'altitude' });
    let start = a;
    for (let k = 1; k < pts.length; k++) {
      const p = pts[k - 1]!;
      const q = pts[k]!;
      if (p.limit === q.limit) continue;
      const cut =
        p.limit === 'darkness' || q.limit === 'darkness'
          ? (darkEdgeIn(p.t, q.t, dark) ?? (p.t + q.t) / 2)
          : (p.t + q.t) / 2;
      out.push({ startMs: start, endMs: cut, limit: p.limit });
      start = cut;
    }
    out.push({ startMs: start, endMs: b, limit: pts[pts.length - 1]!.limit });
  };
  let cursor = t0Ms;
  let closedByPrev: Limit | null = null;
  for (const o of open) {
    gap(cursor, o.s, closedByPrev, o.s > t0Ms ? o.w.opensBy : null);
    out.push({ startMs: o.s, endMs: o.e, limit: null });
    cursor = o.e;
    closedByPrev = o.w.closesBy;
  }
  gap(cursor, t1Ms, closedByPrev, null);
  return mergeSegments(out);
}

function mergeSegments(segs: Segment[]): Segment[] {
  const out: Segment[] = [];
  for (const s of segs) {
    const last = out[out.length - 1];
    if (last && last.limit === s.limit && Math.abs(last.endMs - s.startMs) < 1)
      last.endMs = s.endMs;
    else if (s.endMs > s.startMs) out.push({ ...s });
  }
  return out;
}

/** Airmass class edges the lanes are filled by (common practice, no source: finer near the zenith). */
export const AIRMASS_EDGES = [1, 1.1, 1.2, 1.3, 1.5, 1.75, 2, 2.5, 3] as const;

/** Bin edges from 1 up to the night's highest usable airmass (its last edge). */
export function airmassBins(highest: number): number[] {
  const top = Math.max(1.05, highest);
  return [...AIRMASS_EDGES.filter((e) => e < top - 1e-9), top];
}

/** The bin of an airmass: 0 for the best; values past the last edge go in the last bin. */
export function binOf(airmass: number, edges: readonly number[]): number {
  for (let k = 1; k < edges.length - 1; k++) if (airmass < edges[k]!) return k - 1;
  return edges.length - 2;
}

/** Fill opacity of a bin: 0.9 for the best, falling evenly to 0.22 for the worst. */
export function binOpacity(bin: number, binCount: number): number {
  if (binCount <= 1) return 0.9;
  return 0.9 - ((0.9 - 0.22) * bin) / (binCount - 1);
}

/** A run of a lane's open time in one airmass bin. */
export interface Cell {
  startMs: number;
  endMs: number;
  bin: number;
  /** Lowest and highest sampled airmass in the run. */
  lo: number;
  hi: number;
}

/**
 * The open stretches cut into airmass runs: each sample stands for the time to the midpoints of
 * its neighbours, clipped to the stretch; a sample without airmass (below the horizon) takes the
 * nearest one that has it, so the fill covers the window edge to edge.
 */
export function qualityCells(
  segments: readonly Segment[],
  sampleMs: readonly number[],
  airmass: readonly (number | null)[],
  edges: readonly number[],
): Cell[] {
  const cells: Cell[] = [];
  const n = sampleMs.length;
  for (const seg of segments) {
    if (seg.limit !== null) continue;
    for (let k = 0; k < n; k++) {
      const a = k === 0 ? -Infinity : (sampleMs[k - 1]! + sampleMs[k]!) / 2;
      const b = k === n - 1 ? Infinity : (sampleMs[k]! + sampleMs[k + 1]!) / 2;
      const s = Math.max(a, seg.startMs);
      const e = Math.min(b, seg.endMs);
      if (e <= s) continue;
      const x = nearestAirmass(airmass, k);
      if (x === null) continue;
      const bin = binOf(x, edges);
      const last = cells[cells.length - 1];
      if (last && last.bin === bin && Math.abs(last.endMs - s) < 1) {
        last.endMs = e;
        last.lo = Math.min(last.lo, x);
        last.hi = Math.max(last.hi, x);
      } else cells.push({ startMs: s, endMs: e, bin, lo: x, hi: x });
    }
  }
  return cells;
}

function nearestAirmass(airmass: readonly (number | null)[], k: number): number | null {
  for (let d = 0; d < airmass.length; d++) {
    const a = airmass[k - d];
    if (a !== null && a !== undefined) return a;
    const b = airmass[k + d];
    if (b !== null && b !== undefined) return b;
  }
  return null;
}

/**
 * Stretches with the Moon's centre above the horizon, from its sampled altitude, each end
 * interpolated linearly to 0° between samples (ms).
 */
export function moonUpSpans(
  sampleMs: readonly number[],
  altDeg: readonly number[],
): [number, number][] {
  const n = Math.min(sampleMs.length, altDeg.length);
  const cross = (k: number) =>
    sampleMs[k]! + (altDeg[k]! / (altDeg[k]! - altDeg[k + 1]!)) * (sampleMs[k + 1]! - sampleMs[k]!);
  const out: [number, number][] = [];
  let start: number | null = null;
  for (let k = 0; k < n; k++) {
    const up = altDeg[k]! >= 0;
    if (up && start === null) start = k === 0 ? sampleMs[0]! : cross(k - 1);
    if (!up && start !== null) {
      out.push([start, cross(k - 1)]);
      start = null;
    }
  }
  if (start !== null) out.push([start, sampleMs[n - 1]!]);
  return out;
}

/** Least Moon distance over the samples where the Moon is up in darkness, degrees; null if it never is. */
export function leastMoonDistance(
  sampleMs: readonly number[],
  moonSepDeg: readonly number[],
  moonAltDeg: readonly number[],
  dark: readonly [number, number][],
): number | null {
  let least: number | null = null;
  sampleMs.forEach((t, i) => {
    if ((moonAltDeg[i] ?? -1) < 0 || !dark.some(([s, e]) => t >= s && t <= e)) return;
    const d = moonSepDeg[i]!;
    if (least === null || d < least) least = d;
  });
  return least;
}

/** The limits as the chart names them: a short word for the lane and a sentence for hover and text. */
export function limitWords(
  vis: Pick<Visibility, 'limits' | 'darkness'>,
): Record<Limit, { short: string; long: string }> {
  const c = vis.limits;
  // The lowest altitude is the strictest of the site's, the campaign's and the airmass ceiling's.
  const airmass = c.highestAirmass ? `, with airmass at most ${c.highestAirmass}` : '';
  return {
    darkness: { short: 'not dark', long: `not dark: darkness is ${vis.darkness.limit}` },
    altitude: {
      short: 'too low',
      long: `below ${c.altitudeLimitDeg.toFixed(1)}°, the lowest altitude${airmass}`,
    },
    'horizon-mask': { short: 'mask', long: 'behind the site’s horizon mask' },
    'sun-distance': {
      short: 'Sun',
      long: `within ${c.leastSunDistanceDeg}° of the Sun, the site’s Sun-avoidance angle`,
    },
    moon: {
      short: 'Moon',
      long: `within ${c.leastMoonDistanceDeg ?? 30}° of the Moon while it is up, the least Moon distance`,
    },
    'night-edge': { short: 'night ends', long: 'outside the night' },
  };
}

/** Everything one lane shows, computed once for the chart and its text. */
export interface LaneModel {
  members: VisTarget[];
  segments: Segment[];
  cells: Cell[];
  /** Least Moon distance while the Moon is up in darkness, degrees, or null. */
  moonLeastDeg: number | null;
  /** Lowest airmass in the lane's windows, or null without a window. */
  bestAirmass: number | null;
}

/** The lanes of a night over the chart's span, filled by the airmass bins `edges`. */
export function laneModels(
  vis: Visibility,
  span: [number, number],
  edges: readonly number[],
): LaneModel[] {
  const dark = vis.darkness.intervals.map(
    (d) => [ms(d.start.utc), ms(d.end.utc)] as [number, number],
  );
  return laneGroups(vis.targets).map((members) => {
    const lead = members[0]!;
    const curve = lead.curve;
    const t = curve?.utc.map(ms) ?? [];
    const segments = laneSegments(span[0], span[1], lead.windows, t, curve?.closedBy ?? [], dark);
    const moon = vis.moon.curve;
    return {
      members,
      segments,
      cells: curve ? qualityCells(segments, t, curve.airmass, edges) : [],
      moonLeastDeg:
        curve && moon
          ? leastMoonDistance(t, curve.moonSeparationDeg, moon.altitudeDeg, dark)
          : null,
      bestAirmass: lead.windows.reduce<number | null>(
        (b, w) => (w.best && (b === null || w.best.airmass < b) ? w.best.airmass : b),
        null,
      ),
    };
  });
}

/** The highest airmass the lanes are filled to: the limit, else the worst open sample (at most 3). */
export function fillCeiling(vis: Visibility): number {
  if (vis.limits.highestAirmass) return vis.limits.highestAirmass;
  let worst = 1.2;
  for (const t of vis.targets)
    t.curve?.airmass.forEach((a, i) => {
      if (a !== null && t.curve!.closedBy[i] === null) worst = Math.max(worst, a);
    });
  return Math.min(3, worst);
}
