/** What the `night` and `season` commands share: reading a site, targets and constraints. */
import { InputError } from '../../science/errors.ts';
import {
  validateConstraints,
  validateSite,
  validateTarget,
  type Constraints,
  type Site,
  type Target,
} from '../../science/sky/index.ts';
import { readJsonArg } from '../io.ts';

export const SKY_OPTION_HELP = `  --site <json|file>         the site: {"latitudeDeg", "longitudeDeg" (east), "elevationM", "timeZone",
                             optional "pressureHpa", "temperatureC", "minAltitudeDeg", "horizonMask",
                             "sunAvoidanceDeg"}
  --targets <json|file>      an array of {"name", "raDeg", "decDeg", optional "pmRaMasYr", "pmDecMasYr",
                             "epoch", "orbit"} (ICRS; with an orbit, raDeg/decDeg are the primary's)
  --constraints <json|file>  {"darkness", "minAltitudeDeg", "maxAirmass", "airmassFormula",
                             "minMoonSeparationDeg", "sunAvoidanceDeg", "useHorizonMask", "zenithSeeingArcsec"}
  --darkness <kind|deg>      civil, nautical, astronomical (default) or a solar altitude in degrees
  --max-airmass <x>          highest airmass (default 2)
  --moon-distance <deg>      least distance from the Moon while it is up (default 30)
  --json | --csv             machine-readable output instead of a table`;

export const skyOptions = {
  site: { type: 'string' },
  targets: { type: 'string' },
  constraints: { type: 'string' },
  darkness: { type: 'string' },
  'max-airmass': { type: 'string' },
  'moon-distance': { type: 'string' },
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
  constraints?: string;
  darkness?: string;
  'max-airmass'?: string;
  'moon-distance'?: string;
}): { site: Site; targets: Target[]; constraints: Constraints } {
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
    values.constraints === undefined
      ? {}
      : (readJsonArg('constraints', values.constraints) as Record<string, unknown>);
  if (values.darkness !== undefined)
    c.darkness = /^[a-z]+$/i.test(values.darkness)
      ? values.darkness
      : numberOption('darkness', values.darkness);
  if (values['max-airmass'] !== undefined)
    c.maxAirmass = numberOption('max-airmass', values['max-airmass']);
  if (values['moon-distance'] !== undefined)
    c.minMoonSeparationDeg = numberOption('moon-distance', values['moon-distance']);
  return { site, targets, constraints: validateConstraints(c, site, 'constraints') };
}

export { numberOption };
