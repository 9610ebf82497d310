/**
 * A site's night cut into slots: the slot edges inside darkness, and for each target whether it
 * meets every constraint at each edge (altitude or airmass, horizon mask, Sun avoidance, Moon),
 * with the limit it breaks and its airmass. Both planners place blocks on these edges only, so a
 * block can never start or end outside darkness, and every edge it covers has been tested.
 *
 * Sampling at slot edges can miss a breach shorter than one slot (a narrow notch of a horizon
 * mask); the Sun and darkness move far too slowly for that.
 */
import { airmass } from '../sky/airmass.ts';
import type { Limits } from '../sky/limits.ts';
import { darknessFast, type Interval } from '../sky/darkness.ts';
import { DEG } from '../constants.ts';
import { lastAt, moonAt, nightFrame, sunAt, type NightFrame } from '../sky/frame.ts';
import { nightSpan } from '../sky/night.ts';
import { apparentAltitudeDeg, trueAltitudeDeg } from '../sky/refraction.ts';
import { frameTarget } from '../sky/samplers.ts';
import { maskAltitudeDeg, type Site } from '../sky/site.ts';
import type { Target } from '../sky/target.ts';
import type { Limit } from '../sky/windows.ts';

/** Why a target cannot be observed at an edge (the sky engine's limits; darkness never occurs on the grid). */
export const REASON_CODES = [
  'altitude',
  'horizon-mask',
  'sun-distance',
  'moon',
] as const satisfies readonly Limit[];
export type ReasonCode = (typeof REASON_CODES)[number];
const CODE: Record<string, number> = Object.fromEntries(REASON_CODES.map((r, i) => [r, i + 1]));

export interface NightGrid {
  site: Site;
  limits: Limits;
  date: string;
  slotMinutes: number;
  frame: NightFrame;
  /** Slot edges (UTC JD), in order, all inside darkness and on whole multiples of the slot length. */
  edgeJd: Float64Array;
  /** Index of the dark interval each edge lies in: a block may not span two of them. */
  run: Int32Array;
  /** Per edge: local sidereal time (rad), the Sun's and the Moon's unit vectors of date, the Moon above the horizon. */
  lastRad: Float64Array;
  sun: Float64Array;
  moon: Float64Array;
  moonUp: Uint8Array;
  /** sin of the true altitude that refracts to the altitude limit. */
  sinAltitudeLimit: number;
  /** The night's dark intervals (UTC JD) and their total, hours. */
  dark: Interval[];
  darkHours: number;
}

export interface TargetGrid {
  /** 1 where the target meets every constraint at the edge. */
  ok: Uint8Array;
  /** 0 where ok, else 1 + index into REASON_CODES of the first limit broken. */
  reason: Uint8Array;
  /** Airmass at each edge where ok (Infinity elsewhere). */
  airmass: Float64Array;
  /** Refracted altitude, degrees. */
  altitudeDeg: Float64Array;
  /** Distance from the Sun at the night's middle, degrees. */
  sunSeparationDeg: number;
  /** Closest distance from the Moon while the Moon is up in darkness, degrees (undefined: never up). */
  moonDistanceDeg: number | undefined;
  /** okRun[i]: how many consecutive ok edges start at edge i (inside one dark interval). */
  okRun: Int32Array;
  /** Prefix sums of 1/airmass over edges (0 where not ok), for block quality in O(1). */
  inverseAirmassSum: Float64Array;
}

/**
 * The night's grid.
 * @param slotMinutes slot length, minutes, [1, 30]
 */
export function nightGrid(
  site: Site,
  limits: Limits,
  date: string,
  slotMinutes: number,
): NightGrid {
  const span = nightSpan(site, date);
  const frame = nightFrame(site, span, 1);
  const dark = darknessFast(frame, limits.sunLimitDeg);
  const slot = slotMinutes / 1440;
  const edges: number[] = [];
  const run: number[] = [];
  dark.forEach((d, k) => {
    // First edge on a whole multiple of the slot (UTC), so planned times read as round clock times.
    const first = Math.ceil((d.startJd - 0.5) / slot - 1e-9) * slot + 0.5;
    for (let jd = first; jd <= d.endJd + 1e-9; jd += slot) {
      if (jd < d.startJd - 1e-9) continue;
      edges.push(Math.min(jd, d.endJd));
      run.push(k);
    }
  });
  const darkHours = dark.reduce((h, d) => h + (d.endJd - d.startJd) * 24, 0);
  const n = edges.length;
  const lastRad = new Float64Array(n),
    sun = new Float64Array(3 * n),
    moon = new Float64Array(3 * n),
    moonUp = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const jd = edges[i]!;
    lastRad[i] = lastAt(frame, jd);
    const sv = sunAt(frame, jd),
      mv = moonAt(frame, jd);
    sun.set(sv, 3 * i);
    moon.set(mv, 3 * i);
    const h = lastRad[i]! - Math.atan2(mv[1], mv[0]);
    moonUp[i] =
      frame.sinLat * mv[2] + frame.cosLat * Math.hypot(mv[0], mv[1]) * Math.cos(h) > 0 ? 1 : 0;
  }
  const sinAltitudeLimit = Math.sin(
    trueAltitudeDeg(limits.altitudeLimitDeg, frame.refraction) * DEG,
  );
  return {
    site,
    limits,
    date,
    slotMinutes,
    frame,
    edgeJd: Float64Array.from(edges),
    run: Int32Array.from(run),
    lastRad,
    sun,
    moon,
    moonUp,
    sinAltitudeLimit,
    dark,
    darkHours,
  };
}

