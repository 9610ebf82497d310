/** The season map as a plain report (HTTP and CLI JSON): hours to 0.001 h, with the cautions. */
import { formatDuration } from '../time/duration.ts';
import type { Limits } from './limits.ts';
import { cautions } from './night-report.ts';
import type { SeasonMap } from './season.ts';
import type { Site } from './site.ts';

export function seasonReport(site: Site, map: SeasonMap, limits: Limits) {
  return {
    site: {
      name: site.name,
      timeZone: site.timeZone,
      latitudeDeg: site.latitudeDeg,
      longitudeDeg: site.longitudeDeg,
      elevationM: site.elevationM,
    },
    year: map.year,
    step: formatDuration(map.stepMinutes / 1440),
    nights: map.nights.map((n) => ({
      date: n.date,
      darkHours: Math.round(n.darkHours * 1000) / 1000,
    })),
    targets: map.targets.map((t) => ({
      name: t.name,
      season: t.season,
      periapses: t.periapses,
      hoursPerNight: Array.from(t.hours, (h) => Math.round(h * 1000) / 1000),
    })),
    evaluations: map.evaluations,
    cautions: cautions(limits),
  };
}
