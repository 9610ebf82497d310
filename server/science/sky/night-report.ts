/**
 * One night at one site for a list of targets: Sun, twilights, darkness, Moon, each target's
 * windows and an altitude/airmass curve for plotting. Times are given in UTC and in the site's zone.
 */
import { DEG } from '../constants.ts';
import { airmass } from './airmass.ts';
import { parallacticAngleRad } from './apparent.ts';
import type { Limits } from './limits.ts';
import { darknessExact, darknessFast, type Interval } from './darkness.ts';
import { altitudeOfVectorRad, moonAt, nightFrame, type NightFrame } from './frame.ts';
import { instant, nightSpan, type Instant } from './night.ts';
import { exactSampler, fastSampler, frameTarget } from './samplers.ts';
import { LOWEST_CHECKED_ALTITUDE_DEG } from './refraction.ts';
import { maskAltitudeDeg, refractionWords, type Site, type WavelengthSource } from './site.ts';
import { moonNight, sunNight, TWILIGHT_SUN_ALTITUDE_DEG, type TwilightKind } from './sun-moon.ts';
import type { Target } from './target.ts';
import { brokenLimit, findWindows, refineTransit, transitTimes, type Limit } from './windows.ts';

/** The steps a night report accepts at an interface (ISO 8601 durations, read by the time module). */
export const NIGHT_STEP = { default: 'PT5M', rule: { atMost: 'PT30M' } } as const;
export const NIGHT_CURVE_STEP = {
  default: 'PT10M',
  rule: { allowZero: true, atMost: 'PT1H' },
} as const;

export interface NightOptions {
  /** "fast" (the night's tables; default) or "exact" (astronomy-engine per instant, slower). */
  method?: 'fast' | 'exact';
  /** Window sampling step, minutes, (0, 30]; edges are refined to 1 s. Default 5. */
  stepMinutes?: number;
  /** Curve sampling step, minutes; 0 for no curves. Default 10. */
  curveStepMinutes?: number;
}

export interface ReportPoint extends Instant {
  altitudeDeg: number;
  airmass: number;
}

export interface ReportWindow {
  start: Instant;
  end: Instant;
  hours: number;
  opensBy: Limit;
  closesBy: Limit;
  transit: ReportPoint | null;
  best: ReportPoint & { seeingArcsec: number | null; moonSeparationDeg: number };
}

export interface TargetNight {
  name: string;
  /** Apparent place of date at the night's middle, degrees. */
  raOfDateDeg: number;
  decOfDateDeg: number;
  observableHours: number;
  windows: ReportWindow[];
  /** Distances from the Moon and the Sun at local solar midnight, degrees. */
  moonSeparationDeg: number;
  sunSeparationDeg: number;
  /** Sampled for plotting (fast path); airmass is null where the target is below the horizon. */
  curve: {
    utc: string[];
    altitudeDeg: number[];
    azimuthDeg: number[];
    airmass: (number | null)[];
    hourAngleDeg: number[];
    parallacticAngleDeg: number[];
    moonSeparationDeg: number[];
    /** With a horizon mask only: the mask's altitude at the target's azimuth at each sample, degrees. */
    horizonMaskDeg?: number[];
    /** The limit that closes the target at each sample (the windows' own rule), null where it is open. */
    closedBy: (Limit | null)[];
  } | null;
}

/** The Moon's topocentric altitude (centre, geometric: no refraction), degrees, on the curves' instants. */
export interface MoonCurve {
  utc: string[];
  altitudeDeg: number[];
}

