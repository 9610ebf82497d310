/**
 * Darkness: the parts of a night in which the Sun's centre is below the darkness limit. Exact from
 * astronomy-engine's altitude searches; fast from the night's Sun table (checked against the exact
 * one to a minute in the tests).
 */
import { DEG } from '../constants.ts';
import { altitudeOfVectorRad, sunAt, type NightFrame } from './frame.ts';
import type { NightSpan } from './night.ts';
import type { Site } from './site.ts';
import { Body, SearchAltitude } from 'astronomy-engine';
import { JD_J2000 } from '../constants.ts';
import { astroTime } from './apparent.ts';
import { bodyPlace } from './sun-moon.ts';

/** A time interval, UTC Julian Dates, start < end. */
export interface Interval {
  startJd: number;
  endJd: number;
}

const SECOND = 1 / 86_400;

/** Find where `isIn` changes over [a, b] by sampling every `stepDays` and bisecting to `tolDays`. */
export function intervalsWhere(
  isIn: (jd: number) => boolean,
  a: number,
  b: number,
  stepDays: number,
  tolDays = SECOND,
): Interval[] {
  const n = Math.max(1, Math.ceil((b - a) / stepDays));
  const out: Interval[] = [];
  let prevT = a;
  let prevIn = isIn(a);
  let openAt: number | null = prevIn ? a : null;
  for (let i = 1; i <= n; i++) {
    const t = i === n ? b : a + i * stepDays;
    const now = isIn(t);
    if (now !== prevIn) {
      let lo = prevT,
        hi = t;
      while (hi - lo > tolDays) {
        const mid = (lo + hi) / 2;
        if (isIn(mid) === prevIn) lo = mid;
        else hi = mid;
      }
      const edge = (lo + hi) / 2;
      if (now) openAt = edge;
      else {
        out.push({ startJd: openAt!, endJd: edge });
        openAt = null;
      }
    }
    prevT = t;
    prevIn = now;
  }
  if (openAt !== null && b > openAt) out.push({ startJd: openAt, endJd: b });
  return out;
}

/** Fast darkness from the frame's Sun table: sampled every 10 min, edges bisected to 1 s. */
export function darknessFast(frame: NightFrame, sunLimitDeg: number): Interval[] {
  const limit = sunLimitDeg * DEG;
  return intervalsWhere(
    (jd) => altitudeOfVectorRad(frame, sunAt(frame, jd), jd) <= limit,
    frame.span.startJd,
    frame.span.endJd,
    10 / 1440,
  );
}

/**
 * Exact darkness from astronomy-engine's SearchAltitude. At most one dusk and one dawn fall in a
 * noon-to-noon night; with neither, the Sun's altitude at local midnight decides between a night
 * that is dark throughout (polar night) and one that never gets dark (polar day, white nights).
 */
export function darknessExact(site: Site, span: NightSpan, sunLimitDeg: number): Interval[] {
  const days = span.endJd - span.startJd;
  const find = (dir: 1 | -1) => {
    const t = SearchAltitude(
      Body.Sun,
      site.observer,
      dir,
      astroTime(span.startJd),
      days,
      sunLimitDeg,
    );
    const jd = t === null ? null : t.ut + JD_J2000;
    return jd !== null && jd < span.endJd ? jd : null;
  };
  const dusk = find(-1);
  const dawn = find(1);
  const darkAtStart = bodyPlace(Body.Sun, site, span.startJd).altitudeDeg <= sunLimitDeg;
  const out: Interval[] = [];
  if (darkAtStart) {
    out.push({ startJd: span.startJd, endJd: dawn ?? span.endJd });
    if (dusk !== null && dawn !== null && dusk > dawn)
      out.push({ startJd: dusk, endJd: span.endJd });
  } else if (dusk !== null) {
    out.push({ startJd: dusk, endJd: dawn !== null && dawn > dusk ? dawn : span.endJd });
  }
  return out;
}
