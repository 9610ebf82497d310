/**
 * The night report's sampled Moon altitude (drawn on the client's night chart) against
 * astronomy-engine's own topocentric Moon at each instant, and the horizon mask sampled along each
 * target's path against the windows found by the search. Sites and targets are invented.
 */
import { Body, Equator, Horizon, MakeTime } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  nightReport,
  validateLimits,
  validateSite,
  validateTarget,
} from '../../../server/science/sky/index.ts';
import { randomDate, randomSite, seeded, stats } from './helpers.ts';

const ARCMIN_DEG = 1 / 60;

/** astronomy-engine's topocentric altitude of the Moon's centre, no refraction (the reference). */
function moonAltitudeDeg(site: ReturnType<typeof validateSite>, utc: string): number {
  const t = MakeTime(new Date(utc));
  const eq = Equator(Body.Moon, t, site.observer, true, true);
  return Horizon(t, site.observer, eq.ra, eq.dec).altitude;
}

describe('Moon altitude curve', () => {
  it('agrees with astronomy-engine within 1′ at every sample on twelve random nights and sites', () => {
    const rnd = seeded(20270);
    const errs: number[] = [];
    for (let k = 0; k < 12; k++) {
      const site = randomSite(rnd);
      const r = nightReport(site, randomDate(rnd), [], validateLimits({}, site), {
        curveStepMinutes: 20,
      });
      const curve = r.moon.curve!;
      expect(curve.utc).toHaveLength(curve.altitudeDeg.length);
      expect(curve.utc.length).toBeGreaterThanOrEqual(69); // 23–25 h every 20 min, both ends (common practice, no source)
      curve.utc.forEach((u, i) => {
        errs.push(curve.altitudeDeg[i]! - moonAltitudeDeg(site, u));
      });
    }
    const { worst, rms } = stats(errs);
    console.log(
      `Moon altitude vs astronomy-engine: ${errs.length} samples, worst ${(worst * 3600).toFixed(1)}″, RMS ${(rms * 3600).toFixed(1)}″`,
    );
    // Tolerance 1′: the brief's requirement for a plotted curve; the Moon table's linear interpolation is the only approximation.
    expect(worst).toBeLessThan(ARCMIN_DEG);
  });

  it("shares the targets' instants, and is left out with the curves", () => {
    const site = validateSite({
      name: 'Carrow Fell',
      latitudeDeg: -31.3,
      longitudeDeg: 149.1,
      elevationM: 1160,
      timeZone: 'Australia/Sydney',
    });
    const star = validateTarget({ name: 'Fell star', raDeg: 210, decDeg: -40 });
    const c = validateLimits({}, site);
    const r = nightReport(site, '2027-04-20', [star], c, { curveStepMinutes: 10 });
    expect(r.moon.curve!.utc).toEqual(r.targets[0]!.curve!.utc);
    expect(
      nightReport(site, '2027-04-20', [star], c, { curveStepMinutes: 0 }).moon.curve,
    ).toBeNull();
  });

  it("peaks within 15 minutes of astronomy-engine's Moon transit and dips below the horizon within the noon-to-noon night", () => {
    // The Moon is highest near its meridian transit (common practice, no source); astronomy-engine gives the transit.
    const site = validateSite({
      name: 'Carrow Fell',
      latitudeDeg: -31.3,
      longitudeDeg: 149.1,
      elevationM: 1160,
      timeZone: 'Australia/Sydney',
    });
    const r = nightReport(site, '2027-04-20', [], validateLimits({}, site), {
      curveStepMinutes: 10,
    });
    const curve = r.moon.curve!;
    const top = curve.altitudeDeg.indexOf(Math.max(...curve.altitudeDeg));
    // 2027-04-20 at this site: the Moon crosses the meridian inside the noon-to-noon night.
    expect(r.moon.transit).not.toBeNull();
    expect(Math.abs(Date.parse(curve.utc[top]!) - Date.parse(r.moon.transit!.utc))).toBeLessThan(
      15 * 60_000,
    );
    expect(Math.min(...curve.altitudeDeg)).toBeLessThan(0);
  });
});

describe("horizon mask along a target's path", () => {
  // An invented site whose southern ridge rises to 45°, above its 30° limit.
  const site = validateSite({
    name: 'Brannock Shelf',
    latitudeDeg: -24.0,
    longitudeDeg: -70.0,
    elevationM: 2600,
    timeZone: 'America/Santiago',
    lowestAltitudeDeg: 30,
    horizonMask: [
      { azimuthDeg: 0, altitudeDeg: 5 },
      { azimuthDeg: 150, altitudeDeg: 5 },
      { azimuthDeg: 180, altitudeDeg: 45 },
      { azimuthDeg: 210, altitudeDeg: 5 },
    ],
  });
  const star = validateTarget({ name: 'south star', raDeg: 270, decDeg: -75 });

  it('is sampled only when a mask applies', () => {
    const withMask = nightReport(
      site,
      '2027-07-10',
      [star],
      validateLimits({ leastMoonDistanceDeg: 0 }, site),
      { curveStepMinutes: 10 },
    );
    const without = nightReport(
      site,
      '2027-07-10',
      [star],
      validateLimits({ leastMoonDistanceDeg: 0, useHorizonMask: false }, site),
      { curveStepMinutes: 10 },
    );
    expect(withMask.targets[0]!.curve!.horizonMaskDeg).toHaveLength(
      withMask.targets[0]!.curve!.utc.length,
    );
    expect(without.targets[0]!.curve!.horizonMaskDeg).toBeUndefined();
  });

  it('no window covers an instant where the target sits below the sampled mask, and the mask reaches 45° due south', () => {
    const r = nightReport(
      site,
      '2027-07-10',
      [star],
      validateLimits({ leastMoonDistanceDeg: 0 }, site),
      { curveStepMinutes: 5 },
    );
    const t = r.targets[0]!;
    const curve = t.curve!;
    const mask = curve.horizonMaskDeg!;
    // Due south (azimuth 180°) the mask is its 45° peak by construction of the invented mask above.
    const south = curve.azimuthDeg.findIndex((az) => Math.abs(az - 180) < 1);
    expect(south).toBeGreaterThanOrEqual(0);
    expect(mask[south]!).toBeGreaterThan(43);
    let blocked = 0;
    curve.utc.forEach((u, i) => {
      if (curve.altitudeDeg[i]! >= mask[i]! - 0.05) return;
      blocked++;
      const ms = Date.parse(u);
      expect(
        t.windows.some(
          (w) => Date.parse(w.start.utc) < ms - 1000 && Date.parse(w.end.utc) > ms + 1000,
        ),
      ).toBe(false);
    });
    expect(blocked).toBeGreaterThan(0);
  });
});