/**
 * One target on a night's grid: the sky engine's fast-path geometry (apparent place of date at the
 * night's middle, linear sidereal time, interpolated Sun and Moon) tested at every edge in the
 * order of its `brokenLimit`: altitude, horizon mask, Sun avoidance, Moon.
 */
export function targetGrid(grid: NightGrid, target: Target): TargetGrid {
  const n = grid.edgeJd.length;
  const c = grid.limits;
  const f = grid.frame;
  const ft = frameTarget(f, target);
  const [qx, qy, qz] = ft.dir;
  const cosSun = Math.cos(c.leastSunDistanceDeg * DEG);
  const cosMoon = Math.cos(c.leastMoonDistanceDeg * DEG);
  const ok = new Uint8Array(n);
  const reason = new Uint8Array(n);
  const x = new Float64Array(n).fill(Infinity);
  const alt = new Float64Array(n);
  const { sun, moon, moonUp, lastRad } = grid;
  let moonDot = -2;
  for (let i = 0; i < n; i++) {
    const h = lastRad[i]! - ft.raRad;
    const ch = Math.cos(h);
    const sinAlt = f.sinLat * ft.sinDec + f.cosLat * ft.cosDec * ch;
    const trueAlt = Math.asin(sinAlt) / DEG;
    const appAlt = apparentAltitudeDeg(trueAlt, f.refraction);
    alt[i] = appAlt;
    let code = 0;
    if (sinAlt < grid.sinAltitudeLimit) code = CODE.altitude!;
    else if (c.mask.length > 0) {
      let az =
        Math.atan2(-ft.cosDec * Math.sin(h), f.cosLat * ft.sinDec - f.sinLat * ft.cosDec * ch) /
        DEG;
      if (az < 0) az += 360;
      if (appAlt < maskAltitudeDeg(c.mask, az)) code = CODE['horizon-mask']!;
    }
    if (code === 0 && sun[3 * i]! * qx + sun[3 * i + 1]! * qy + sun[3 * i + 2]! * qz > cosSun)
      code = CODE['sun-distance']!;
    const md = moonUp[i] ? moon[3 * i]! * qx + moon[3 * i + 1]! * qy + moon[3 * i + 2]! * qz : -2;
    if (md > moonDot) moonDot = md;
    if (code === 0 && md > cosMoon) code = CODE.moon!;
    if (code === 0) {
      x[i] = airmass(c.airmassFormula, trueAlt, appAlt);
      if (!Number.isFinite(x[i])) code = CODE.altitude!;
    }
    reason[i] = code;
    ok[i] = code === 0 ? 1 : 0;
  }
  const okRun = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    okRun[i] = ok[i] ? 1 + (i + 1 < n && grid.run[i + 1] === grid.run[i] ? okRun[i + 1]! : 0) : 0;
  }
  const inverseAirmassSum = new Float64Array(n + 1);
  for (let i = 0; i < n; i++)
    inverseAirmassSum[i + 1] = inverseAirmassSum[i]! + (ok[i] ? 1 / x[i]! : 0);
  const sm = sunAt(f, f.midJd);
  const sunSeparationDeg =
    Math.acos(Math.max(-1, Math.min(1, sm[0] * qx + sm[1] * qy + sm[2] * qz))) / DEG;
  const moonDistanceDeg = moonDot < -1.5 ? undefined : Math.acos(Math.min(1, moonDot)) / DEG;
  return {
    ok,
    reason,
    airmass: x,
    altitudeDeg: alt,
    sunSeparationDeg,
    moonDistanceDeg,
    okRun,
    inverseAirmassSum,
  };
}

/** Mean 1/airmass over edges i … i+k (a block of k slots starting at edge i). */
export function blockQuality(t: TargetGrid, i: number, k: number): number {
  return (t.inverseAirmassSum[i + k + 1]! - t.inverseAirmassSum[i]!) / (k + 1);
}
