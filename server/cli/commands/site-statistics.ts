/** `epochwright site-statistics`: what a site's log has learned per month, and setting its clear-night prior. */
import {
  DEFAULT_PRIOR_STRENGTH_NIGHTS,
  readClearPriorCsv,
  type SiteStatisticsView,
} from '../../store/index.ts';
import { commandArgs, optionalPositive, positiveId, readTextFile } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { formatTable, render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright site-statistics --site-id <id> [--start <date>] [--end <date>]
                                  [--set-prior <file.csv> [--strength <nights>]] [--json | --csv]

Per calendar month, from the site's night reports (every campaign): nights logged, dark hours,
hours lost and the share lost, the loss estimated by the Beta-prior rule (the month's clear-night
prior worth s nights, or a flat prior, updated by each night's lost share), the chance a night is
clear (the weight a weather-aware plan gives it), the median seeing and Strehl ratio, and the main
reason for lost time. Then the precision the site's measurements reached, per instrument and kind,
with the zenith value the planner's precision model implies. Every figure says how many nights or
measurements it rests on.

options:
  --site-id <id>           the site
  --start, --end <date>    nights (local evening dates, YYYY-MM-DD) to read; default all
  --set-prior <file.csv>   first replace the site's clear-night prior: columns month, clear_fraction
                           and optionally strength_nights (months left out have none)
  --strength <nights>      weight of rows without strength_nights; default ${DEFAULT_PRIOR_STRENGTH_NIGHTS}
${STORE_HELP}
  --json | --csv           machine-readable output instead of tables
`;

type Month = SiteStatisticsView['months'][number];
const pct = (x: number | null) => (x === null ? null : 100 * x);
const MONTHS = 'Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec'.split(' ');

const monthColumns: Column<Month>[] = [
  { header: 'month', value: (m) => MONTHS[m.month - 1] },
  { header: 'nights', value: (m) => m.nights, digits: 0 },
  { header: 'dark_h', value: (m) => m.darkHours, digits: 1 },
  { header: 'lost_h', value: (m) => m.lostHours, digits: 1 },
  { header: 'lost_log_%', value: (m) => pct(m.loggedLossFraction), digits: 0 },
  { header: 'loss_%', value: (m) => pct(m.loss.mean), digits: 0 },
  { header: 'loss_sigma_%', value: (m) => pct(m.loss.sigma), digits: 0 },
  { header: 'prior', value: (m) => m.loss.prior },
  { header: 'clear_%', value: (m) => pct(m.clearProbability), digits: 0 },
  { header: 'seeing_arcsec', value: (m) => m.seeingArcsec?.median ?? null, digits: 2 },
  { header: 'strehl', value: (m) => m.strehlRatio?.median ?? null, digits: 2 },
  {
    header: 'main_loss_reason',
    value: (m) => (m.reasons[0] ? `${m.reasons[0].reason} (${m.reasons[0].nights} n)` : ''),
  },
];

type Achieved = SiteStatisticsView['precision'][number];
const precisionColumns: Column<Achieved>[] = [
  { header: 'instrument', value: (p) => p.instrument },
  { header: 'kind', value: (p) => p.kind },
  { header: 'n', value: (p) => p.n, digits: 0 },
  { header: 'median_sigma', value: (p) => `${p.medianSigma.toFixed(3)} ${p.unit}` },
  {
    header: 'zenith_sigma',
    value: (p) =>
      p.zenith
        ? `${p.zenith.sigma.toFixed(3)} ${p.unit} at ${p.zenith.referenceSeeingArcsec.toFixed(2)}″ (${p.zenith.n})`
        : 'no seeing logged',
  },
];

const range = (low: number, high: number | null, unit = '') =>
  high === null ? `≥ ${low}${unit}` : `${low}–${high}${unit}`;

/** Median σ (and count) by seeing (rows) and airmass (columns) together. */
function jointTable(p: Achieved): string {
  const heads = p.bySeeingAndAirmass[0]?.byAirmass ?? [];
  const rows = p.bySeeingAndAirmass.map((r) => ({
    seeing: range(r.seeingLow, r.seeingHigh, '″'),
    cells: r.byAirmass.map((c) =>
      c.n > 0 && c.medianSigma !== null ? `${c.medianSigma.toFixed(2)} (${c.n})` : '—',
    ),
  }));
  const columns: Column<(typeof rows)[number]>[] = [
    { header: 'seeing', value: (r) => r.seeing },
    ...heads.map((c, k) => ({
      header: `X ${range(c.low, c.high)}`,
      value: (r: (typeof rows)[number]) => r.cells[k]!,
    })),
  ];
  return (
    `${p.instrument}, ${p.kind}: median σ (${p.unit}) and measurements by seeing and airmass ` +
    `together\n${formatTable(rows, columns)}`
  );
}

export const siteStatisticsCommand: Command = {
  summary: 'what a site’s log has learned: time lost per month, seeing, precision reached',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'site-id': { type: 'string' },
      start: { type: 'string' },
      end: { type: 'string' },
      'set-prior': { type: 'string' },
      strength: { type: 'string' },
    });
    const id = positiveId('site-id', values['site-id']);
    const strength = optionalPositive('strength', values.strength) ?? DEFAULT_PRIOR_STRENGTH_NIGHTS;
    if (values.strength !== undefined && values['set-prior'] === undefined)
      throw new UsageError('--strength goes with --set-prior');
    const prior =
      values['set-prior'] === undefined
        ? null
        : readClearPriorCsv(readTextFile('set-prior', values['set-prior']), strength);
    const range = { start: values.start, end: values.end };
    const stats = await storeAction(values, {
      local: async (store, actor) => {
        if (prior) await store.siteWeather.replacePrior(actor, id, prior);
        return store.siteWeather.statistics(id, range);
      },
      remote: async (api) => {
        if (prior)
          await api({ method: 'PUT', path: `/sites/${id}/clear-prior`, body: { months: prior } });
        return api<SiteStatisticsView>({
          method: 'GET',
          path: `/sites/${id}/statistics`,
          query: range,
        });
      },
      writes: prior !== null,
    });
    if (format !== 'table') return render(format, stats.months, monthColumns, stats);
    const year = stats.year;
    return [
      `${stats.site}: ${year.nights} night reports, ${year.lostHours.toFixed(1)} of ` +
        `${year.darkHours.toFixed(1)} dark hours lost; loss over the year ` +
        `${(100 * year.loss.mean).toFixed(0)} % ± ${(100 * year.loss.sigma).toFixed(0)} %`,
      `rule: ${stats.rule}`,
      '',
      formatTable(stats.months, monthColumns),
      stats.precision.length
        ? formatTable(stats.precision, precisionColumns)
        : 'no measurements linked to this site’s blocks\n',
      ...stats.precision.map(jointTable),
    ].join('\n');
  },
};
