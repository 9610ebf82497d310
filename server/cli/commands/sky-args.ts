/** What the `night` and `season` commands share: reading a site, targets and limits. */
import { InputError } from '../../science/errors.ts';
import { LASER_GUIDE_STAR_CAUTION } from '../../science/plan/index.ts';
import {
  validateLimits,
  validateSite,
  validateTarget,
  type Limits,
  type Site,
  type Target,
} from '../../science/sky/index.ts';
import { positiveId, readJsonArg } from '../args.ts';
import { UsageError } from '../io.ts';
import {
  skyOfRows,
  type CampaignView,
  type OrbitSolutionRow,
  type SiteRow,
  type SkyMember,
  type SystemRow,
  type TargetRow,
} from '../../store/index.ts';
import { STORE_HELP, storeAction, storeOptions, type Api } from './store-option.ts';

export const SKY_OPTION_HELP = `  --site <json|file>         the site: {"latitudeDeg", "longitudeDeg" (east), "elevationM", "timeZone",
                             optional "pressureHpa", "temperatureC", "lowestAltitudeDeg", "horizonMask",
                             "leastSunDistanceDeg", "longitudeZoneConfirmed"}; angles as numbers
                             (degrees) or text (-24:37:38)
  --site-id <id>             a stored site instead (its horizon mask and lowest altitude included)
  --campaign-id <id>         with --site-id: the campaign's targets (system position plus current
                             orbit) and limits, unless --targets / --limits are given
  --targets <json|file>      an array of {"name", "raDeg", "decDeg", optional "pmRaMasYr", "pmDecMasYr",
                             "epoch", "orbit"} (ICRS; with an orbit, raDeg/decDeg are the primary's;
                             RA as 250.3 degrees, 16.69 h or 16:41:12.5 hours)
  --limits <json|file>       {"darkness", "lowestAltitudeDeg", "highestAirmass", "airmassFormula",
                             "leastMoonDistanceDeg", "leastSunDistanceDeg", "useHorizonMask", "zenithSeeingArcsec"}
  --darkness <kind|deg>      civil, nautical, astronomical (default) or a solar altitude in degrees
  --highest-airmass <x>      highest airmass (default 2)
  --least-moon-distance <deg>
                             least distance from the Moon while it is up (default 30)
  --json | --csv             machine-readable output instead of a table
${STORE_HELP} (with --site-id)`;

export const skyOptions = {
  ...storeOptions,
  site: { type: 'string' },
  'site-id': { type: 'string' },
  'campaign-id': { type: 'string' },
  targets: { type: 'string' },
  limits: { type: 'string' },
  darkness: { type: 'string' },
  'highest-airmass': { type: 'string' },
  'least-moon-distance': { type: 'string' },
  json: { type: 'boolean' },
  csv: { type: 'boolean' },
} as const;

function numberOption(name: string, text: string): number {
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x))
    throw new InputError(`--${name}`, text, 'must be a number');
  return x;
}

interface SkyValues {
  database?: string;
  server?: string;
  token?: string;
  site?: string;
  'site-id'?: string;
  'campaign-id'?: string;
  targets?: string;
  limits?: string;
  darkness?: string;
  'highest-airmass'?: string;
  'least-moon-distance'?: string;
}

export interface Sky {
  site: Site;
  targets: Target[];
  limits: Limits;
  /** Cautions of a stored site (its laser guide star). */
  cautions: string[];
}

/** The site, targets and limits of `night` and `season`: typed in, or read from the store. */
export async function readSky(values: SkyValues): Promise<Sky> {
  if (values['site-id'] === undefined) {
    if (values['campaign-id'] !== undefined)
      throw new UsageError('--campaign-id goes with --site-id');
    return { ...readTypedSky(values), cautions: [] };
  }
  if (values.site !== undefined) throw new UsageError('give --site or --site-id, not both');
  const siteId = positiveId('site-id', values['site-id']);
  const campaignId =
    values['campaign-id'] === undefined ? null : positiveId('campaign-id', values['campaign-id']);
  if (campaignId === null && values.targets === undefined)
    throw new UsageError('--targets (or --campaign-id) is required');
  const stored = await storeAction(values, {
    local: (store) => store.storedSky({ siteId, campaignId }),
    remote: (api) => remoteSky(api, siteId, campaignId),
  });
  const targets = values.targets === undefined ? stored.targets : readTargets(values.targets);
  const typed = values.limits !== undefined || values.darkness !== undefined;
  const limits =
    typed || values['highest-airmass'] !== undefined || values['least-moon-distance'] !== undefined
      ? readLimits(values, stored.site)
      : stored.limits;
  const cautions = stored.laserGuideStar ? [LASER_GUIDE_STAR_CAUTION] : [];
  return { site: stored.site, targets, limits, cautions };
}

/** The stored sky from a server's records: the site, the campaign and each target's system and current orbit. */
async function remoteSky(api: Api, siteId: number, campaignId: number | null) {
  const site = await api<SiteRow>({ method: 'GET', path: `/sites/${siteId}` });
  const campaign =
    campaignId === null
      ? null
      : await api<CampaignView>({ method: 'GET', path: `/campaigns/${campaignId}` });
  const members: SkyMember[] = [];
  for (const id of campaign?.targetIds ?? []) {
    const target = await api<TargetRow>({ method: 'GET', path: `/targets/${id}` });
    const system = await api<SystemRow>({ method: 'GET', path: `/systems/${target.systemId}` });
    const current = await api<{ items: OrbitSolutionRow[] }>({
      method: 'GET',
      path: '/orbit-solutions',
      query: { targetId: id, current: true },
    });
    members.push({ target, system, orbit: current.items[0]?.orbit });
  }
  return skyOfRows(site, campaign, members);
}

function readTargets(text: string | undefined): Target[] {
  const raw = readJsonArg('targets', text);
  const list = Array.isArray(raw) ? raw : (raw as { targets?: unknown }).targets;
  if (!Array.isArray(list))
    throw new InputError(
      'targets',
      raw,
      'must be an array of targets (or an object with a "targets" array)',
    );
  return list.map((t, i) => validateTarget(t, `targets.${i}`));
}

function readTypedSky(values: SkyValues): { site: Site; targets: Target[]; limits: Limits } {
  const site = validateSite(readJsonArg('site', values.site), 'site');
  return { site, targets: readTargets(values.targets), limits: readLimits(values, site) };
}

function readLimits(values: SkyValues, site: Site): Limits {
  const c =
    values.limits === undefined
      ? {}
      : (readJsonArg('limits', values.limits) as Record<string, unknown>);
  if (values.darkness !== undefined)
    c.darkness = /^[a-z]+$/i.test(values.darkness)
      ? values.darkness
      : numberOption('darkness', values.darkness);
  if (values['highest-airmass'] !== undefined)
    c.highestAirmass = numberOption('highest-airmass', values['highest-airmass']);
  if (values['least-moon-distance'] !== undefined)
    c.leastMoonDistanceDeg = numberOption('least-moon-distance', values['least-moon-distance']);
  return validateLimits(c, site, 'limits');
}

export { numberOption };
