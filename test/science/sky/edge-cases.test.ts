/**
 * The edges of nightly windows, each as a named case: polar day and night, circumpolar and
 * never-rising targets, nights across a daylight-saving change, a target that sets and rises again
 * within one night, a horizon mask, the Moon and the Sun-avoidance angle. Sites are invented.
 */
import { Body } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { DEG } from '../../../server/science/constants.ts';
import {
  cautions,
  LOWEST_CHECKED_ALTITUDE_DEG,
  nightFrame,
  nightReport,
  nightSpan,
  validateLimits,
  validateSite,
  validateTarget,
  type Site,
} from '../../../server/science/sky/index.ts';
import { lastAt } from '../../../server/science/sky/frame.ts';
import { bodyPlace, sunNight } from '../../../server/science/sky/sun-moon.ts';
import { raDecFromVector } from '../../../server/science/sky/vectors.ts';

const arctic = validateSite({
  name: 'Isbreen Hut',
  latitudeDeg: 78.2,
  longitudeDeg: 15.6,
  elevationM: 450,
  timeZone: 'Arctic/Longyearbyen',
});
const alpine = validateSite({
  name: 'Hollowmere',
  latitudeDeg: 47.5,
  longitudeDeg: 8.0,
  elevationM: 900,
  timeZone: 'Europe/Berlin',
});
const boreal = validateSite({
  name: 'Kivijarvi Mast',
  latitudeDeg: 60.0,
  longitudeDeg: 25.0,
  elevationM: 120,
  timeZone: 'Europe/Helsinki',
});
const noMoon = (site: Site, extra: object = {}) =>
  validateLimits({ leastMoonDistanceDeg: 0, ...extra }, site);
const star = (name: string, raDeg: number, decDeg: number) =>
  validateTarget({ name, raDeg, decDeg });
const ms = (s: string) => Date.parse(s);

describe('polar day and polar night', () => {
  it('polar day: no darkness, no sunset, no windows', () => {
    const r = nightReport(arctic, '2027-06-21', [star('north star', 279, 38.8)], noMoon(arctic), {
      curveStepMinutes: 0,
    });
    // At 78.2°N the June Sun stays above the horizon all day: its lowest altitude is 78.2 + 23.4 − 90 = +11.6° (common practice, no source)
    expect(r.darkness.intervals).toEqual([]);
    expect(r.sun.set).toBeNull();
    expect(r.sun.rise).toBeNull();
    expect(r.targets[0]!.windows).toEqual([]);
  });

  it('polar night: dark from night edge to night edge; a circumpolar star is observable throughout', () => {
    // In December the Sun's highest altitude there is 90 − 78.2 − 23.4 = −11.6°, below the civil limit of −6° (common practice, no source)
    const c = validateLimits({ darkness: 'civil', leastMoonDistanceDeg: 0 }, arctic);
    const r = nightReport(arctic, '2027-12-21', [star('high north', 40, 60)], c, {
      curveStepMinutes: 0,
    });
    expect(r.darkness.intervals).toHaveLength(1);
    expect(r.darkness.hours).toBeCloseTo(24, 6); // the whole noon-to-noon night (common practice, no source)
    const [w] = r.targets[0]!.windows;
    expect(r.targets[0]!.windows).toHaveLength(1);
    expect(w!.opensBy).toBe('night-edge');
    expect(w!.closesBy).toBe('night-edge');
    expect(w!.hours).toBeCloseTo(24, 6); // δ = 60° at φ = 78.2° never drops below 48° (common practice, no source)
    expect(r.cautions.some((s) => s.includes('never point'))).toBe(true); // civil darkness carries the Sun caution
  });
});

describe('circumpolar and never-rising targets', () => {
  it('a circumpolar target is observable for the whole of darkness', () => {
    const r = nightReport(alpine, '2027-02-10', [star('pole', 30, 85)], noMoon(alpine), {
      curveStepMinutes: 0,
    });
    const [dark] = r.darkness.intervals;
    const [w] = r.targets[0]!.windows;
    expect(r.targets[0]!.windows).toHaveLength(1);
    expect(w!.start.utc).toBe(dark!.start.utc);
    expect(w!.end.utc).toBe(dark!.end.utc);
    expect(w!.opensBy).toBe('darkness');
    expect(w!.closesBy).toBe('darkness');
  });

  it('a target that never rises has no window and stays below the horizon all night', () => {
    const r = nightReport(alpine, '2027-02-10', [star('far south', 100, -60)], noMoon(alpine), {
      curveStepMinutes: 15,
    });
    expect(r.targets[0]!.windows).toEqual([]);
    // Highest altitude 90 − 47.5 − 60 = −17.5° (common practice, no source)
    expect(Math.max(...r.targets[0]!.curve!.altitudeDeg)).toBeLessThan(0); // refraction lifts by < 1°, far less than the 17.5° margin
    expect(r.targets[0]!.curve!.airmass.every((x) => x === null)).toBe(true);
  });
});

