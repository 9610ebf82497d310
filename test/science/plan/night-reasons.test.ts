/**
 * The limit that closed a night (night-reasons.ts), one constructed case per limit: each night is
 * built so that exactly one limit closes it, and the reason must name that limit (the Moon with its
 * distance, checked against astronomy-engine's own topocentric Moon).
 */
import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { nightGrid, targetGrid } from '../../../server/science/plan/grid.ts';
import { closingLimit, nightReasonWords } from '../../../server/science/plan/night-reasons.ts';
import { validateLimits, validateSite, validateTarget } from '../../../server/science/sky/index.ts';
import { SITE } from './helpers.ts';

const DATE = '2027-06-19'; // a full Moon falls on 2027-06-19 (astronomy-engine SearchMoonPhase, checked below)

function closed(site = SITE, limitsInput: object, raDeg: number, decDeg: number, slots = 4) {
  const c = validateLimits(limitsInput, site);
  const g = nightGrid(site, c, DATE, 10);
  const tg = targetGrid(g, validateTarget({ name: 'X', raDeg, decDeg }));
  const r = closingLimit(g, tg, slots, slots * 10);
  return { r, words: r ? nightReasonWords(r, c) : null, g, c };
}

function moonAt(jd: number) {
  const t = Astronomy.MakeTime(new Date((jd - 2440587.5) * 86400000));
  const obs = new Astronomy.Observer(SITE.latitudeDeg, SITE.longitudeDeg, SITE.elevationM);
  return Astronomy.Equator(Astronomy.Body.Moon, t, obs, false, true);
}

describe('the limit that closed a night (constructed cases, one limit each)', () => {
  const g0 = nightGrid(SITE, validateLimits({}, SITE), DATE, 10);
  const midJd = g0.edgeJd[Math.floor(g0.edgeJd.length / 2)]!;

  it('names the Moon, with its distance, when the Moon alone closes the window', () => {
    const full = Astronomy.SearchMoonPhase(
      180,
      Astronomy.MakeTime(new Date('2027-06-15T00:00:00Z')),
      10,
    )!;
    expect(full.date.toISOString().slice(0, 10)).toMatch(/2027-06-(19|20)/); // astronomy-engine's full Moon of June 2027
    const m = moonAt(midJd); // J2000 equator, topocentric
    const target = { ra: m.ra * 15, dec: m.dec + 12 };
    const { r, words } = closed(
      SITE,
      { highestAirmass: 3, leastMoonDistanceDeg: 30 },
      target.ra,
      target.dec,
    );
    // astronomy-engine: the closest topocentric distance over the dark edges while the Moon is up.
    let closest = Infinity;
    for (const jd of g0.edgeJd) {
      const mm = moonAt(jd);
      const t = Astronomy.MakeTime(new Date((jd - 2440587.5) * 86400000));
      const hor = Astronomy.Horizon(
        t,
        new Astronomy.Observer(SITE.latitudeDeg, SITE.longitudeDeg, SITE.elevationM),
        mm.ra,
        mm.dec,
      );
      if (hor.altitude <= 0) continue;
      const a = Astronomy.AngleBetween(
        Astronomy.VectorFromSphere(new Astronomy.Spherical(mm.dec, mm.ra * 15, 1), t),
        Astronomy.VectorFromSphere(new Astronomy.Spherical(target.dec, target.ra, 1), t),
      );
      closest = Math.min(closest, a);
    }
    console.log(`Moon: ${words}; astronomy-engine closest ${closest.toFixed(2)}°`);
    expect(r?.reason).toBe('moon');
    expect(Math.abs(r!.moonDistanceDeg! - closest)).toBeLessThan(0.5); // astronomy-engine's topocentric Moon (apparent place of date vs J2000: precession < 0.4° over 27 years)
    expect(words).toMatch(/Moon \(1\d° away, limit 30°\)/);
  });

  it('names the altitude limit for a star that never rises high enough', () => {
    expect(closed(SITE, { lowestAltitudeDeg: 30 }, 270, 75).r?.reason).toBe('altitude'); // culminates at 90° − |−29.25° − 75°| < 0 (spherical astronomy; common practice, no source)
  });

  it('names the airmass limit when it, not a fixed altitude, sets the floor', () => {
    // airmass 2 ⇔ 30° altitude (Kasten & Young 1989: X(60°) = 1.9943), above the site's 25°; the star culminates at 90° − 69.25° = 20.75°.
    expect(closed(SITE, { highestAirmass: 2 }, 270, 40).r?.reason).toBe('airmass');
  });

  it('names the horizon mask when the star is high enough but behind it', () => {
    const masked = validateSite({
      ...SITE,
      horizonMask: [
        { azimuthDeg: 0, altitudeDeg: 80 },
        { azimuthDeg: 359, altitudeDeg: 80 },
      ],
    });
    expect(
      closed(masked, { lowestAltitudeDeg: 30, leastMoonDistanceDeg: 0 }, 270, -60).r?.reason,
    ).toBe('horizon-mask'); // a constructed 80° wall all round; the star culminates at 90° − 30.75° = 59°
  });

  it('names the Sun-avoidance angle, with the distance, for a star beside the Sun', () => {
    const sun = Astronomy.Equator(
      Astronomy.Body.Sun,
      Astronomy.MakeTime(new Date('2027-06-20T00:00:00Z')),
      new Astronomy.Observer(0, 0, 0),
      false,
      true,
    );
    const { r, words } = closed(SITE, { highestAirmass: 3 }, sun.ra * 15, sun.dec - 10);
    expect(r?.reason).toBe('sun-distance');
    expect(r!.sunDistanceDeg!).toBeGreaterThan(8); // 10° from astronomy-engine's Sun, which moves ~1°/day
    expect(r!.sunDistanceDeg!).toBeLessThan(12);
    expect(words).toMatch(/from the Sun, limit 45°/);
  });

  it('names darkness at a site with no astronomical night in June', () => {
    const north = validateSite({
      ...SITE,
      name: 'Far North',
      latitudeDeg: 62,
      longitudeDeg: 10,
      timeZone: 'Europe/Oslo',
    });
    expect(closed(north, {}, 270, 30).r?.reason).toBe('no-darkness'); // the Sun stays above −18° at 62° N near the solstice (90° − 62° − 23.4° > −18°; Explanatory Supplement twilight)
  });

  it('names a window too short for the block, and what cut it short', () => {
    // A star culminating 0.3° above the 30° floor (δ = +30.5°: 90° − 59.75° = 30.25°, plus ~0.05° of refraction): above it for about ±25 min around transit
    // (Δh ≈ cos φ cos δ H² / (2 cos h); spherical astronomy, common practice, no source), shorter than a 90-min block.
    const { r, words } = closed(
      SITE,
      { lowestAltitudeDeg: 30, leastMoonDistanceDeg: 0 },
      270,
      30.5,
      9,
    );
    console.log(`too short: ${words}`);
    expect(r?.reason).toBe('too-short');
    expect(r!.longestHours!).toBeGreaterThan(0.5);
    expect(r!.longestHours!).toBeLessThan(1.2);
  });
});
