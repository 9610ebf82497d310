/** `epochwright time-request`: a semester's request for telescope time, from the campaign's plan and its log. */
import { parseArgs } from 'node:util';
import { timeRequestMarkdown } from '../../science/plan/time-request.ts';
import {
  SITE_TOTAL,
  timeRequestCsv,
  type Store,
  type TimeRequestInput,
} from '../../store/index.ts';
import { asOptions, outputFormat, positiveId, weatherOption } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';
import { momentJd } from '../../clock.ts';

const help = `usage: epochwright time-request --campaign-id <id> --name <semester> --start <date> --end <date>
                              [--weather aware|blind] [--at <epoch>] [--markdown | --csv | --json]

The time to ask for in a semester: the campaign's season plan over its allocated nights from
--start to --end (weather-aware unless --weather blind), per site the nights and hours of its
blocks split by target and measurement kind, plus a weather allowance of h (1 − c) / c for a block
of h hours on a night clear with chance c (site-statistics); per target the σ of the coming
passage's date, of the mass and of the relativity factors with and without the time, and a
paragraph saying why. --markdown prints it ready to paste into a proposal; --csv gives one row per
site, target and kind (and a total row per site).

options:
  --campaign-id <id>     the campaign
  --name <semester>      the semester's name as the proposal gives it (e.g. 2027A)
  --start, --end <date>  first and last night of the semester (local evening dates)
  --weather aware|blind  default aware
  --at <epoch>           the moment of planning; default now
${STORE_HELP}
  --markdown | --csv | --json   instead of the table
`;

interface Row {
  site: string;
  target: string;
  kind: string;
  blocks: number | null;
  hours: number;
  allowance: number;
  request: number;
}

export const timeRequestCommand: Command = {
  summary: 'a semester’s time request: hours per site, target and kind, weather allowance, why',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...storeOptions,
        'campaign-id': { type: 'string' },
        name: { type: 'string' },
        start: { type: 'string' },
        end: { type: 'string' },
        weather: { type: 'string' },
        at: { type: 'string' },
        markdown: { type: 'boolean' },
        json: { type: 'boolean' },
        csv: { type: 'boolean' },
      },
      strict: true,
      allowPositionals: false,
    });
    if (values.markdown && (values.json || values.csv))
      throw new UsageError('choose one of --markdown, --json and --csv');
    const format = outputFormat(values);
    const id = positiveId('campaign-id', values['campaign-id']);
    if (values.name === undefined || values.start === undefined || values.end === undefined)
      throw new UsageError('--name, --start and --end are required');
    const weather = weatherOption(values.weather);
    const input: TimeRequestInput = {
      name: values.name,
      startDate: values.start,
      endDate: values.end,
      weather,
    };
    const atJd = momentJd(values.at, '--at');
    const r = await asOptions(
      { startDate: '--start', endDate: '--end', name: '--name', '*': '--campaign-id' },
      () =>
        storeAction(values, {
          local: (store) => store.plans.timeRequest(id, input, atJd),
          remote: async (api) => {
            type Answer = Awaited<ReturnType<Store['plans']['timeRequest']>> & {
              markdown: string;
              csv: string;
            };
            const {
              markdown: _markdown,
              csv: _csv,
              ...request
            } = await api<Answer>({
              method: 'POST',
              path: `/campaigns/${id}/time-request`,
              body: { ...input, at: values.at },
            });
            return request;
          },
        }),
    );
    if (values.markdown) return timeRequestMarkdown(r);
    if (format === 'csv') return timeRequestCsv(r);
    const rows: Row[] = r.sites.flatMap((s) => [
      ...s.byTarget.map((b) => ({
        site: s.site,
        target: b.target,
        kind: b.kind,
        blocks: b.blocks,
        hours: b.hours,
        allowance: b.allowanceHours,
        request: b.hours + b.allowanceHours,
      })),
      {
        site: s.site,
        target: SITE_TOTAL,
        kind: '',
        blocks: null,
        hours: s.hours,
        allowance: s.allowanceHours,
        request: s.requestHours,
      },
    ]);
    const columns: Column<Row>[] = [
      { header: 'semester', value: () => r.semester.name },
      { header: 'site', value: (x) => x.site },
      { header: 'target', value: (x) => x.target },
      { header: 'kind', value: (x) => x.kind },
      { header: 'blocks', value: (x) => x.blocks, digits: 0 },
      { header: 'hours', value: (x) => x.hours, digits: format === 'table' ? 1 : 3 },
      { header: 'weather_h', value: (x) => x.allowance, digits: format === 'table' ? 1 : 3 },
      { header: 'request_h', value: (x) => x.request, digits: format === 'table' ? 1 : 3 },
    ];
    if (format !== 'table') return render(format, rows, columns, r);
    return (
      `${render('table', rows, columns, r)}\ntotal: ${r.totals.requestHours.toFixed(1)} h ` +
      `(${r.totals.hours.toFixed(1)} h of blocks + ${r.totals.allowanceHours.toFixed(1)} h weather) ` +
      `on ${r.totals.nights} site-nights\n\n${r.targets.map((t) => t.reason).join('\n\n')}\n\nrule: ` +
      `${r.rule}\nexpected results: ${r.method}\n`
    );
  },
};
