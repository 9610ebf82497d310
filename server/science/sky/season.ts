/**
 * The season map: for a site, a year and many targets, the observable hours per night of each
 * target (darkness sampled every few minutes) and its season's start, end and best night.
 *
 * Fast path throughout: each night is reduced once to its tables (`frame.ts`) and its dark sample
 * grid; each target once per night to its apparent place; the samples above the altitude limit are
 * then counted in closed form (`season-count.ts`). Only target-nights that the horizon mask, the
 * Moon or the Sun may affect fall back to testing each sample.
 */
import { DEG, TWO_PI } from '../constants.ts';
import type { Limits } from './limits.ts';
import { darknessFast, type Interval } from './darkness.ts';
import { lastAt, moonAt, nightFrame, sunAt, withMoon, type NightFrame } from './frame.ts';
import { addDays, nightSpan } from './night.ts';
import { apparentAltitudeDeg, trueAltitudeDeg } from './refraction.ts';
import { maskAltitudeDeg, maskMaxAltitudeDeg, type Site } from './site.ts';
import { cosLimitHourAngle, countUp } from './season-count.ts';
import { icrsDirection, type Target } from './target.ts';
import type { Vec3 } from './vectors.ts';
import {
  periapses,
  summarise,
  type PeriapsisInSeason,
  type SeasonSummary,
} from './season-summary.ts';

/** The darkness sampling step a season map accepts at an interface (ISO 8601 duration). */
export const SEASON_STEP = { default: 'PT5M', rule: { atLeast: 'PT1M', atMost: 'PT1H' } } as const;

export interface SeasonOptions {
  /** Darkness sampling step, minutes, [1, 60]; default 5. */
  stepMinutes?: number;
  /** A night counts towards the season when the target is observable at least this long, hours; default 1. */
  minHoursPerNight?: number;
  /** Runs of at most this many unusable nights (bright Moon, say) do not break a season; default 7. */
  maxGapNights?: number;
}

export interface SeasonNight {
  date: string;
  /** Dark hours of the night (sample count × step). */
  darkHours: number;
  /** Moon illumination is left to the night report; the map keeps the numbers per night small. */
  samples: number;
}

export interface TargetSeason {
  name: string;
  /** Observable hours per night, one per night of `nights`. */
  hours: Float32Array;
  season: SeasonSummary;
  /** Periapsis passages within the year (empty for targets without an orbit). */
  periapses: PeriapsisInSeason[];
}

export interface SeasonMap {
  year: number;
  stepMinutes: number;
  nights: SeasonNight[];
  targets: TargetSeason[];
  /** Work done: samples × targets, and target-nights that needed a per-sample test. */
  evaluations: number;
  perSampleTargetNights: number;
}

interface PreparedNight {
  frame: NightFrame;
  dark: Interval[];
  /** Samples per dark interval. */
  counts: number[];
  total: number;
  midDarkJd: number;
  /** A cap around the Moon's path through darkness: centre (unit vector) and cos of (limit + 1° + radius). */
  moonCap: Vec3;
  cosMoonCap: number;
  /** Lazily filled per-sample Sun/Moon directions for the per-sample test. */
  sunAt?: Vec3[];
  moonAt?: Vec3[];
  moonUp?: boolean[];
}

/** The nights of a year at a site, prepared for counting. */
function prepareNights(
  site: Site,
  year: number,
  c: Limits,
  stepDays: number,
): { dates: string[]; nights: PreparedNight[] } {
  const dates: string[] = [];
  const nights: PreparedNight[] = [];
  const first = `${year}-01-01`;
  for (let i = 0; ; i++) {
    const date = addDays(first, i);
    if (!date.startsWith(String(year))) break;
    const span = nightSpan(site, date);
    const frame = nightFrame(site, span, 0);
    const dark = darknessFast(frame, c.sunLimitDeg);
    if (dark.length > 0) withMoon(frame, dark[0]!.startJd, dark[dark.length - 1]!.endJd, 2);
    const counts = dark.map((d) => Math.floor((d.endJd - d.startJd) / stepDays + 1e-9) + 1);
    const midDarkJd =
      dark.length > 0 ? (dark[0]!.startJd + dark[dark.length - 1]!.endJd) / 2 : frame.midJd;
    // One dot product per target-night instead of one per Moon knot: the knots lie within `radius` of their mean.
    let cx = 0,
      cy = 0,
      cz = 0;
    for (const m of frame.moonKnots) {
      cx += m[0];
      cy += m[1];
      cz += m[2];
    }
    const cr = Math.sqrt(cx * cx + cy * cy + cz * cz) || 1;
    const moonCap: Vec3 = [cx / cr, cy / cr, cz / cr];
    let radius = 0;
    for (const m of frame.moonKnots)
      radius = Math.max(
        radius,
        Math.acos(Math.min(1, m[0] * moonCap[0] + m[1] * moonCap[1] + m[2] * moonCap[2])),
      );
    const capDeg = c.leastMoonDistanceDeg + 1 + radius / DEG;
    dates.push(date);
    nights.push({
      frame,
      dark,
      counts,
      total: counts.reduce((a, b) => a + b, 0),
      midDarkJd,
      moonCap,
      cosMoonCap: capDeg >= 180 ? -2 : Math.cos(capDeg * DEG),
    });
  }
  return { dates, nights };
}

