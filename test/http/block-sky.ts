/**
 * An outside check of planned blocks: at both edges of each block, astronomy-engine (not the
 * project's sky engine) gives the Sun's altitude, the target's refracted altitude and airmass, and
 * its distances from the Moon and the Sun. Returns the worst margins for the test to compare.
 */
import { AngleBetween, Body, DefineStar, Equator, Horizon, Observer } from 'astronomy-engine';

export interface SkySite {
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
}

/** Kasten & Young (1989) airmass from apparent altitude, degrees. */
export const kastenYoung = (altDeg: number) =>
  1 / (Math.sin((altDeg * Math.PI) / 180) + 0.50572 * (altDeg + 6.07995) ** -1.6364);

export interface SkyMargins {
  highestSunDeg: number;
  lowestAltitudeDeg: number;
  highestAirmass: number;
  closestMoonDeg: number;
  closestSunDeg: number;
  edges: number;
}

/** Worst values over every block edge; the target is placed at its primary (orbits here are < 1″). */
export function skyMargins(
  site: SkySite,
  raDeg: number,
  decDeg: number,
  blocks: readonly { startUtc: string; endUtc: string }[],
): SkyMargins {
  const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
  DefineStar(Body.Star1, raDeg / 15, decDeg, 1000);
  const m: SkyMargins = {
    highestSunDeg: -90,
    lowestAltitudeDeg: 90,
    highestAirmass: 0,
    closestMoonDeg: 180,
    closestSunDeg: 180,
    edges: 0,
  };
  for (const b of blocks) {
    for (const t of [b.startUtc, b.endUtc]) {
      const date = new Date(t);
      const sun = Equator(Body.Sun, date, observer, true, true);
      const moon = Equator(Body.Moon, date, observer, true, true);
      const star = Equator(Body.Star1, date, observer, true, true);
      const alt = Horizon(date, observer, star.ra, star.dec, 'normal').altitude;
      m.highestSunDeg = Math.max(
        m.highestSunDeg,
        Horizon(date, observer, sun.ra, sun.dec).altitude,
      );
      m.lowestAltitudeDeg = Math.min(m.lowestAltitudeDeg, alt);
      m.highestAirmass = Math.max(m.highestAirmass, kastenYoung(alt));
      m.closestMoonDeg = Math.min(m.closestMoonDeg, AngleBetween(star.vec, moon.vec));
      m.closestSunDeg = Math.min(m.closestSunDeg, AngleBetween(star.vec, sun.vec));
      m.edges++;
    }
  }
  return m;
}
