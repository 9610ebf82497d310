/**
 * The season chart's geometry as plain data (unit-tested in node): nights as cells along the
 * year on the site's clock, the hour classes that colour them, which targets share a strip,
 * periapsis ± σ as a span of instants, and where each row sits.
 */
import { DateTime } from 'luxon';
import { linear, type Scale } from './scale.ts';

/** Lower edges of the hour classes of a night's observable (or dark) time, hours (common practice, no source). */
export const HOUR_EDGES = [0, 1, 2, 4, 6, 8, 10] as const;

/** The class of a night's hours: −1 for none (drawn blank), else 0 … HOUR_EDGES.length − 1. */
export function hourClass(hours: number): number {
  if (!(hours > 0)) return -1;
  for (let k = 1; k < HOUR_EDGES.length; k++) if (hours < HOUR_EDGES[k]!) return k - 1;
  return HOUR_EDGES.length - 1;
}

/** Fill opacity of an hour class: 0.18 for the shortest, rising evenly to 0.95. */
export function hourOpacity(cls: number): number {
  const n = HOUR_EDGES.length - 1;
  return 0.18 + ((0.95 - 0.18) * cls) / n;
}

/** Runs of consecutive nights in one hour class (fewer elements than one per night). */
export function hourRuns(
  hours: readonly number[],
): { first: number; last: number; cls: number; lo: number; hi: number }[] {
  const out: { first: number; last: number; cls: number; lo: number; hi: number }[] = [];
  hours.forEach((h, i) => {
    const cls = hourClass(h);
    const last = out[out.length - 1];
    if (last && last.cls === cls && last.last === i - 1) {
      last.last = i;
      last.lo = Math.min(last.lo, h);
      last.hi = Math.max(last.hi, h);
    } else out.push({ first: i, last: i, cls, lo: h, hi: h });
  });
  return out.filter((r) => r.cls >= 0);
}

/**
 * Rows grouped by identical nightly hours (within `toleranceHours` every night), in first-seen
 * order: stars of one system share a sky position and so a strip, each keeping its own track.
 */
export function stripGroups<T extends { hoursPerNight: readonly number[] }>(
  rows: readonly T[],
  toleranceHours = 0.01,
): T[][] {
  const same = (a: T, b: T) =>
    a.hoursPerNight.length === b.hoursPerNight.length &&
    a.hoursPerNight.every((h, i) => Math.abs(h - b.hoursPerNight[i]!) <= toleranceHours);
  const groups: T[][] = [];
  for (const r of rows) {
    const g = groups.find((m) => same(m[0]!, r));
    if (g) g.push(r);
    else groups.push([r]);
  }
  return groups;
}

/** Local noon of a date at a site, ms: a night runs from its date's noon to the next (night.ts). */
export function localNoonMs(date: string, zone: string): number {
  return DateTime.fromISO(`${date}T12:00:00`, { zone }).toMillis();
}

/** Night index (0 = the year's first evening) of a YYYY-MM-DD date. */
export function nightIndex(date: string, year: number): number {
  return Math.round(
    (Date.parse(`${date.slice(0, 10)}T00:00:00Z`) - Date.UTC(year, 0, 1)) / 86_400_000,
  );
}

export interface SeasonAxis {
  /** Left edge of night i's cell. */
  cell: Scale;
  /** Screen x of an instant (ms), on the same axis: night i spans its local noon to the next. */
  at(msUtc: number): number;
  cellW: number;
  left: number;
  right: number;
}

/** The year's nights between `left` and `right` px, on the site's clock. */
export function seasonAxis(
  year: number,
  nights: number,
  zone: string,
  left: number,
  right: number,
): SeasonAxis {
  const cell = linear([0, nights], [left, right]);
  const noon0 = localNoonMs(`${year}-01-01`, zone);
  return {
    cell,
    at: (msUtc) => cell((msUtc - noon0) / 86_400_000),
    cellW: (right - left) / nights,
    left,
    right,
  };
}

/** A periapsis as a span: T − σ to T + σ (ms), or a single instant without σ. */
export function periapsisSpan(
  epoch: string,
  sigmaDays: number | undefined,
): { t: number; lo: number; hi: number; sigmaDays: number | null } {
  const t = Date.parse(epoch);
  const s = sigmaDays !== undefined && Number.isFinite(sigmaDays) ? sigmaDays : null;
  return { t, lo: t - (s ?? 0) * 86_400_000, hi: t + (s ?? 0) * 86_400_000, sigmaDays: s };
}

export interface StripBox {
  y: number;
  h: number;
  /** One track per member: periapsis span and epochs. */
  tracks: number[];
  bottom: number;
}

export const SEASON_MARGIN = { left: 188, right: 170 };
const STRIP = 18;
const TRACK = 13;
const GAP = 12;

/** Rows of the season chart: the month axis, the darkness strip, then each strip with its tracks. */
export function seasonLayout(memberCounts: readonly number[]): {
  axisY: number;
  dark: StripBox;
  strips: StripBox[];
  keyY: number;
  height: number;
} {
  const axisY = 16;
  const dark: StripBox = { y: 26, h: STRIP, tracks: [], bottom: 26 + STRIP };
  let y = dark.bottom + GAP + 4;
  const strips = memberCounts.map((n) => {
    const tracks = Array.from({ length: n }, (_, k) => y + STRIP + 3 + k * TRACK);
    const box = { y, h: STRIP, tracks, bottom: y + STRIP + 3 + n * TRACK };
    y = box.bottom + GAP;
    return box;
  });
  return { axisY, dark, strips, keyY: y + 2, height: y + 36 };
}