/** Sun/Moon directions on a night's sample grid (filled once, on first need). */
function sampleBodies(n: PreparedNight, stepDays: number): void {
  if (n.sunAt) return;
  n.sunAt = [];
  n.moonAt = [];
  n.moonUp = [];
  for (let d = 0; d < n.dark.length; d++) {
    for (let k = 0; k < n.counts[d]!; k++) {
      const jd = n.dark[d]!.startJd + k * stepDays;
      const moon = moonAt(n.frame, jd);
      n.sunAt.push(sunAt(n.frame, jd));
      n.moonAt.push(moon);
      const h = lastAt(n.frame, jd) - Math.atan2(moon[1], moon[0]);
      n.moonUp.push(
        n.frame.sinLat * moon[2] +
          n.frame.cosLat * Math.sqrt(moon[0] * moon[0] + moon[1] * moon[1]) * Math.cos(h) >
          0,
      );
    }
  }
}

export function seasonMap(
  site: Site,
  year: number,
  targets: readonly Target[],
  c: Limits,
  options: SeasonOptions = {},
): SeasonMap {
  // Hot kernel (targets × nights, millions of samples for a large campaign; inlined on purpose).
  // Steps: 1. the nights' frames and dark spans, the limits as sines and cosines; per target and
  // night: 2. its apparent place of date (aberration, precession-nutation); 3. the dark samples
  // above the altitude limit in closed form; 4. only where the horizon mask, the Moon or the Sun
  // can reach, each sample tested; 5. the night's hours and the best night (most samples, then
  // closest to transit at mid-darkness); then 6. each target's season summary and periapses.
  const stepMinutes = options.stepMinutes ?? 5;
  const stepDays = stepMinutes / 1440;
  const minSamples = Math.ceil(((options.minHoursPerNight ?? 1) * 60) / stepMinutes - 1e-9);
  const maxGap = options.maxGapNights ?? 7;
  const { dates, nights } = prepareNights(site, year, c, stepDays);
  const nN = nights.length;
  const refraction = nights[0]!.frame.refraction;
  const sinLimit = Math.sin(trueAltitudeDeg(c.altitudeLimitDeg, refraction) * DEG);
  const maskTop = Math.max(c.altitudeLimitDeg, maskMaxAltitudeDeg(c.mask));
  const sinMaskTop = Math.sin(trueAltitudeDeg(maskTop, refraction) * DEG);
  const cosSunMargin = Math.cos(Math.min(180, c.leastSunDistanceDeg + 1) * DEG);
  const sinLat = nights[0]!.frame.sinLat,
    cosLat = nights[0]!.frame.cosLat;
  let evaluations = 0;
  let perSample = 0;

  const out = targets.map((target): TargetSeason => {
    const hours = new Float32Array(nN);
    const counts = new Int32Array(nN);
    let bestCount = -1,
      bestNight = -1,
      bestTie = Infinity;
    // Without an orbit a target moves linearly on the sky over a year: interpolate its ICRS vector.
    const a = icrsDirection(target, nights[0]!.frame.midJd);
    const b = icrsDirection(target, nights[nN - 1]!.frame.midJd);
    for (let i = 0; i < nN; i++) {
      const n = nights[i]!;
      evaluations += n.total;
      if (n.total === 0) continue;
      const f = n.frame;
      let px: number, py: number, pz: number;
      if (target.orbit !== null) {
        [px, py, pz] = icrsDirection(target, f.midJd);
      } else {
        const u = nN > 1 ? i / (nN - 1) : 0;
        px = a[0] + (b[0] - a[0]) * u;
        py = a[1] + (b[1] - a[1]) * u;
        pz = a[2] + (b[2] - a[2]) * u;
      }
      // 2. Annual aberration, then precession-nutation (inlined `apparentInFrame`: this loop runs
      // millions of times).
      const be = f.beta;
      const pb = px * be[0] + py * be[1] + pz * be[2];
      let qx = px + be[0] - pb * px,
        qy = py + be[1] - pb * py,
        qz = pz + be[2] - pb * pz;
      const m = f.precNut;
      const r0 = m[0]!,
        r1 = m[1]!,
        r2 = m[2]!;
      const x = r0[0]! * qx + r0[1]! * qy + r0[2]! * qz;
      const y = r1[0]! * qx + r1[1]! * qy + r1[2]! * qz;
      const z = r2[0]! * qx + r2[1]! * qy + r2[2]! * qz;
      const rxy = Math.sqrt(x * x + y * y);
      const rr = Math.sqrt(rxy * rxy + z * z);
      const ra = Math.atan2(y, x);
      const sinDec = z / rr,
        cosDec = rxy / rr;
      qx = x / rr;
      qy = y / rr;
      qz = z / rr;
      // 3. Closed-form count of the samples above the limit.
      const dH = f.lastRateRadPerDay * stepDays;
      // Does anything but altitude matter tonight? Mask band, Moon or Sun within reach → test each sample.
      const cosLo = cosLimitHourAngle(sinDec, cosDec, sinLat, cosLat, sinLimit);
      let needSamples = false;
      let count = 0;
      for (let d = 0; d < n.dark.length; d++) {
        count += countUp(lastAt(f, n.dark[d]!.startJd) - ra, dH, n.counts[d]!, cosLo);
      }
      if (count > 0 && c.mask.length > 0 && maskTop > c.altitudeLimitDeg) {
        // The mask matters only if some sample above the limit is below the mask's top.
        const cosHi = cosLimitHourAngle(sinDec, cosDec, sinLat, cosLat, sinMaskTop);
        let above = 0;
        for (let d = 0; d < n.dark.length; d++)
          above += countUp(lastAt(f, n.dark[d]!.startJd) - ra, dH, n.counts[d]!, cosHi);
        needSamples = above !== count;
      }
      if (!needSamples && count > 0 && c.leastMoonDistanceDeg > 0) {
        const mc = n.moonCap;
        needSamples = mc[0] * qx + mc[1] * qy + mc[2] * qz > n.cosMoonCap;
      }
      if (!needSamples && count > 0 && c.leastSunDistanceDeg > 0) {
        const s = sunAt(f, n.midDarkJd);
        if (s[0] * qx + s[1] * qy + s[2] * qz > cosSunMargin) needSamples = true;
      }
      // 4. Per-sample tests.
      if (needSamples) {
        count = 0;
        perSample++;
        sampleBodies(n, stepDays);
        const cosMoon = Math.cos(c.leastMoonDistanceDeg * DEG);
        const cosSun = Math.cos(c.leastSunDistanceDeg * DEG);
        let j = 0;
        for (let d = 0; d < n.dark.length; d++) {
          const hs = lastAt(f, n.dark[d]!.startJd) - ra;
          for (let k = 0; k < n.counts[d]!; k++, j++) {
            const h = hs + k * dH;
            const ch = Math.cos(h);
            const sinAlt = sinLat * sinDec + cosLat * cosDec * ch;
            if (sinAlt < sinLimit) continue;
            if (c.mask.length > 0) {
              const alt = apparentAltitudeDeg(Math.asin(sinAlt) / DEG, refraction);
              let az =
                Math.atan2(-cosDec * Math.sin(h), cosLat * sinDec - sinLat * cosDec * ch) / DEG;
              if (az < 0) az += 360;
              if (alt < maskAltitudeDeg(c.mask, az)) continue;
            }
            const sv = n.sunAt![j]!;
            if (sv[0] * qx + sv[1] * qy + sv[2] * qz > cosSun) continue;
            const mv = n.moonAt![j]!;
            if (n.moonUp![j] && mv[0] * qx + mv[1] * qy + mv[2] * qz > cosMoon) continue;
            count++;
          }
        }
      }
      // 5. The night's hours; the best night so far.
      counts[i] = count;
      hours[i] = (count * stepMinutes) / 60;
      if (count >= bestCount && count > 0) {
        let hm = (lastAt(f, n.midDarkJd) - ra) % TWO_PI;
        if (hm > Math.PI) hm -= TWO_PI;
        else if (hm < -Math.PI) hm += TWO_PI;
        if (count > bestCount || Math.abs(hm) < bestTie) {
          bestCount = count;
          bestNight = i;
          bestTie = Math.abs(hm);
        }
      }
    }
    // 6. The season's summary and the periapses in it.
    const season = summarise(counts, minSamples, maxGap, dates, bestNight, bestCount, stepMinutes);
    return {
      name: target.name,
      hours,
      season,
      periapses: periapses(
        target,
        nights.map((n) => n.frame.span),
        hours,
        season,
      ),
    };
  });

  return {
    year,
    stepMinutes,
    nights: nights.map((n, i) => ({
      date: dates[i]!,
      darkHours: (n.total * stepMinutes) / 60,
      samples: n.total,
    })),
    targets: out,
    evaluations: evaluations,
    perSampleTargetNights: perSample,
  };
}