export interface NightReport {
  site: {
    name: string;
    timeZone: string;
    latitudeDeg: number;
    longitudeDeg: number;
    elevationM: number;
    pressureHpa: number;
    temperatureC: number;
    /** Relative humidity and wavelength the refraction was computed for, % and µm. */
    humidityPct: number;
    wavelengthUm: number;
    wavelengthFrom: WavelengthSource;
    /** The same conditions in words (refractionWords). */
    refraction: string;
  };
  night: { date: string; start: Instant; end: Instant; hours: number };
  sun: {
    set: Instant | null;
    rise: Instant | null;
    midnight: Instant;
    twilights: Record<
      TwilightKind,
      { dusk: Instant | null; dawn: Instant | null; sunAltitudeDeg: number }
    >;
  };
  darkness: {
    limit: string;
    intervals: { start: Instant; end: Instant; hours: number }[];
    hours: number;
  };
  moon: {
    rise: Instant | null;
    set: Instant | null;
    transit: Instant | null;
    illuminatedFraction: number;
    phaseDeg: number;
    curve: MoonCurve | null;
  };
  limits: {
    altitudeLimitDeg: number;
    highestAirmass: number | null;
    airmassFormula: string;
    leastMoonDistanceDeg: number;
    leastSunDistanceDeg: number;
    horizonMask: boolean;
  };
  method: 'fast' | 'exact';
  targets: TargetNight[];
  cautions: string[];
}

const hoursOf = (i: Interval) => (i.endJd - i.startJd) * 24;

/** What every target of one night is computed against. */
interface NightSetting {
  site: Site;
  limits: Limits;
  method: 'fast' | 'exact';
  frame: NightFrame;
  dark: Interval[];
  edges: Interval;
  stepDays: number;
  midnightJd: number;
  /** One set of curve instants for every target and the Moon (empty for no curves). */
  curveJd: number[];
  curveUtc: string[];
}

export function nightReport(
  site: Site,
  date: string,
  targets: readonly Target[],
  c: Limits,
  options: NightOptions = {},
): NightReport {
  const method = options.method ?? 'fast';
  const curveStep = options.curveStepMinutes ?? 10;
  const span = nightSpan(site, date);
  const zone = site.timeZone;
  const at = (jd: number | null) => (jd === null ? null : instant(jd, zone));
  const frame = nightFrame(site, span);
  const dark =
    method === 'exact'
      ? darknessExact(site, span, c.sunLimitDeg)
      : darknessFast(frame, c.sunLimitDeg);
  const sun = sunNight(site, span);
  const moon = moonNight(site, span, sun.midnightJd);
  const curveJd: number[] = [];
  if (curveStep > 0) {
    const n = Math.floor(((span.endJd - span.startJd) * 1440) / curveStep);
    for (let i = 0; i <= n; i++) curveJd.push(span.startJd + (i * curveStep) / 1440);
  }
  const setting: NightSetting = {
    site,
    limits: c,
    method,
    frame,
    dark,
    edges: { startJd: span.startJd, endJd: span.endJd },
    stepDays: (options.stepMinutes ?? 5) / 1440,
    midnightJd: sun.midnightJd,
    curveJd,
    curveUtc: curveJd.map((jd) => instant(jd, zone).utc),
  };
  return {
    site: {
      name: site.name,
      timeZone: zone,
      latitudeDeg: site.latitudeDeg,
      longitudeDeg: site.longitudeDeg,
      elevationM: site.elevationM,
      pressureHpa: site.pressureHpa,
      temperatureC: site.temperatureC,
      humidityPct: site.humidityPct,
      wavelengthUm: site.wavelengthUm,
      wavelengthFrom: site.wavelengthFrom,
      refraction: refractionWords(site),
    },
    night: {
      date,
      start: instant(span.startJd, zone),
      end: instant(span.endJd, zone),
      hours: hoursOf(span),
    },
    sun: {
      set: at(sun.setJd),
      rise: at(sun.riseJd),
      midnight: instant(sun.midnightJd, zone),
      twilights: twilightTable(sun, zone),
    },
    darkness: darknessSummary(c.darknessLabel, dark, zone),
    moon: {
      rise: at(moon.riseJd),
      set: at(moon.setJd),
      transit: at(moon.transitJd),
      illuminatedFraction: moon.illuminatedFraction,
      phaseDeg: moon.phaseDeg,
      curve: curveStep > 0 ? moonCurve(frame, curveJd, setting.curveUtc) : null,
    },
    limits: limitsSummary(c),
    method,
    targets: targets.map((target) => targetNight(setting, target)),
    cautions: cautions(c),
  };
}

