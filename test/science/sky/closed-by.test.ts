/**
 * The night report's per-sample closing limit (the night chart blanks a target's lane by it)
 * against the report's own windows, and its darkness and altitude labels against astronomy-engine's
 * Sun and the target's altitude. Sites, targets and dates are invented.
 */
import { Body, Equator, Horizon, MakeTime } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { nightReport, validateLimits } from '../../../server/science/sky/index.ts';
import { randomDate, randomSite, randomTarget, seeded } from './helpers.ts';

describe('closedBy on the curves', () => {
  it('is null inside every window and names a limit outside, on 40 random target-nights', () => {
    const rnd = seeded(7311);
    let open = 0;
    let closed = 0;
    for (let k = 0; k < 20; k++) {
      const site = randomSite(rnd);
      const targets = [randomTarget(rnd, 'a'), randomTarget(rnd, 'b')];
      const c = validateLimits({ highestAirmass: 2, leastMoonDistanceDeg: 30 }, site);
      const r = nightReport(site, randomDate(rnd), targets, c, { curveStepMinutes: 10 });
      for (const t of r.targets) {
        const curve = t.curve!;
        expect(curve.closedBy).toHaveLength(curve.utc.length);
        curve.utc.forEach((u, i) => {
          const ms = Date.parse(u);
          // Samples within 2 s of an edge are left out: the edges are bisected to 1 s.
          const inside = t.windows.some(
            (w) => ms > Date.parse(w.start.utc) + 2000 && ms < Date.parse(w.end.utc) - 2000,
          );
          const outside = t.windows.every(
            (w) => ms < Date.parse(w.start.utc) - 2000 || ms > Date.parse(w.end.utc) + 2000,
          );
          if (inside) {
            expect(curve.closedBy[i]).toBeNull();
            open++;
          }
          if (outside) {
            expect(curve.closedBy[i]).not.toBeNull();
            closed++;
          }
        });
      }
    }
    expect(open).toBeGreaterThan(200);
    expect(closed).toBeGreaterThan(1000);
  });

  it("says darkness where astronomy-engine's Sun is above −18° and altitude where the target is below the limit", () => {
    const rnd = seeded(4420);
    let checked = 0;
    for (let k = 0; k < 6; k++) {
      const site = randomSite(rnd);
      const target = randomTarget(rnd, 'c');
      const c = validateLimits({ lowestAltitudeDeg: 30, leastMoonDistanceDeg: 0 }, site);
      const r = nightReport(site, randomDate(rnd), [target], c, { curveStepMinutes: 20 });
      const curve = r.targets[0]!.curve!;
      curve.utc.forEach((u, i) => {
        const time = MakeTime(new Date(u));
        const eq = Equator(Body.Sun, time, site.observer, true, true);
        const sunAlt = Horizon(time, site.observer, eq.ra, eq.dec).altitude;
        // 0.05° from the limit is under 20 s of solar motion: left out as too close to call.
        if (Math.abs(sunAlt + 18) < 0.05) return;
        // Astronomical darkness is the Sun's centre below −18° (common practice, no source).
        expect(curve.closedBy[i] === 'darkness').toBe(sunAlt > -18);
        if (sunAlt < -18 && Math.abs(curve.altitudeDeg[i]! - 30) > 0.05)
          expect(curve.closedBy[i] === 'altitude').toBe(curve.altitudeDeg[i]! < 30);
        checked++;
      });
    }
    expect(checked).toBeGreaterThan(300);
  });
});
