/**
 * The fast path (per-night tables) against the exact path (astronomy-engine per instant) for random
 * targets, sites and nights across a year: altitude within 1″, window edges within 30 s.
 */
import { describe, expect, it } from 'vitest';
import {
  altitudeGrid,
  fastSampler,
  frameTarget,
  icrsDirection,
  nightFrame,
  nightReport,
  nightSpan,
  skyPlaceExact,
  validateLimits,
} from '../../../server/science/sky/index.ts';
import { randomDate, randomSite, randomTarget, seeded, stats } from './helpers.ts';

const wrap180 = (d: number) => ((((d + 180) % 360) + 360) % 360) - 180;

describe('fast vs exact: altitude', () => {
  it('within 1″ (geometric and refracted), azimuth within 1″ on the sky', () => {
    const rnd = seeded(7);
    const dAlt: number[] = [],
      dApp: number[] = [],
      dAz: number[] = [];
    for (let n = 0; n < 60; n++) {
      const site = randomSite(rnd, 70);
      const span = nightSpan(site, randomDate(rnd));
      const frame = nightFrame(site, span);
      for (let t = 0; t < 5; t++) {
        const target = randomTarget(rnd);
        const fast = fastSampler(frame, frameTarget(frame, target));
        for (let k = 0; k < 6; k++) {
          const jd = span.startJd + rnd() * (span.endJd - span.startJd);
          const exact = skyPlaceExact(icrsDirection(target, jd), jd, site);
          const f = fast(jd);
          if (exact.trueAltitudeDeg < -5) continue;
          dAlt.push((f.trueAltitudeDeg - exact.trueAltitudeDeg) * 3600);
          dApp.push((f.altitudeDeg - exact.altitudeDeg) * 3600);
          if (exact.trueAltitudeDeg < 85)
            dAz.push(
              wrap180(f.azimuthDeg - exact.azimuthDeg) *
                3600 *
                Math.cos((exact.trueAltitudeDeg * Math.PI) / 180),
            );
        }
      }
    }
    const a = stats(dAlt),
      r = stats(dApp),
      z = stats(dAz);
    console.log(
      `fast vs exact altitude: worst ${a.worst.toFixed(3)}″ RMS ${a.rms.toFixed(3)}″; refracted worst ${r.worst.toFixed(3)}″; azimuth·cos(alt) worst ${z.worst.toFixed(3)}″ (n=${dAlt.length})`,
    );
    expect(dAlt.length).toBeGreaterThan(500);
    expect(a.worst).toBeLessThan(1); // issue 3 tolerance
    expect(r.worst).toBeLessThan(1); // issue 3 tolerance
    expect(z.worst).toBeLessThan(1); // issue 3 tolerance
  });
});

describe('batch altitudes', () => {
  it("the grid gives the exact path's altitudes within 1″ for many targets and instants at once", () => {
    const rnd = seeded(8);
    const site = randomSite(rnd, 60);
    const span = nightSpan(site, randomDate(rnd));
    const frame = nightFrame(site, span, 0);
    const targets = Array.from({ length: 8 }, () => randomTarget(rnd));
    const jd = Float64Array.from({ length: 25 }, (_, k) => span.startJd + k / 24);
    const grid = altitudeGrid(
      frame,
      targets.map((t) => frameTarget(frame, t)),
      jd,
    );
    let worst = 0;
    targets.forEach((t, i) => {
      jd.forEach((j, k) => {
        worst = Math.max(
          worst,
          Math.abs(
            grid[i * jd.length + k]! - skyPlaceExact(icrsDirection(t, j), j, site).altitudeDeg,
          ) * 3600,
        );
      });
    });
    expect(grid).toHaveLength(200);
    expect(worst).toBeLessThan(1); // issue 3 tolerance, exact path as reference
  });
});

describe('fast vs exact: window edges', () => {
  it('the same windows, edges within 30 s', () => {
    const rnd = seeded(99);
    const errs: number[] = [];
    let windows = 0;
    for (let n = 0; n < 24; n++) {
      const site = randomSite(rnd, 65);
      const date = randomDate(rnd);
      const targets = [randomTarget(rnd, 'a'), randomTarget(rnd, 'b'), randomTarget(rnd, 'c')];
      const c = validateLimits(
        {
          darkness: (['civil', 'nautical', 'astronomical'] as const)[n % 3],
          highestAirmass: 1.5 + rnd() * 1.5,
          leastMoonDistanceDeg: 20 + 30 * rnd(),
        },
        site,
      );
      const fast = nightReport(site, date, targets, c, { method: 'fast', curveStepMinutes: 0 });
      const exact = nightReport(site, date, targets, c, { method: 'exact', curveStepMinutes: 0 });
      fast.targets.forEach((ft, i) => {
        const et = exact.targets[i]!;
        expect(ft.windows.length, `${site.latitudeDeg.toFixed(1)} ${date} ${ft.name}`).toBe(
          et.windows.length,
        );
        ft.windows.forEach((w, j) => {
          const e = et.windows[j]!;
          windows++;
          errs.push(
            (Date.parse(w.start.utc) - Date.parse(e.start.utc)) / 1000,
            (Date.parse(w.end.utc) - Date.parse(e.end.utc)) / 1000,
          );
          expect(w.opensBy).toBe(e.opensBy);
          expect(w.closesBy).toBe(e.closesBy);
        });
      });
    }
    const s = stats(errs);
    console.log(
      `window edges, fast vs exact: worst ${s.worst.toFixed(1)} s, RMS ${s.rms.toFixed(1)} s over ${windows} windows`,
    );
    expect(windows).toBeGreaterThan(10);
    expect(s.worst).toBeLessThan(30); // issue 3 tolerance
  });
});
