/** `epochwright night`: one night at a site — twilights, the Moon, and when each target can be observed. */
import { parseArgs } from 'node:util';
import {
  NIGHT_STEP,
  nightReport,
  parseNightDate,
  type ReportWindow,
} from '../../science/sky/index.ts';
import { parseDurationMinutes } from '../../science/time/index.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat } from '../args.ts';
import { render, type Column } from '../output.ts';
import { SKY_OPTION_HELP, readSky, skyOptions } from './sky-args.ts';

const help = `usage: epochwright night --site <json|file> --date <YYYY-MM-DD> --targets <json|file> [options]
       epochwright night --site-id <id> --campaign-id <id> --date <YYYY-MM-DD> [options]

For the night whose evening falls on --date (local date at the site): sunset, the three twilights,
darkness, the Moon (rise, set, illumination), and for each target the windows in which it meets
every limit, with what opens and closes each window, its transit and best airmass.
Times are shown in the site's time zone; --json gives UTC and local for each.

options:
${SKY_OPTION_HELP}
  --date <YYYY-MM-DD>        the local evening date
  --exact                    compute every instant with astronomy-engine (slower; the reference)
  --step <duration>          window search step, ISO 8601, up to PT30M (default PT5M; edges
                             are refined to 1 s)
`;

type Row = ReportWindow & { target: string };

const hhmm = (local: string) => local.slice(5, 16).replace('T', ' ');

export const nightCommand: Command = {
  summary: 'twilights, Moon and observing windows of targets for one night at a site',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...skyOptions,
        date: { type: 'string' },
        exact: { type: 'boolean' },
        step: { type: 'string' },
      },
      strict: true,
      allowPositionals: false,
    });
    const format = outputFormat(values);
    if (values.date === undefined)
      throw new UsageError('--date is required (the local evening date, YYYY-MM-DD)');
    parseNightDate(values.date, '--date');
    const { site, targets, limits, cautions } = await readSky(values);
    const stepMinutes = parseDurationMinutes(
      values.step ?? NIGHT_STEP.default,
      '--step',
      NIGHT_STEP.rule,
    );
    const report = nightReport(site, values.date, targets, limits, {
      method: values.exact ? 'exact' : 'fast',
      stepMinutes,
      curveStepMinutes: format === 'json' ? 10 : 0,
    });
    for (const c of cautions) if (!report.cautions.includes(c)) report.cautions.push(c);
    const rows: Row[] = report.targets.flatMap((t) =>
      t.windows.map((w) => ({ ...w, target: t.name })),
    );
    const columns: Column<Row>[] = [
      { header: 'target', value: (r) => r.target },
      { header: 'opens', value: (r) => hhmm(r.start.local) },
      { header: 'closes', value: (r) => hhmm(r.end.local) },
      { header: 'hours', value: (r) => r.hours, digits: 2 },
      { header: 'opened_by', value: (r) => r.opensBy },
      { header: 'closed_by', value: (r) => r.closesBy },
      { header: 'transit', value: (r) => (r.transit ? hhmm(r.transit.local) : '') },
      { header: 'best_airmass', value: (r) => r.best.airmass, digits: 3 },
      { header: 'best_at', value: (r) => hhmm(r.best.local) },
      { header: 'moon_deg', value: (r) => r.best.moonSeparationDeg, digits: 1 },
    ];
    if (format !== 'table') {
      if (format === 'csv')
        columns.splice(
          1,
          2,
          { header: 'opens_utc', value: (r) => r.start.utc },
          { header: 'closes_utc', value: (r) => r.end.utc },
        );
      return render(format, rows, columns, report);
    }
    const t = (i: { local: string } | null) => (i ? hhmm(i.local) : '—');
    const tw = report.sun.twilights;
    const held = report.limits;
    const head = [
      `${report.site.name}, night of ${report.night.date} (${report.site.timeZone}; local times)`,
      `sunset ${t(report.sun.set)}  civil ${t(tw.civil.dusk)}  nautical ${t(tw.nautical.dusk)}  ` +
        `astronomical ${t(tw.astronomical.dusk)}`,
      `astronomical ${t(tw.astronomical.dawn)}  nautical ${t(tw.nautical.dawn)}  civil ` +
        `${t(tw.civil.dawn)}  sunrise ${t(report.sun.rise)}`,
      `darkness, ${report.darkness.limit}: ${report.darkness.hours.toFixed(2)} h`,
      `Moon: rises ${t(report.moon.rise)}, sets ${t(report.moon.set)}, ` +
        `${(report.moon.illuminatedFraction * 100).toFixed(0)}% lit`,
      `altitudes and airmasses include ${report.site.refraction}`,
      `limits: altitude ≥ ${held.altitudeLimitDeg.toFixed(1)}°` +
        `${held.highestAirmass ? ` (airmass ≤ ${held.highestAirmass})` : ''}, ` +
        `Moon ≥ ${held.leastMoonDistanceDeg}°, Sun ≥ ${held.leastSunDistanceDeg}°`,
      '',
    ];
    const none = report.targets.filter((x) => x.windows.length === 0).map((x) => x.name);
    const tail = none.length ? `\nno window tonight: ${none.join(', ')}\n` : '';
    return (
      head.join('\n') +
      '\n' +
      render(format, rows, columns, report) +
      tail +
      report.cautions.map((c) => `note: ${c}\n`).join('')
    );
  },
};
