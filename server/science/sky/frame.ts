/**
 * The fast path's per-night tables. Once per site and night: sidereal time as a linear function of
 * time, the precession-nutation matrix and Earth's velocity at mid-night, and the Sun and Moon at
 * knots to interpolate. Once per target and night: its apparent place of date. Then every altitude
 * is a few multiplications. Left out against the exact path: diurnal aberration (≤ 0.32″) and the
 * change of precession, nutation and annual aberration within one night (≤ 0.2″).
 */
import { Body, Rotation_EQJ_EQD, SiderealTime } from 'astronomy-engine';
import { DEG, TWO_PI } from '../constants.ts';
import { aberrate, astroTime, observerBeta, rowMajor } from './apparent.ts';
import type { NightSpan } from './night.ts';
import { siteRefraction, type RefractionModel } from './refraction.ts';
import type { Site } from './site.ts';
import { bodyPlace } from './sun-moon.ts';
import { normalize, raDecFromVector, rotate, type Vec3 } from './vectors.ts';

/** Sidereal days per solar day (rate of Greenwich sidereal time; IERS Conventions 2010, from memory). */
const SIDEREAL_PER_SOLAR = 1.0027378119113546;

export interface NightFrame {
  site: Site;
  span: NightSpan;
  sinLat: number;
  cosLat: number;
  /** Local apparent sidereal time at span start (rad) and its rate (rad/day). */
  lastStartRad: number;
  lastRateRadPerDay: number;
  midJd: number;
  /** Row-major EQJ → true equator of date, at mid-night. */
  precNut: number[][];
  /** Earth's barycentric velocity / c at mid-night, J2000 axes. */
  beta: Vec3;
  refraction: RefractionModel;
  /** Topocentric apparent direction of date of the Sun at span start and end (it moves ~1°/day, nearly uniformly). */
  sunStart: Vec3;
  sunEnd: Vec3;
  /** Knots (JD) and topocentric apparent directions of date of the Moon; see `withMoon`. */
  knotJd: Float64Array;
  moonKnots: Vec3[];
}

/**
 * Build the tables of one night, with Moon knots every `moonKnotHours` over the whole span
 * (pass 0 to add them later with `withMoon` over a shorter range).
 */
export function nightFrame(site: Site, span: NightSpan, moonKnotHours = 1): NightFrame {
  const gast = (jd: number) => SiderealTime(astroTime(jd)) * 15 * DEG;
  const days = span.endJd - span.startJd;
  const g0 = gast(span.startJd);
  const g1 = gast(span.endJd);
  const turns = Math.round((SIDEREAL_PER_SOLAR * days * TWO_PI - (g1 - g0)) / TWO_PI);
  const midJd = (span.startJd + span.endJd) / 2;
  const mid = astroTime(midJd);
  const frame: NightFrame = {
    site,
    span,
    sinLat: Math.sin(site.latitudeDeg * DEG),
    cosLat: Math.cos(site.latitudeDeg * DEG),
    lastStartRad: g0 + site.longitudeDeg * DEG,
    lastRateRadPerDay: (g1 - g0 + turns * TWO_PI) / days,
    midJd,
    precNut: rowMajor(Rotation_EQJ_EQD(mid)),
    beta: observerBeta(mid),
    refraction: siteRefraction(site),
    sunStart: bodyPlace(Body.Sun, site, span.startJd).ofDate,
    sunEnd: bodyPlace(Body.Sun, site, span.endJd).ofDate,
    knotJd: new Float64Array(0),
    moonKnots: [],
  };
  return moonKnotHours > 0 ? withMoon(frame, span.startJd, span.endJd, moonKnotHours) : frame;
}

/**
 * Fill the Moon knots from `fromJd` to `toJd` every `knotHours` (at least 2 knots). Linear
 * interpolation between knots errs by under 0.01° at 1 h and 0.04° at 2 h (the diurnal parallax
 * is the curved part).
 */
export function withMoon(
  f: NightFrame,
  fromJd: number,
  toJd: number,
  knotHours: number,
): NightFrame {
  const n = Math.max(2, Math.ceil(((toJd - fromJd) * 24) / knotHours) + 1);
  const knotJd = new Float64Array(n);
  const moonKnots: Vec3[] = [];
  for (let i = 0; i < n; i++) {
    knotJd[i] = fromJd + ((toJd - fromJd) * i) / (n - 1);
    moonKnots.push(bodyPlace(Body.Moon, f.site, knotJd[i]!).ofDate);
  }
  f.knotJd = knotJd;
  f.moonKnots = moonKnots;
  return f;
}

/** The Sun's interpolated direction of date at a JD. */
export function sunAt(f: NightFrame, jd: number): Vec3 {
  const u = (jd - f.span.startJd) / (f.span.endJd - f.span.startJd);
  const a = f.sunStart,
    b = f.sunEnd;
  return normalize([a[0] + (b[0] - a[0]) * u, a[1] + (b[1] - a[1]) * u, a[2] + (b[2] - a[2]) * u]);
}

/** The Moon's interpolated direction of date at a JD (clamped to the knot range). */
export function moonAt(f: NightFrame, jd: number): Vec3 {
  if (f.moonKnots.length < 2)
    throw new Error(
      'nightFrame: the Moon table is empty (build the frame with moonKnotHours > 0 or call withMoon)',
    );
  return interpolateKnots(f, f.moonKnots, jd);
}

/** Local apparent sidereal time (rad, unwrapped) at a JD in the frame. */
export function lastAt(f: NightFrame, jd: number): number {
  return f.lastStartRad + f.lastRateRadPerDay * (jd - f.span.startJd);
}

/** Apparent place of date (α, δ in rad) of an ICRS direction for this night. */
export function apparentInFrame(f: NightFrame, icrs: Vec3): { raRad: number; decRad: number } {
  return raDecFromVector(rotate(f.precNut, aberrate(icrs, f.beta)));
}

/** Interpolated unit vector from knots (clamped to the knot range). */
export function interpolateKnots(f: NightFrame, knots: Vec3[], jd: number): Vec3 {
  const n = f.knotJd.length;
  const k0 = f.knotJd[0]!,
    k1 = f.knotJd[n - 1]!;
  const x = Math.min(Math.max(((jd - k0) / (k1 - k0)) * (n - 1), 0), n - 1);
  const i = Math.min(Math.floor(x), n - 2);
  const u = x - i;
  const a = knots[i]!,
    b = knots[i + 1]!;
  return normalize([a[0] + (b[0] - a[0]) * u, a[1] + (b[1] - a[1]) * u, a[2] + (b[2] - a[2]) * u]);
}

/** Geometric altitude (rad) of an apparent place of date at a JD. */
export function altitudeRad(f: NightFrame, raRad: number, decRad: number, jd: number): number {
  const h = lastAt(f, jd) - raRad;
  return Math.asin(f.sinLat * Math.sin(decRad) + f.cosLat * Math.cos(decRad) * Math.cos(h));
}

/** Geometric altitude (rad) of a unit vector of date at a JD. */
export function altitudeOfVectorRad(f: NightFrame, v: Vec3, jd: number): number {
  const { raRad, decRad } = raDecFromVector(v);
  return altitudeRad(f, raRad, decRad, jd);
}