/** The dark intervals in the site's zone, with the darkness limit's name and the total hours. */
function darknessSummary(
  limit: Limits['darknessLabel'],
  dark: Interval[],
  zone: string,
): NightReport['darkness'] {
  return {
    limit,
    intervals: dark.map((d) => ({
      start: instant(d.startJd, zone),
      end: instant(d.endJd, zone),
      hours: hoursOf(d),
    })),
    hours: dark.reduce((h, d) => h + hoursOf(d), 0),
  };
}

/** The limits the windows were judged by. */
function limitsSummary(c: Limits): NightReport['limits'] {
  return {
    altitudeLimitDeg: c.altitudeLimitDeg,
    highestAirmass: c.highestAirmass,
    airmassFormula: c.airmassFormula,
    leastMoonDistanceDeg: c.leastMoonDistanceDeg,
    leastSunDistanceDeg: c.leastSunDistanceDeg,
    horizonMask: c.mask.length > 0,
  };
}

/** Each twilight's dusk and dawn in the site's zone, with the Sun's altitude that defines it. */
function twilightTable(
  sun: ReturnType<typeof sunNight>,
  zone: string,
): NightReport['sun']['twilights'] {
  const twilights = {} as NightReport['sun']['twilights'];
  for (const kind of Object.keys(TWILIGHT_SUN_ALTITUDE_DEG) as TwilightKind[]) {
    const dusk = sun.dusk[kind],
      dawn = sun.dawn[kind];
    twilights[kind] = {
      dusk: dusk === null ? null : instant(dusk, zone),
      dawn: dawn === null ? null : instant(dawn, zone),
      sunAltitudeDeg: TWILIGHT_SUN_ALTITUDE_DEG[kind],
    };
  }
  return twilights;
}

/** One target's night: its place of date, its windows (transits refined on the exact path), its curve. */
function targetNight(n: NightSetting, target: Target): TargetNight {
  const { site, limits: c, frame } = n;
  const zone = site.timeZone;
  const point = (p: { jd: number; altitudeDeg: number; airmass: number }): ReportPoint => ({
    ...instant(p.jd, zone),
    altitudeDeg: p.altitudeDeg,
    airmass: p.airmass,
  });
  const ft = frameTarget(frame, target);
  const fast = fastSampler(frame, ft);
  const sample = n.method === 'exact' ? exactSampler(site, target) : fast;
  let transits = transitTimes(
    ft.raRad,
    frame.lastStartRad,
    frame.lastRateRadPerDay,
    n.edges.startJd,
    n.edges.endJd,
  );
  if (n.method === 'exact')
    transits = transits.map((t) => refineTransit(sample, t, frame.lastRateRadPerDay));
  const windows = findWindows(sample, c, n.dark, n.edges, n.stepDays, transits).map((w) => ({
    start: instant(w.startJd, zone),
    end: instant(w.endJd, zone),
    hours: hoursOf(w),
    opensBy: w.opensBy,
    closesBy: w.closesBy,
    transit: w.transit && point(w.transit),
    best: {
      ...point(w.best),
      seeingArcsec: w.best.seeingArcsec,
      moonSeparationDeg: w.best.moonSeparationDeg,
    },
  }));
  return {
    name: target.name,
    raOfDateDeg: ft.raRad / DEG,
    decOfDateDeg: ft.decRad / DEG,
    observableHours: windows.reduce((h, w) => h + w.hours, 0),
    moonSeparationDeg: fast(n.midnightJd).moonSeparationDeg,
    sunSeparationDeg: fast(n.midnightJd).sunSeparationDeg,
    windows,
    curve: n.curveJd.length > 0 ? targetCurve(n, fast, ft.decRad) : null,
  };
}

