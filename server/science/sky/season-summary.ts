/**
 * A season from its per-night counts: the longest run of usable nights (short gaps bridged, circular
 * over the year), and where an orbiting target's periapsis passages fall relative to it.
 */
import { findEvents } from '../orbit/index.ts';
import { jdToIso } from '../time/index.ts';
import type { NightSpan } from './night.ts';
import type { Target } from './target.ts';

export interface SeasonSummary {
  /** First and last night (YYYY-MM-DD) of the longest run of usable nights; null when there is none. */
  start: string | null;
  end: string | null;
  /** The run passes through 31 December into January of this year's map (the map is circular). */
  wrapsYearEnd: boolean;
  /** Usable every night of the year. */
  allYear: boolean;
  usableNights: number;
  /** The night with the most observable hours (ties: the one whose transit is nearest the middle of darkness). */
  bestNight: string | null;
  bestHours: number;
}

/** A periapsis passage of an orbiting target in the map's year, and whether it can be watched. */
export interface PeriapsisInSeason {
  /** Observed instant (light-travel time included when the orbit switches it on), ISO 8601 UTC. */
  epoch: string;
  /** The night (local evening date) in which it falls. */
  night: string;
  /** Observable hours on that night. */
  hours: number;
  /** The night lies inside the target's season. */
  inSeason: boolean;
}

/** The longest circular run of usable nights, bridging gaps of at most `maxGap` nights. */
export function summarise(
  counts: Int32Array,
  minSamples: number,
  maxGap: number,
  dates: string[],
  bestNight: number,
  bestCount: number,
  stepMinutes: number,
): SeasonSummary {
  const n = counts.length;
  const usable: number[] = [];
  for (let i = 0; i < n; i++) if (counts[i]! >= Math.max(1, minSamples)) usable.push(i);
  const best = {
    bestNight: bestNight >= 0 ? dates[bestNight]! : null,
    bestHours: bestCount > 0 ? (bestCount * stepMinutes) / 60 : 0,
  };
  if (usable.length === 0)
    return {
      start: null,
      end: null,
      wrapsYearEnd: false,
      allYear: false,
      usableNights: 0,
      ...best,
    };
  // Segments of usable nights whose gaps are ≤ maxGap.
  const segs: { first: number; last: number; nights: number }[] = [];
  for (const i of usable) {
    const s = segs[segs.length - 1];
    if (s && i - s.last - 1 <= maxGap) {
      s.last = i;
      s.nights++;
    } else segs.push({ first: i, last: i, nights: 1 });
  }
  const firstSeg = segs[0]!,
    lastSeg = segs[segs.length - 1]!;
  if (
    segs.length === 1 &&
    firstSeg.first <= maxGap &&
    n - 1 - firstSeg.last <= maxGap &&
    firstSeg.first + (n - 1 - firstSeg.last) <= maxGap
  ) {
    return {
      start: dates[0]!,
      end: dates[n - 1]!,
      wrapsYearEnd: false,
      allYear: true,
      usableNights: usable.length,
      ...best,
    };
  }
  let wraps = false;
  if (segs.length > 1 && firstSeg.first + (n - 1 - lastSeg.last) <= maxGap) {
    lastSeg.nights += firstSeg.nights;
    lastSeg.last = firstSeg.last;
    segs.shift();
    wraps = true;
  }
  const top = segs.reduce((x, y) => (y.nights > x.nights ? y : x));
  return {
    start: dates[top.first]!,
    end: dates[top.last]!,
    wrapsYearEnd: wraps && top === lastSeg,
    allYear: false,
    usableNights: top.nights,
    ...best,
  };
}

/** Whether night index i lies in a season (handles seasons that run through the year end). */
export function nightInSeason(season: SeasonSummary, dates: readonly string[], i: number): boolean {
  if (season.allYear) return true;
  if (season.start === null || season.end === null) return false;
  const s = dates.indexOf(season.start),
    e = dates.indexOf(season.end);
  return s <= e ? i >= s && i <= e : i >= s || i <= e;
}

/** The periapsis passages of an orbiting target within the nights, each placed in its night. */
export function periapses(
  target: Target,
  spans: readonly NightSpan[],
  hours: Float32Array,
  season: SeasonSummary,
): PeriapsisInSeason[] {
  if (target.orbit === null) return [];
  const dates = spans.map((n) => n.date);
  const first = spans[0]!.startJd,
    last = spans[spans.length - 1]!.endJd;
  return findEvents(target.orbit, first, last, { kinds: ['periapsis'] }).flatMap((ev) => {
    const i = spans.findIndex((n) => ev.jd >= n.startJd && ev.jd < n.endJd);
    if (i < 0) return [];
    return [
      {
        epoch: jdToIso(ev.jd),
        night: dates[i]!,
        hours: hours[i]!,
        inSeason: nightInSeason(season, dates, i),
      },
    ];
  });
}
