/**
 * Nightly windows: the intervals in which a target meets every limit, with the limit that
 * opens and closes each one, its transit and its best airmass. The same search runs on the exact
 * and the fast sampler.
 */
import { airmass, seeingAtAirmass } from './airmass.ts';
import type { Limits } from './limits.ts';
import { intervalsWhere, type Interval } from './darkness.ts';
import type { Sampler, SkySample } from './samplers.ts';
import { maskAltitudeDeg } from './site.ts';

/** What opens or closes a window. */
export const LIMITS = [
  'darkness',
  'altitude',
  'horizon-mask',
  'sun-distance',
  'moon',
  'night-edge',
] as const;
export type Limit = (typeof LIMITS)[number];

/** The first limit a sample breaks (darkness aside), or null when it meets them all. */
export function brokenLimit(s: SkySample, c: Limits): Limit | null {
  if (s.altitudeDeg < c.altitudeLimitDeg) return 'altitude';
  if (c.mask.length > 0 && s.altitudeDeg < maskAltitudeDeg(c.mask, s.azimuthDeg))
    return 'horizon-mask';
  if (s.sunSeparationDeg < c.leastSunDistanceDeg) return 'sun-distance';
  if (s.moonAltitudeDeg > 0 && s.moonSeparationDeg < c.leastMoonDistanceDeg) return 'moon';
  return null;
}

export interface WindowPoint {
  jd: number;
  altitudeDeg: number;
  airmass: number;
}

export interface RawWindow extends Interval {
  opensBy: Limit;
  closesBy: Limit;
  /** Upper transit inside the window, or null. */
  transit: WindowPoint | null;
  /** Lowest airmass inside the window (at the transit, or at the edge nearer to it). */
  best: WindowPoint & { seeingArcsec: number | null; moonSeparationDeg: number };
}

const SECOND = 1 / 86_400;

/**
 * Windows of one target in the night's darkness.
 * @param darkness dark intervals of the night (from `darknessExact` or `darknessFast`)
 * @param nightEdges the night's span: a window that touches it is cut by the night, not by darkness
 * @param stepDays sampling step (windows shorter than a step may be missed); edges are bisected to 1 s
 * @param transitsIn candidate transit times (JD) of the target in the night
 */
export function findWindows(
  sample: Sampler,
  c: Limits,
  darkness: readonly Interval[],
  nightEdges: Interval,
  stepDays: number,
  transitsIn: readonly number[],
): RawWindow[] {
  const ok = (jd: number) => brokenLimit(sample(jd), c) === null;
  const out: RawWindow[] = [];
  for (const dark of darkness) {
    for (const w of intervalsWhere(ok, dark.startJd, dark.endJd, stepDays)) {
      const edgeLimit = (jd: number, atDark: number, outside: number): Limit => {
        if (Math.abs(jd - atDark) < SECOND / 2) {
          return Math.abs(jd - (atDark === dark.startJd ? nightEdges.startJd : nightEdges.endJd)) <
            SECOND / 2
            ? 'night-edge'
            : 'darkness';
        }
        return brokenLimit(sample(outside), c) ?? 'altitude';
      };
      const point = (jd: number): WindowPoint & { s: SkySample } => {
        const s = sample(jd);
        return {
          jd,
          altitudeDeg: s.altitudeDeg,
          airmass: airmass(c.airmassFormula, s.trueAltitudeDeg, s.altitudeDeg),
          s,
        };
      };
      const transitJd = transitsIn.find((t) => t >= w.startJd && t <= w.endJd);
      const candidates = [
        point(w.startJd),
        point(w.endJd),
        ...(transitJd === undefined ? [] : [point(transitJd)]),
      ];
      const best = candidates.reduce((a, b) => (b.altitudeDeg > a.altitudeDeg ? b : a));
      const strip = ({ s: _s, ...p }: WindowPoint & { s: SkySample }): WindowPoint => p;
      out.push({
        ...w,
        opensBy: edgeLimit(w.startJd, dark.startJd, w.startJd - 2 * SECOND),
        closesBy: edgeLimit(w.endJd, dark.endJd, w.endJd + 2 * SECOND),
        transit: transitJd === undefined ? null : strip(candidates[2]!),
        best: {
          ...strip(best),
          seeingArcsec:
            c.zenithSeeingArcsec === null
              ? null
              : seeingAtAirmass(c.zenithSeeingArcsec, best.airmass),
          moonSeparationDeg: best.s.moonSeparationDeg,
        },
      });
    }
  }
  return out;
}

/** Upper transits (hour angle 0) of an apparent right ascension in [startJd, endJd], from a linear sidereal clock. */
export function transitTimes(
  raRad: number,
  lastStartRad: number,
  lastRateRadPerDay: number,
  startJd: number,
  endJd: number,
): number[] {
  const out: number[] = [];
  let h0 = (lastStartRad - raRad) % (2 * Math.PI);
  if (h0 < 0) h0 += 2 * Math.PI;
  // H grows with time; the next H = 0 (mod 2π) comes after (2π − h0)/rate.
  for (
    let t = startJd + (2 * Math.PI - h0) / lastRateRadPerDay;
    t <= endJd;
    t += (2 * Math.PI) / lastRateRadPerDay
  ) {
    if (t >= startJd) out.push(t);
  }
  if (h0 === 0) out.unshift(startJd);
  return out;
}

/** Refine a transit with a sampler: Newton steps on the hour angle. */
export function refineTransit(sample: Sampler, jd: number, rateRadPerDay: number): number {
  let t = jd;
  for (let i = 0; i < 3; i++) t -= sample(t).hourAngleRad / rateRadPerDay;
  return t;
}
