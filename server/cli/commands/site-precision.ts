/** `epochwright site-precision`: each site's expected measurement precision, shown or changed. */
import { DEFAULT_PRECISION } from '../../science/plan/index.ts';
import type { SiteRow } from '../../store/index.ts';
import { commandArgs, optionalId } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright site-precision [--site-id <id>] [--astrometry-mas <x|default>]
                         [--spectroscopy-km-s <x|default>] [--reference-seeing <arcsec|default>]
                         [--json | --csv]

Shows each site's precision model, or changes one site's. The season planner, the flags and the
detection forecast expect a measurement at airmass X there to have
  σ = zenith σ × (seeing / reference seeing) × X^0.6
(image size grows as X^0.6, Roddier 1981). A field left at its default reads
${DEFAULT_PRECISION.astrometryMas} mas per offset, ${DEFAULT_PRECISION.spectroscopyKmS} km/s per radial velocity, and "the night's own seeing" (the seeing ratio is then 1).
A campaign's goals.precision overrides every site's, field by field.

options:
  --site-id <id>                the site (required to change one)
  --astrometry-mas <x>          1σ of each astrometric offset at the zenith, mas, (0, 1e6]
  --spectroscopy-km-s <x>       1σ of a radial velocity at the zenith, km/s, (0, 1e6]
  --reference-seeing <arcsec>   seeing FWHM the two zenith values hold for, arcsec, (0, 10]
                                "default" returns any of the three to its default
${STORE_HELP}
  --json | --csv                machine-readable output instead of a table
`;

const FIELDS = {
  'astrometry-mas': 'astrometrySigmaMas',
  'spectroscopy-km-s': 'spectroscopySigmaKmS',
  'reference-seeing': 'referenceSeeingArcsec',
} as const;

/** A number as typed, or null for "default"; the store checks its range (naming the field). */
function numberOrDefault(option: string, text: string): number | null {
  if (text === 'default') return null;
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x))
    throw new UsageError(`--${option}: ${JSON.stringify(text)} must be a number or "default"`);
  return x;
}

const columns: Column<SiteRow>[] = [
  { header: 'id', value: (s) => s.id },
  { header: 'site', value: (s) => s.name },
  {
    header: 'astrometry_mas',
    value: (s) => s.astrometrySigmaMas ?? `${DEFAULT_PRECISION.astrometryMas} (default)`,
  },
  {
    header: 'spectroscopy_km_s',
    value: (s) => s.spectroscopySigmaKmS ?? `${DEFAULT_PRECISION.spectroscopyKmS} (default)`,
  },
  {
    header: 'reference_seeing_arcsec',
    value: (s) => s.referenceSeeingArcsec ?? "the night's own (default)",
  },
];

export const sitePrecisionCommand: Command = {
  summary: 'show or change each site’s expected measurement precision',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'site-id': { type: 'string' },
      'astrometry-mas': { type: 'string' },
      'spectroscopy-km-s': { type: 'string' },
      'reference-seeing': { type: 'string' },
    });
    const siteId = optionalId('site-id', values['site-id']);
    const patch: Record<string, number | null> = {};
    for (const [option, key] of Object.entries(FIELDS)) {
      const text = values[option as keyof typeof FIELDS];
      if (text !== undefined) patch[key] = numberOrDefault(option, text);
    }
    if (Object.keys(patch).length > 0 && siteId === undefined)
      throw new UsageError('--site-id is required to change a precision model');
    const changes = siteId !== undefined && Object.keys(patch).length > 0;
    const rows = await storeAction<SiteRow[]>(values, {
      local: async (store, actor) => {
        if (siteId !== undefined && changes)
          return [await store.sites.update(actor, siteId, patch)];
        if (siteId !== undefined) return [await store.sites.get(siteId)];
        return (await store.sites.list({}, { limit: 500 })).items;
      },
      remote: async (api) => {
        if (siteId !== undefined)
          return [
            await api<SiteRow>(
              changes
                ? { method: 'PATCH', path: `/sites/${siteId}`, body: patch }
                : { method: 'GET', path: `/sites/${siteId}` },
            ),
          ];
        return (
          await api<{ items: SiteRow[] }>({ method: 'GET', path: '/sites', query: { limit: 500 } })
        ).items;
      },
      writes: changes,
    });
    return render(format, rows, columns, { sites: rows });
  },
};