describe('nights across a daylight-saving change', () => {
  it('spring forward: the night lasts 23 h and local times change offset at 02:00', () => {
    // Central European Summer Time starts on the last Sunday of March at 01:00 UTC (EU Directive 2000/84/EC (from memory))
    const r = nightReport(alpine, '2027-03-27', [star('pole', 30, 85)], noMoon(alpine), {
      curveStepMinutes: 0,
    });
    expect(r.night.hours).toBeCloseTo(23, 6); // clocks go forward one hour (EU Directive 2000/84/EC (from memory))
    expect(r.night.start.local).toBe('2027-03-27T12:00:00+01:00'); // CET = UTC+1, CEST = UTC+2 (IANA tz database, Europe/Berlin)
    expect(r.night.end.local).toBe('2027-03-28T12:00:00+02:00');
    const [w] = r.targets[0]!.windows;
    expect(w!.start.local.endsWith('+01:00')).toBe(true);
    expect(w!.end.local.endsWith('+02:00')).toBe(true);
    // The window's length is its UTC length, not its wall-clock difference
    expect((ms(w!.end.utc) - ms(w!.start.utc)) / 3.6e6).toBeCloseTo(w!.hours, 3);
  });

  it('fall back: the night lasts 25 h', () => {
    const r = nightReport(alpine, '2027-10-30', [], noMoon(alpine));
    expect(r.night.hours).toBeCloseTo(25, 6); // clocks go back one hour on the last Sunday of October (EU Directive 2000/84/EC (from memory))
    expect(r.night.end.local).toBe('2027-10-31T12:00:00+01:00');
  });
});

describe('a target that sets and rises again within one night', () => {
  it('gives two windows, closed and reopened by altitude', () => {
    // At 60°N in December darkness lasts over 12 h; a star at δ = +40° culminating below at local
    // midnight drops under 20° for about 7.4 h around it (cos H₀ = (sin 20° − sin 60° sin 40°)/(cos 60° cos 40°)).
    const span = nightSpan(boreal, '2027-12-20');
    const frame = nightFrame(boreal, span, 0);
    const midnight = sunNight(boreal, span).midnightJd;
    const raDeg = (((lastAt(frame, midnight) / DEG + 180) % 360) + 360) % 360;
    const r = nightReport(
      boreal,
      '2027-12-20',
      [star('dips low', raDeg, 40)],
      noMoon(boreal, { lowestAltitudeDeg: 20 }),
      { curveStepMinutes: 0 },
    );
    const ws = r.targets[0]!.windows;
    expect(ws).toHaveLength(2);
    expect(ws[0]!.opensBy).toBe('darkness');
    expect(ws[0]!.closesBy).toBe('altitude');
    expect(ws[1]!.opensBy).toBe('altitude');
    expect(ws[1]!.closesBy).toBe('darkness');
    const gapHours = (ms(ws[1]!.start.utc) - ms(ws[0]!.end.utc)) / 3.6e6;
    const h0 = Math.acos(
      (Math.sin(20 * DEG) - Math.sin(60 * DEG) * Math.sin(40 * DEG)) /
        (Math.cos(60 * DEG) * Math.cos(40 * DEG)),
    );
    expect(gapHours).toBeCloseTo((24 - (2 * h0) / DEG / 15) / 1.0027379, 1); // spherical astronomy: time below = sidereal day − 2H₀ (in solar hours); refraction shortens it by ~1 min
  });
});

