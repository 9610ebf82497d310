/** The campaign's slowly changing records, loaded once per page and refreshed after an edit. */
import { sigmasOf, type CovarianceTerm } from '../../../descriptors/covariance.ts';
import { valueText } from '../lib/numbers.ts';
import { getAll } from './client.ts';
import type { CampaignRow, SiteRow, SolutionRow, SystemRow, TargetRow } from './client.ts';

export interface Catalogue {
  systems: SystemRow[];
  targets: TargetRow[];
  sites: SiteRow[];
  campaigns: CampaignRow[];
  solutions: SolutionRow[];
  target(id: number): TargetRow | undefined;
  system(id: number): SystemRow | undefined;
  site(id: number): SiteRow | undefined;
  currentSolution(targetId: number): SolutionRow | undefined;
}

let cached: Promise<Catalogue> | null = null;

export function loadCatalogue(): Promise<Catalogue> {
  cached ??= (async () => {
    const [systems, targets, sites, campaigns, solutions] = await Promise.all([
      getAll('/systems'),
      getAll('/targets'),
      getAll('/sites'),
      getAll('/campaigns'),
      getAll('/orbit-solutions'),
    ]);
    const byId = <T extends { id: number }>(rows: T[]) => new Map(rows.map((r) => [r.id, r]));
    const [sy, ta, si] = [byId(systems), byId(targets), byId(sites)];
    return {
      systems,
      targets,
      sites,
      campaigns,
      solutions,
      target: (id) => ta.get(id),
      system: (id) => sy.get(id),
      site: (id) => si.get(id),
      currentSolution: (targetId) => solutions.find((s) => s.targetId === targetId && s.current),
    };
  })();
  cached.catch(() => (cached = null));
  return cached;
}

export const invalidateCatalogue = () => {
  cached = null;
};

/** The sky engine's target shape for a stored target: its system's place at its position epoch plus its current orbit. */
export function skyTarget(cat: Catalogue, targetId: number) {
  const t = cat.target(targetId);
  const s = t && cat.system(t.systemId);
  if (!t || !s) return null;
  const orbit = cat.currentSolution(targetId)?.orbit;
  return {
    name: t.name,
    raDeg: s.raDeg,
    decDeg: s.decDeg,
    pmRaMasYr: s.pmRaMasYr,
    pmDecMasYr: s.pmDecMasYr,
    epoch: s.positionEpoch,
    ...(orbit ? { orbit } : {}),
  };
}

/** The sky engine's site shape for a stored site, with its horizon mask. */
export function skySite(site: SiteRow) {
  return {
    name: site.name,
    latitudeDeg: site.latitudeDeg,
    longitudeDeg: site.longitudeDeg,
    elevationM: site.elevationM,
    timeZone: site.timeZone,
    lowestAltitudeDeg: site.lowestAltitudeDeg,
    leastSunDistanceDeg: site.leastSunDistanceDeg,
    horizonMask: site.horizonMask,
    ...(site.pressureHpa !== null ? { pressureHpa: site.pressureHpa } : {}),
    ...(site.temperatureC !== null ? { temperatureC: site.temperatureC } : {}),
    ...(site.humidityPct !== null ? { humidityPct: site.humidityPct } : {}),
    ...(site.wavelengthUm !== null ? { wavelengthUm: site.wavelengthUm } : {}),
  };
}

/** a of a Campbell solution, arcsec; Thiele–Innes solutions carry A, B, F, G instead. */
export function semiMajorAxisText(s: SolutionRow): string {
  const el = s.orbit.elements;
  if (!('semiMajorAxisArcsec' in el)) return 'Thiele–Innes solution: no a';
  const sigma = s.orbit.covariance
    ? sigmasOf(s.orbit.covariance).sigmas.semiMajorAxisArcsec
    : undefined;
  return valueText(el.semiMajorAxisArcsec, sigma);
}

/** One element of a solution with the σ its covariance gives, rounded to it; a dash when absent. */
export function elementText(s: SolutionRow, key: CovarianceTerm): string {
  const v = (s.orbit.elements as Record<string, unknown>)[key];
  if (typeof v !== 'number') return '–';
  const sigma = s.orbit.covariance ? sigmasOf(s.orbit.covariance).sigmas[key] : undefined;
  return valueText(v, sigma);
}
