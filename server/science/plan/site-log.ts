/**
 * A night report and a measurement as the site statistics read them: the night's allocated time
 * (its astronomical darkness, the darkness the planners default to) and the airmass of a target at
 * an epoch (Kasten & Young 1989, as everywhere in the sky engine).
 */
import { airmass } from '../sky/airmass.ts';
import { skyPlaceExact } from '../sky/apparent.ts';
import { darknessExact } from '../sky/darkness.ts';
import { nightSpan } from '../sky/night.ts';
import type { Site } from '../sky/site.ts';
import { TWILIGHT_SUN_ALTITUDE_DEG } from '../sky/sun-moon.ts';
import { icrsDirection, type Target } from '../sky/target.ts';

/** Hours of astronomical darkness in the night of `date` (local evening date) at the site. */
export function darkHoursOf(site: Site, date: string): number {
  const span = nightSpan(site, date);
  return darknessExact(site, span, TWILIGHT_SUN_ALTITUDE_DEG.astronomical).reduce(
    (h, i) => h + (i.endJd - i.startJd) * 24,
    0,
  );
}

/** Airmass of the target at a UTC Julian Date, or null when it is below the horizon. */
export function airmassAt(site: Site, target: Target, jd: number): number | null {
  const p = skyPlaceExact(icrsDirection(target, jd), jd, site);
  const x = airmass('kasten-young', p.trueAltitudeDeg, p.altitudeDeg);
  return p.altitudeDeg > 0 && Number.isFinite(x) ? x : null;
}