/** A target's curve at the night's curve instants, each sample with the limit that closes it. */
function targetCurve(
  n: NightSetting,
  fast: ReturnType<typeof fastSampler>,
  decRad: number,
): NonNullable<TargetNight['curve']> {
  const c = n.limits;
  const curve: NonNullable<TargetNight['curve']> = {
    utc: n.curveUtc,
    altitudeDeg: [],
    azimuthDeg: [],
    airmass: [],
    hourAngleDeg: [],
    parallacticAngleDeg: [],
    moonSeparationDeg: [],
    closedBy: [],
  };
  const mask: number[] | undefined = c.mask.length > 0 ? [] : undefined;
  if (mask) curve.horizonMaskDeg = mask;
  for (const jd of n.curveJd) {
    const s = fast(jd);
    const x = airmass(c.airmassFormula, s.trueAltitudeDeg, s.altitudeDeg);
    curve.altitudeDeg.push(round(s.altitudeDeg, 3));
    curve.azimuthDeg.push(round(s.azimuthDeg, 3));
    curve.airmass.push(s.altitudeDeg > 0 && Number.isFinite(x) ? round(x, 4) : null);
    curve.hourAngleDeg.push(round(s.hourAngleRad / DEG, 3));
    curve.parallacticAngleDeg.push(
      round(parallacticAngleRad(s.hourAngleRad, decRad, n.site.latitudeDeg * DEG) / DEG, 2),
    );
    curve.moonSeparationDeg.push(round(s.moonSeparationDeg, 2));
    mask?.push(round(maskAltitudeDeg(c.mask, s.azimuthDeg), 3));
    const inDark = n.dark.some((d) => jd >= d.startJd && jd <= d.endJd);
    curve.closedBy.push(inDark ? brokenLimit(s, c) : 'darkness');
  }
  return curve;
}

/** From the night's Moon table (knots every hour, under 0.01° of interpolation error; see frame.ts). */
function moonCurve(frame: NightFrame, jds: readonly number[], utc: string[]): MoonCurve {
  return {
    utc,
    altitudeDeg: jds.map((jd) => round(altitudeOfVectorRad(frame, moonAt(frame, jd), jd) / DEG, 3)),
  };
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

/** The usual cautions for pointing near the Sun; the site's rules always take precedence. */
export function cautions(c: Limits): string[] {
  const out = [
    "Windows are advisory: the site's own pointing limits, Sun-avoidance interlocks and operating " +
      'rules take precedence.',
  ];
  if (c.sunLimitDeg > TWILIGHT_SUN_ALTITUDE_DEG.nautical) {
    out.push(
      `The darkness limit (${c.darknessLabel}) lets windows start in bright twilight: never point ` +
        `a telescope, finder or camera near the Sun; follow the site's Sun-avoidance rules.`,
    );
  }
  // Refused would be wrong: 0° is the sites' default and right for rise and set times. But below
  // LOWEST_CHECKED_ALTITUDE_DEG nothing outside checks the refraction, and the real atmosphere
  // there departs from any model by more than the model's own error.
  if (c.altitudeLimitDeg < LOWEST_CHECKED_ALTITUDE_DEG) {
    out.push(
      `These limits allow altitudes down to ${round(c.altitudeLimitDeg, 1)}°, below ` +
        `${LOWEST_CHECKED_ALTITUDE_DEG}°: there refraction is not checked against an outside ` +
        `model and varies with the air near the horizon, so times and altitudes that low may be ` +
        `off by minutes and arcminutes. Set a lowest altitude or highest airmass if the ` +
        `telescope does not observe that low.`,
    );
  }
  if (c.leastSunDistanceDeg < 30) {
    out.push(
      `Sun avoidance is set to ${c.leastSunDistanceDeg}°, below the usual 30–45°: check it ` +
        `against the site's rules before observing.`,
    );
  }
  return out;
}
