/** What the `night` and `season` commands share: reading a site, targets and limits. */
import { InputError } from '../../science/errors.ts';
import {
  validateLimits,
  validateSite,
  validateTarget,
  type Limits,
  type Site,
  type Target,
} from '../../science/sky/index.ts';
import { readJsonArg } from '../args.ts';

export const SKY_OPTION_HELP = `  --site <json|file>         the site: {"latitudeDeg", "longitudeDeg" (east), "elevationM", "timeZone",
                             optional "pressureHpa", "temperatureC", "lowestAltitudeDeg", "horizonMask",
                             "leastSunDistanceDeg"}
  --targets <json|file>      an array of {"name", "raDeg", "decDeg", optional "pmRaMasYr", "pmDecMasYr",
                             "epoch", "orbit"} (ICRS; with an orbit, raDeg/decDeg are the primary's)
  --limits <json|file>       {"darkness", "lowestAltitudeDeg", "highestAirmass", "airmassFormula",
                             "leastMoonDistanceDeg", "leastSunDistanceDeg", "useHorizonMask", "zenithSeeingArcsec"}
  --darkness <kind|deg>      civil, nautical, astronomical (default) or a solar altitude in degrees
  --highest-airmass <x>      highest airmass (default 2)
  --least-moon-distance <deg>
                             least distance from the Moon while it is up (default 30)
  --json | --csv             machine-readable output instead of a table`;

export const skyOptions = {
  site: { type: 'string' },
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

export function readSky(values: {
  site?: string;
  targets?: string;
  limits?: string;
  darkness?: string;
  'highest-airmass'?: string;
  'least-moon-distance'?: string;
}): { site: Site; targets: Target[]; limits: Limits } {
  const site = validateSite(readJsonArg('site', values.site), 'site');
  const raw = readJsonArg('targets', values.targets);
  const list = Array.isArray(raw) ? raw : (raw as { targets?: unknown }).targets;
  if (!Array.isArray(list))
    throw new InputError(
      'targets',
      raw,
      'must be an array of targets (or an object with a "targets" array)',
    );
  const targets = list.map((t, i) => validateTarget(t, `targets.${i}`));
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
  return { site, targets, limits: validateLimits(c, site, 'limits') };
}

export { numberOption };