describe('horizon mask, Moon and Sun avoidance', () => {
  it('a mask over the south-east holds a window shut until the target crosses the meridian', () => {
    const masked = validateSite({
      name: 'Hollowmere',
      latitudeDeg: 47.5,
      longitudeDeg: 8.0,
      elevationM: 900,
      timeZone: 'Europe/Berlin',
      horizonMask: [
        { azimuthDeg: 0, altitudeDeg: 0 },
        { azimuthDeg: 89.9, altitudeDeg: 0 },
        { azimuthDeg: 90, altitudeDeg: 70 },
        { azimuthDeg: 180, altitudeDeg: 70 },
        { azimuthDeg: 180.05, altitudeDeg: 0 },
      ],
    });
    const span = nightSpan(masked, '2027-01-15');
    const frame = nightFrame(masked, span, 0);
    const midnight = sunNight(masked, span).midnightJd;
    const raDeg = (((lastAt(frame, midnight) / DEG) % 360) + 360) % 360;
    const r = nightReport(
      masked,
      '2027-01-15',
      [star('behind the ridge', raDeg, 5)],
      noMoon(masked, { lowestAltitudeDeg: 10 }),
      { curveStepMinutes: 0 },
    );
    const [w] = r.targets[0]!.windows;
    expect(r.targets[0]!.windows).toHaveLength(1);
    expect(w!.opensBy).toBe('horizon-mask');
    // It opens at the transit (the mask drops at azimuth 180°), up to the few seconds it takes to
    // cross 0.05° of mask slope. Transit: local sidereal time = apparent right ascension of date.
    const dra =
      ((((r.targets[0]!.raOfDateDeg * DEG - lastAt(frame, midnight)) % (2 * Math.PI)) +
        3 * Math.PI) %
        (2 * Math.PI)) -
      Math.PI;
    const transitJd = midnight + dra / frame.lastRateRadPerDay;
    expect(Math.abs(ms(w!.start.utc) / 86_400_000 + 2_440_587.5 - transitJd) * 86_400).toBeLessThan(
      20,
    ); // common practice, no source: a few seconds of mask slope plus the 1 s edge search
    const open = nightReport(
      alpine,
      '2027-01-15',
      [star('behind the ridge', raDeg, 5)],
      noMoon(alpine, { lowestAltitudeDeg: 10 }),
      { curveStepMinutes: 0 },
    );
    expect(open.targets[0]!.windows[0]!.opensBy).toBe('altitude');
  });

  it('the Moon closes part of the night to a target near it, and no window keeps it within the limit', () => {
    // A night near full Moon; the target sits 12° north of the Moon.
    const span = nightSpan(alpine, '2027-01-22');
    const moon = raDecFromVector(
      bodyPlace(Body.Moon, alpine, (span.startJd + span.endJd) / 2).ofDate,
    );
    const target = star('beside the Moon', moon.raRad / DEG, moon.decRad / DEG + 12);
    const withMoon = nightReport(
      alpine,
      '2027-01-22',
      [target],
      validateLimits({ leastMoonDistanceDeg: 30, lowestAltitudeDeg: 15 }, alpine),
      { curveStepMinutes: 0 },
    );
    const without = nightReport(
      alpine,
      '2027-01-22',
      [target],
      noMoon(alpine, { lowestAltitudeDeg: 15 }),
      { curveStepMinutes: 0 },
    );
    expect(without.targets[0]!.observableHours).toBeGreaterThan(4); // a winter night at 47.5°N with a target near the full Moon, high in the sky (common practice, no source)
    expect(withMoon.targets[0]!.observableHours).toBeLessThan(
      without.targets[0]!.observableHours - 1,
    );
    expect(withMoon.moon.illuminatedFraction).toBeGreaterThan(0.9); // the night was chosen near full Moon (astronomy-engine Illumination)
  });

  it('Sun avoidance shortens a window that starts in twilight near the setting Sun', () => {
    const span = nightSpan(alpine, '2027-05-01');
    const sun = raDecFromVector(bodyPlace(Body.Sun, alpine, span.startJd + 0.3).ofDate);
    const target = star('evening sky', (sun.raRad / DEG + 35) % 360, sun.decRad / DEG + 5);
    const strict = nightReport(
      alpine,
      '2027-05-01',
      [target],
      validateLimits(
        {
          darkness: 'civil',
          lowestAltitudeDeg: 5,
          leastMoonDistanceDeg: 0,
          leastSunDistanceDeg: 45,
        },
        alpine,
      ),
      { curveStepMinutes: 0 },
    );
    const loose = nightReport(
      alpine,
      '2027-05-01',
      [target],
      validateLimits(
        {
          darkness: 'civil',
          lowestAltitudeDeg: 5,
          leastMoonDistanceDeg: 0,
          leastSunDistanceDeg: 0,
        },
        alpine,
      ),
      { curveStepMinutes: 0 },
    );
    expect(loose.targets[0]!.observableHours).toBeGreaterThan(0);
    expect(strict.targets[0]!.observableHours).toBeLessThan(loose.targets[0]!.observableHours);
    expect(strict.cautions.some((s) => s.includes('never point'))).toBe(true);
    expect(loose.cautions.some((s) => s.includes('Sun avoidance is set to 0°'))).toBe(true);
  });
});

describe('limits that reach below the lowest altitude where refraction is checked', () => {
  it('carry one plain caution; limits at or above it carry none', () => {
    // LOWEST_CHECKED_ALTITUDE_DEG: the lowest altitude the refraction is checked against ERFA
    // (test/science/sky/refraction-band.test.ts); below it only the caution stands.
    const low = cautions(validateLimits({ lowestAltitudeDeg: 2 }, alpine));
    const high = cautions(
      validateLimits({ lowestAltitudeDeg: LOWEST_CHECKED_ALTITUDE_DEG }, alpine),
    );
    const byAirmass = cautions(validateLimits({ lowestAltitudeDeg: 0, highestAirmass: 3 }, alpine));
    const said = (list: string[]) => list.filter((s) => s.includes('refraction is not checked'));
    expect(said(low)).toHaveLength(1);
    expect(said(low)[0]).toMatch(/down to 2°, below 5°/);
    expect(said(high)).toHaveLength(0);
    expect(said(byAirmass)).toHaveLength(0); // airmass 3 keeps every window above 19°
  });
});
