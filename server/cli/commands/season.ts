/** `epochwright season`: each target's observable hours per night across a year at a site, and its season. */
import { parseArgs } from 'node:util';
import {
  SEASON_STEP,
  seasonMap,
  seasonReport,
  type TargetSeason,
} from '../../science/sky/index.ts';
import { parseDurationMinutes } from '../../science/time/index.ts';
import { InputError } from '../../science/errors.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat } from '../args.ts';
import { formatCsv, render, type Column } from '../output.ts';
import { SKY_OPTION_HELP, numberOption, readSky, skyOptions } from './sky-args.ts';

const help = `usage: epochwright season --site <json|file> --year <yyyy> --targets <json|file> [options]
       epochwright season --site-id <id> --campaign-id <id> --year <yyyy> [options]

For every night of the year, how many hours each target meets every limit (darkness sampled
every --step), and each target's season: the longest run of usable nights (short gaps
bridged), its first and last night, and its best night.
The table lists one line per target; --csv gives one line per night with a column per target.

options:
${SKY_OPTION_HELP}
  --year <yyyy>              the year of the map (nights named by their local evening date)
  --step <duration>          darkness sampling step, ISO 8601, PT1M to PT1H (default PT5M)
  --min-hours <h>            hours that make a night usable (default 1)
`;

export const seasonCommand: Command = {
  summary: "observable hours per night across a year, and each target's season at a site",
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...skyOptions,
        year: { type: 'string' },
        step: { type: 'string' },
        'min-hours': { type: 'string' },
      },
      strict: true,
      allowPositionals: false,
    });
    const format = outputFormat(values);
    if (values.year === undefined) throw new UsageError('--year is required');
    const year = numberOption('year', values.year);
    if (!Number.isInteger(year) || year < 1900 || year > 2100)
      throw new InputError('--year', values.year, 'must be a whole year from 1900 to 2100');
    const { site, targets, limits } = await readSky(values);
    const stepMinutes = parseDurationMinutes(
      values.step ?? SEASON_STEP.default,
      '--step',
      SEASON_STEP.rule,
    );
    const minHoursPerNight =
      values['min-hours'] === undefined ? 1 : numberOption('min-hours', values['min-hours']);
    const map = seasonMap(site, year, targets, limits, { stepMinutes, minHoursPerNight });
    if (format === 'csv') {
      const nights = map.nights.map((n, i) => ({ n, i }));
      const columns: Column<(typeof nights)[number]>[] = [
        { header: 'date', value: (r) => r.n.date },
        { header: 'dark_h', value: (r) => r.n.darkHours, digits: 3 },
        ...map.targets.map(
          (t): Column<(typeof nights)[number]> => ({
            header: `${t.name}_h`,
            value: (r) => t.hours[r.i],
            digits: 3,
          }),
        ),
      ];
      return formatCsv(nights, columns);
    }
    const columns: Column<TargetSeason>[] = [
      { header: 'target', value: (t) => t.name },
      {
        header: 'season_from',
        value: (t) => (t.season.allYear ? 'all year' : (t.season.start ?? '—')),
      },
      { header: 'season_to', value: (t) => (t.season.allYear ? '' : (t.season.end ?? '')) },
      { header: 'across_new_year', value: (t) => (t.season.wrapsYearEnd ? 'yes' : '') },
      { header: 'usable_nights', value: (t) => t.season.usableNights },
      { header: 'best_night', value: (t) => t.season.bestNight ?? '—' },
      { header: 'best_hours', value: (t) => t.season.bestHours, digits: 2 },
      {
        header: 'periapsis',
        value: (t) =>
          t.periapses
            .map(
              (p) =>
                `${p.night} ${p.inSeason ? 'in season' : 'OUT of season'} ${p.hours.toFixed(1)} h`,
            )
            .join('; '),
      },
    ];
    return render(format, map.targets, columns, seasonReport(site, map, limits));
  },
};
